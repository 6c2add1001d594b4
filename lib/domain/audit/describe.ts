/**
 * Audit events in words: "Renamed scenario LNA chain to LNA chain B" rather than an action code and a
 * JSON detail. One place for the project log, the admin log and their CSV exports.
 */

export type AuditEventFields = { action: string; target: string | null; detail: Record<string, unknown> | null };

/** The kinds an audit log can be filtered by: the part of the action before the dot. */
export const AUDIT_KINDS: Record<string, string> = {
  project: "Project",
  member: "Members",
  invitation: "Invitations",
  scenario: "Scenarios",
  part: "Parts",
  rule: "Rules",
  signoff: "Sign-offs",
  bundle: "Bundles",
  user: "Accounts",
  account: "Accounts",
  api_token: "API tokens",
  settings: "Site settings",
  demo: "Demo",
};

export const PROJECT_AUDIT_KINDS = ["project", "member", "invitation", "scenario", "part", "rule", "signoff", "bundle"];
export const SITE_AUDIT_KINDS = ["user", "account", "api_token", "settings"];

export function auditKindOf(action: string): string {
  return action.split(".")[0] ?? action;
}

/** A frequency in Hz as people write it (1.5 GHz). */
function formatHz(hz: number): string {
  const abs = Math.abs(hz);
  const [scale, unit] = abs >= 1e9 ? [1e9, "GHz"] : abs >= 1e6 ? [1e6, "MHz"] : abs >= 1e3 ? [1e3, "kHz"] : [1, "Hz"];
  return `${Number((hz / scale).toPrecision(6))} ${unit}`;
}

/** A field of a rule or detail with its unit, read from the name's suffix (min_db → dB). */
function formatField(key: string, value: unknown): string {
  const label = key.replace(/_(db|dbm|hz)$/i, "").replace(/_/g, " ");
  if (typeof value === "number") {
    if (/_hz$/i.test(key)) return `${label} ${formatHz(value)}`;
    if (/_dbm$/i.test(key)) return `${label} ${value} dBm`;
    if (/_db$/i.test(key)) return `${label} ${value} dB`;
    return `${label} ${value}`;
  }
  if (typeof value === "string" || typeof value === "boolean") return `${label} ${String(value)}`;
  if (Array.isArray(value)) {
    if (value.length === 2 && value.every((v) => typeof v === "number") && /band|range/i.test(key)) return `${label} ${formatHz(value[0] as number)}–${formatHz(value[1] as number)}`;
    return `${label} ${value.map((v) => (typeof v === "object" && v !== null ? describeObject(v as Record<string, unknown>) : String(v))).join(", ")}`;
  }
  if (value && typeof value === "object") return `${label} (${describeObject(value as Record<string, unknown>)})`;
  return label;
}

/** Ids and hashes mean nothing to a reader; the rest in words. */
const HIDDEN_KEYS = /^(.*Id|.*Ids|id|contentHash|signoffId)$/;

function describeObject(object: Record<string, unknown>): string {
  return Object.entries(object)
    .filter(([k, v]) => !HIDDEN_KEYS.test(k) && v !== undefined && v !== null)
    .map(([k, v]) => formatField(k, v))
    .join(", ");
}

function describeRule(spec: unknown): string {
  if (!spec || typeof spec !== "object") return "";
  const { kind, id, ...rest } = spec as Record<string, unknown>;
  const name = typeof kind === "string" ? kind.replace(/_/g, " ") : "rule";
  const fields = describeObject(rest);
  return `${typeof id === "string" ? `${id}: ` : ""}${name}${fields ? ` (${fields})` : ""}`;
}

const text = (value: unknown): string => (value === undefined || value === null ? "" : String(value));

type Describer = (target: string, detail: Record<string, unknown>) => string;

const DESCRIBE: Record<string, Describer> = {
  "project.create": (t) => `Created the project ${t}`,
  "project.update": (t, d) => `Changed the project ${t}${describeObject(d) ? `: ${describeObject(d)}` : ""}`,
  "project.delete": (t) => `Deleted the project ${t}`,
  "member.role_change": (t, d) => `Changed ${t}'s role from ${text(d.from)} to ${text(d.to)}`,
  "member.remove": (t, d) => `Removed ${t} (${text(d.role)}) from the project`,
  "member.leave": (t, d) => `${t} (${text(d.role)}) left the project`,
  "invitation.create": (t, d) => `Invited ${t} as ${text(d.role)}`,
  "invitation.revoke": (t) => `Withdrew the invitation to ${t}`,
  "invitation.accept": (t, d) => `${t} accepted the invitation as ${text(d.role)}`,
  "scenario.create": (t, d) => `Created the scenario ${t}${d.template && d.template !== "blank" ? ` from ${text(d.template)}` : ""}`,
  "scenario.save": (t, d) => `Saved ${t} as revision ${text(d.revision)}`,
  "scenario.rename": (_t, d) => `Renamed the scenario ${text(d.from)} to ${text(d.to)}`,
  "scenario.restore": (t, d) => `Restored ${t} revision ${text(d.from)} as revision ${text(d.revision)}`,
  "scenario.duplicate": (t, d) => `Duplicated revision ${text(d.fromRevision)} as the scenario ${t}`,
  "scenario.delete": (t, d) => `Deleted the scenario ${t} (${text(d.revisions)} revisions)`,
  "part.upload": (t, d) => `Uploaded the part ${t} (${text(d.ports)} ports, ${text(d.points)} frequency points)`,
  "part.delete": (t, d) => `Deleted the part ${t}${typeof d.version === "number" && d.version > 1 ? ` version ${d.version}` : ""}`,
  "part.version_upload": (t, d) => `Uploaded version ${text(d.version)} of the part ${t} (${text(d.ports)} ports, ${text(d.points)} frequency points)`,
  "part.move": (t, d) => `Moved block ${text(d.block)} of ${text(d.scenario)} from ${t} version ${text(d.from)} to version ${text(d.to)}`,
  "rule.create": (_t, d) => `Added the rule ${describeRule(d.spec)}`,
  "rule.update": (_t, d) => `Changed the rule ${describeRule(d.from)} to ${describeRule(d.to)}`,
  "rule.delete": (_t, d) => `Deleted the rule ${describeRule(d.spec)}`,
  "signoff.request": (t) => `Requested a sign-off: ${t}`,
  "signoff.approve": (t, d) => `Approved the sign-off of ${t}${d.comment ? `: “${text(d.comment)}”` : ""}`,
  "signoff.request_changes": (t, d) => `Asked for changes to ${t}${d.comment ? `: “${text(d.comment)}”` : ""}`,
  "bundle.export": (t, d) => `Exported a review bundle of ${t} revision ${text(d.revision)} (verdict ${text(d.verdict)}, ${Math.round(Number(d.bytes ?? 0) / 1024)} KiB)`,
  "bundle.import": (t) => `Imported a review bundle as ${t}`,
  "user.sign_up": (t, d) => `Account ${t} created${d.siteAdmin ? " (first account: site admin)" : ""}`,
  "user.grant_admin": (t) => `Made ${t} a site admin`,
  "user.revoke_admin": (t, d) => `Revoked site admin from ${t}${d.reason ? ` (${text(d.reason)})` : ""}`,
  "user.deactivate": (t, d) => `Deactivated ${t} (${text(d.endedSessions ?? 0)} sessions ended)`,
  "user.reactivate": (t) => `Reactivated ${t}`,
  "user.password_change": (t, d) => `${t} changed their password (${text(d.endedSessions ?? 0)} other sessions ended)`,
  "user.password_reset_request": (t) => `Password reset asked for ${t}`,
  "user.password_reset": (t) => `Password of ${t} reset by e-mail link`,
  "user.email_change_request": (t, d) => `${t} asked to move their account to ${text(d.to)} (waiting for confirmation)`,
  "user.email_change": (_t, d) => `Account address changed from ${text(d.from)} to ${text(d.to)}`,
  "user.rename": (_t, d) => `Renamed from ${text(d.from)} to ${text(d.to)}`,
  "user.session_revoke": (t) => `${t} signed out one of their sessions`,
  "account.notifications": (_t, d) => `Turned sign-off e-mails ${d.notifySignoff ? "on" : "off"}`,
  "api_token.create": (t, d) => `Created the API token ${t} (at most ${text(d.roleCeiling)}, ${Array.isArray(d.projectIds) ? d.projectIds.length : 0} projects)`,
  "api_token.revoke": (t) => `Revoked the API token ${t}`,
  "settings.signup_mode": (t) => `Set sign-up to ${t === "open" ? "open to anyone" : "by invitation only"}`,
  "demo.seed": (t) => `Created the demo project ${t}`,
};

/** The event as one sentence. */
export function describeAuditEvent(event: AuditEventFields): string {
  const describe = DESCRIBE[event.action];
  const detail = event.detail ?? {};
  if (describe) return describe(event.target ?? "", detail);
  const rest = describeObject(detail);
  return `${event.action.replace(/[._]/g, " ")}${event.target ? ` ${event.target}` : ""}${rest ? ` (${rest})` : ""}`;
}

/** RFC 4180 CSV: fields with a comma, quote or line break are quoted, quotes doubled; CRLF line ends. */
export function toCsv(rows: string[][]): string {
  const field = (value: string) => {
    // a leading = + - @ would be read as a formula by spreadsheet programs (common practice: prefix ')
    const safe = /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
    return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
  };
  return rows.map((r) => r.map(field).join(",")).join("\r\n") + "\r\n";
}

/** The CSV of an audit log: one row per event, the sentence beside the raw action for machines. */
export function auditCsv(rows: (AuditEventFields & { createdAt: Date; actorName: string | null; actorEmail: string | null })[]): string {
  return toCsv([
    ["time_utc", "person", "email", "what", "action", "target"],
    ...rows.map((r) => [r.createdAt.toISOString(), r.actorName ?? "", r.actorEmail ?? "", describeAuditEvent(r), r.action, r.target ?? ""]),
  ]);
}
