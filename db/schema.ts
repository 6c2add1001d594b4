import { sql } from "drizzle-orm";
import { blob, index, integer, primaryKey, real, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
// types only (erased at build time): the JSON columns hold these shapes
import type { RuleSpec, Scenario } from "../engine/types";
import type { CheckName } from "../lib/domain/checks/inputs";
import type { CheckFigures } from "../lib/domain/checks/types";
import type { RevisionChangeSummary } from "../lib/domain/scenarios/summary";

export const ROLES = ["owner", "engineer", "reviewer"] as const;
export type Role = (typeof ROLES)[number];

const createdAt = () =>
  integer("created_at", { mode: "timestamp_ms" })
    .notNull()
    .default(sql`(unixepoch() * 1000)`);

export const users = sqliteTable("users", {
  id: text("id").primaryKey(),
  /** Always stored lower-cased and trimmed. */
  email: text("email").notNull().unique(),
  name: text("name").notNull(),
  passwordHash: text("password_hash").notNull(),
  isSiteAdmin: integer("is_site_admin", { mode: "boolean" }).notNull().default(false),
  notifySignoff: integer("notify_signoff", { mode: "boolean" }).notNull().default(true),
  /** Set by a site admin: the account cannot sign in and has no sessions or working tokens. */
  deactivatedAt: integer("deactivated_at", { mode: "timestamp_ms" }),
  createdAt: createdAt(),
});
export type User = typeof users.$inferSelect;
export type NewUser = typeof users.$inferInsert;

/** `id` is the SHA-256 of the cookie token, never the token itself. `expires_at` is in seconds (the session adapter's unit). */
export const sessions = sqliteTable(
  "sessions",
  {
    id: text("id").primaryKey(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    expiresAt: integer("expires_at").notNull(),
    /**
     * When the session was started (the account page lists one's sessions by it). Null for sessions
     * from before the column: SQLite cannot add a column with an expression default.
     */
    createdAt: integer("created_at", { mode: "timestamp_ms" }),
  },
  (table) => [index("sessions_user_id_idx").on(table.userId)],
);
export type Session = typeof sessions.$inferSelect;
export type NewSession = typeof sessions.$inferInsert;

export const projects = sqliteTable("projects", {
  id: text("id").primaryKey(),
  name: text("name").notNull(),
  description: text("description").notNull().default(""),
  createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
  createdAt: createdAt(),
  updatedAt: integer("updated_at", { mode: "timestamp_ms" })
    .notNull()
    .default(sql`(unixepoch() * 1000)`),
});
export type Project = typeof projects.$inferSelect;
export type NewProject = typeof projects.$inferInsert;

export const memberships = sqliteTable(
  "memberships",
  {
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    role: text("role", { enum: ROLES }).notNull(),
    createdAt: createdAt(),
  },
  (table) => [primaryKey({ columns: [table.projectId, table.userId] }), index("memberships_user_id_idx").on(table.userId)],
);
export type Membership = typeof memberships.$inferSelect;
export type NewMembership = typeof memberships.$inferInsert;

export const invitations = sqliteTable(
  "invitations",
  {
    id: text("id").primaryKey(),
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    email: text("email").notNull(),
    role: text("role", { enum: ROLES }).notNull(),
    tokenHash: text("token_hash").notNull(),
    invitedBy: text("invited_by").references(() => users.id, { onDelete: "set null" }),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    acceptedAt: integer("accepted_at", { mode: "timestamp_ms" }),
    acceptedBy: text("accepted_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (table) => [uniqueIndex("invitations_token_hash_idx").on(table.tokenHash), index("invitations_project_id_idx").on(table.projectId)],
);
export type Invitation = typeof invitations.$inferSelect;
export type NewInvitation = typeof invitations.$inferInsert;

export const passwordResets = sqliteTable(
  "password_resets",
  {
    id: text("id").primaryKey(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    tokenHash: text("token_hash").notNull(),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    usedAt: integer("used_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (table) => [uniqueIndex("password_resets_token_hash_idx").on(table.tokenHash)],
);
export type PasswordReset = typeof passwordResets.$inferSelect;
export type NewPasswordReset = typeof passwordResets.$inferInsert;

/** Who did what. `project_id` is null for site-wide events (sign-up, settings) and after a project is deleted. */
/** A requested change of a user's e-mail address, waiting for the link mailed to the new address. */
export const emailChanges = sqliteTable(
  "email_changes",
  {
    id: text("id").primaryKey(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    /** lower-cased and trimmed, like users.email */
    newEmail: text("new_email").notNull(),
    tokenHash: text("token_hash").notNull(),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    usedAt: integer("used_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (table) => [uniqueIndex("email_changes_token_hash_idx").on(table.tokenHash)],
);

export const auditEvents = sqliteTable(
  "audit_events",
  {
    id: text("id").primaryKey(),
    projectId: text("project_id").references(() => projects.id, { onDelete: "set null" }),
    actorId: text("actor_id").references(() => users.id, { onDelete: "set null" }),
    /** Kept so the log stays readable after the actor's account is deleted. */
    actorEmail: text("actor_email"),
    action: text("action").notNull(),
    target: text("target"),
    detail: text("detail", { mode: "json" }).$type<Record<string, unknown>>(),
    createdAt: createdAt(),
  },
  (table) => [index("audit_events_project_id_idx").on(table.projectId, table.createdAt)],
);
export type AuditEvent = typeof auditEvents.$inferSelect;
export type NewAuditEvent = typeof auditEvents.$inferInsert;

export const settings = sqliteTable("settings", {
  key: text("key").primaryKey(),
  value: text("value").notNull(),
  updatedAt: integer("updated_at", { mode: "timestamp_ms" })
    .notNull()
    .default(sql`(unixepoch() * 1000)`),
});
export type Setting = typeof settings.$inferSelect;
export type NewSetting = typeof settings.$inferInsert;

/** Failed sign-ins per key ("account:<email>" or "ip:<address>"), shared by every app instance on the database. */
export const loginThrottle = sqliteTable("login_throttle", {
  key: text("key").primaryKey(),
  failures: integer("failures").notNull().default(0),
  windowStart: integer("window_start", { mode: "timestamp_ms" }).notNull(),
  lockedUntil: integer("locked_until", { mode: "timestamp_ms" }),
  /** How many times this key has been locked in a row; the lock doubles each time. */
  lockCount: integer("lock_count").notNull().default(0),
});
export type LoginThrottle = typeof loginThrottle.$inferSelect;
export type NewLoginThrottle = typeof loginThrottle.$inferInsert;

/** Messages the local fake SMTP server received over SMTP. */
export const outboxMessages = sqliteTable(
  "outbox_messages",
  {
    id: text("id").primaryKey(),
    fromAddress: text("from_address").notNull().default(""),
    toAddress: text("to_address").notNull().default(""),
    subject: text("subject").notNull().default(""),
    text: text("text"),
    html: text("html"),
    raw: text("raw").notNull(),
    receivedAt: integer("received_at", { mode: "timestamp_ms" }).notNull(),
  },
  (table) => [index("outbox_messages_received_at_idx").on(table.receivedAt)],
);
export type OutboxMessage = typeof outboxMessages.$inferSelect;
export type NewOutboxMessage = typeof outboxMessages.$inferInsert;

// ---------------------------------------------------------------------------------------------------
// Scenarios, their revisions, parts, project rules and check runs (issue 5).

/** A named chart in a project; its content lives in revisions, the newest being the current one. */
export const scenarios = sqliteTable(
  "scenarios",
  {
    id: text("id").primaryKey(),
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    /** Id of the newest revision (null only inside the transaction that creates the scenario). */
    latestRevisionId: text("latest_revision_id"),
    /** Number of the newest revision; revisions count 1, 2, 3… per scenario. */
    latestRevisionNumber: integer("latest_revision_number").notNull().default(0),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: integer("updated_at", { mode: "timestamp_ms" })
      .notNull()
      .default(sql`(unixepoch() * 1000)`),
  },
  (table) => [index("scenarios_project_id_idx").on(table.projectId, table.name)],
);
export type ScenarioRow = typeof scenarios.$inferSelect;
export type NewScenarioRow = typeof scenarios.$inferInsert;

/** One saved state of a scenario. Never updated: a restore writes a new revision with the old content. */
export const scenarioRevisions = sqliteTable(
  "scenario_revisions",
  {
    id: text("id").primaryKey(),
    scenarioId: text("scenario_id")
      .notNull()
      .references(() => scenarios.id, { onDelete: "cascade" }),
    number: integer("number").notNull(),
    /** The scenario file JSON (docs/scenario-format.md), plus the workspace's `expr` and `position` per block. */
    content: text("content", { mode: "json" }).notNull().$type<Scenario>(),
    /** SHA-256 (hex) of the canonical JSON of `content` (keys sorted); sign-offs bind to it. */
    contentHash: text("content_hash").notNull(),
    /** Engine reference problems found when saving (a draft may be incomplete); empty when it solves. */
    warnings: text("warnings", { mode: "json" }).notNull().$type<string[]>(),
    /** Why this revision exists: "create", "save", "restore", "duplicate", "seed". */
    origin: text("origin").notNull().default("save"),
    /** For a restore: the number of the revision whose content was restored. */
    restoredFrom: integer("restored_from"),
    authorId: text("author_id").references(() => users.id, { onDelete: "set null" }),
    /** Blocks in `content`, counted when saved: the scenario list shows it without parsing every content. */
    blockCount: integer("block_count"),
    /** System port names of `content` (JSON array), for the same reason; null on rows older than the column. */
    portNames: text("port_names", { mode: "json" }).$type<string[]>(),
    /** The author's note on a deliberate save ("Save revision"); null when none was given. */
    note: text("note"),
    /** What changed against the previous revision, computed when saved (lib/domain/scenarios/summary.ts); null on older rows. */
    summary: text("summary", { mode: "json" }).$type<RevisionChangeSummary>(),
    /** For a save merged with revisions written after its base: the number of the newest one it was merged with. */
    mergedWith: integer("merged_with"),
    createdAt: createdAt(),
  },
  (table) => [uniqueIndex("scenario_revisions_number_idx").on(table.scenarioId, table.number)],
);
export type ScenarioRevision = typeof scenarioRevisions.$inferSelect;
export type NewScenarioRevision = typeof scenarioRevisions.$inferInsert;

/**
 * A person's working draft of a scenario: what autosave writes (never a revision). One per person and
 * scenario; only its owner reads it. Dropped when the person saves a revision or discards the draft.
 */
export const scenarioDrafts = sqliteTable(
  "scenario_drafts",
  {
    scenarioId: text("scenario_id")
      .notNull()
      .references(() => scenarios.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    /** The revision the edits started from (a save merges against it). */
    baseRevisionId: text("base_revision_id")
      .notNull()
      .references(() => scenarioRevisions.id, { onDelete: "cascade" }),
    content: text("content", { mode: "json" }).notNull().$type<Scenario>(),
    updatedAt: integer("updated_at", { mode: "timestamp_ms" })
      .notNull()
      .default(sql`(unixepoch() * 1000)`),
  },
  (table) => [primaryKey({ columns: [table.scenarioId, table.userId] })],
);
export type ScenarioDraftRow = typeof scenarioDrafts.$inferSelect;

/**
 * One version of an uploaded Touchstone data set in a project's library; blocks name it as
 * `parts/<file_name>` and pin a version with `part_version` (absent = 1). Versions of one file share
 * `file_name` and count 1, 2, 3…; older versions stay readable by the scenarios that pin them.
 */
export const parts = sqliteTable(
  "parts",
  {
    id: text("id").primaryKey(),
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    fileName: text("file_name").notNull(),
    /** Version of this file name in the project, 1, 2, 3… (blocks pin it as `part_version`). */
    partVersion: integer("part_version").notNull().default(1),
    /** The file exactly as uploaded. */
    text: text("text").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    ports: integer("ports").notNull(),
    version: text("version").notNull(),
    points: integer("points").notNull(),
    startHz: real("start_hz").notNull(),
    stopHz: real("stop_hz").notNull(),
    /** Per-port reference impedance, Ω, as [re, im] pairs. */
    referenceOhms: text("reference_ohms", { mode: "json" }).notNull().$type<[number, number][]>(),
    /** Largest singular value of S over frequency (≤ 1 for passive data) and where. */
    maxSingular: real("max_singular").notNull(),
    maxSingularHz: real("max_singular_hz").notNull(),
    /** Largest |S_ij − S_ji| over frequency (0 for reciprocal data) and where. */
    reciprocityError: real("reciprocity_error").notNull(),
    reciprocityHz: real("reciprocity_hz").notNull(),
    uploadedBy: text("uploaded_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (table) => [uniqueIndex("parts_project_file_name_version_idx").on(table.projectId, table.fileName, table.partVersion)],
);
export type Part = typeof parts.$inferSelect;
export type NewPart = typeof parts.$inferInsert;

/** A project-level saved requirement (the `RuleSpec` of a scenario file, kept for reuse across scenarios). */
export const rules = sqliteTable(
  "rules",
  {
    id: text("id").primaryKey(),
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    kind: text("kind").notNull().$type<RuleSpec["kind"]>(),
    spec: text("spec", { mode: "json" }).notNull().$type<RuleSpec>(),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: integer("updated_at", { mode: "timestamp_ms" })
      .notNull()
      .default(sql`(unixepoch() * 1000)`),
  },
  (table) => [index("rules_project_id_idx").on(table.projectId)],
);
export type RuleRow = typeof rules.$inferSelect;
export type NewRuleRow = typeof rules.$inferInsert;

/** One check run over a scenario revision, with its verdict and figures. */
export const checkRuns = sqliteTable(
  "check_runs",
  {
    id: text("id").primaryKey(),
    scenarioId: text("scenario_id")
      .notNull()
      .references(() => scenarios.id, { onDelete: "cascade" }),
    revisionId: text("revision_id").references(() => scenarioRevisions.id, { onDelete: "set null" }),
    userId: text("user_id").references(() => users.id, { onDelete: "set null" }),
    check: text("check").notNull().$type<CheckName>(),
    inputs: text("inputs", { mode: "json" }).$type<Record<string, unknown>>(),
    verdict: text("verdict", { enum: ["pass", "fail", "warn"] }).notNull(),
    /** figures of runs stored before issue 14 (JSON text); newer runs leave it null and fill figures_gz */
    figures: text("figures", { mode: "json" }).$type<CheckFigures>(),
    /**
     * What the verdict is of (docs/checks.md "Verdict identity"): the revision's content hash, the SHA-256
     * of its effective rule set's canonical JSON, and the engine version. Null for runs stored before
     * they were recorded: such runs are shown stale.
     */
    contentHash: text("content_hash"),
    rulesHash: text("rules_hash"),
    engineVersion: text("engine_version"),
    /** the figures as gzip'd JSON (lib/server/check-runs.ts): a few times smaller than the text */
    figuresGz: blob("figures_gz", { mode: "buffer" }),
    /** the figures' one-line summary, so that lists never read the figures */
    headline: text("headline"),
    /** the stored size of the figures in bytes (either column), for the storage view */
    figuresBytes: integer("figures_bytes").notNull().default(0),
    /** kept by the retention rule whatever its age: a sign-off or bundle refers to it */
    pinned: integer("pinned", { mode: "boolean" }).notNull().default(false),
    createdAt: createdAt(),
  },
  (table) => [
    index("check_runs_scenario_id_idx").on(table.scenarioId, table.createdAt),
    index("check_runs_retention_idx").on(table.scenarioId, table.check, table.revisionId, table.createdAt),
  ],
);
export type CheckRun = typeof checkRuns.$inferSelect;
export type NewCheckRun = typeof checkRuns.$inferInsert;

// ---------------------------------------------------------------------------------------------------
// Sign-offs (issue 7).

/** One check's verdict as it stood when a sign-off was requested. */
export type VerdictSnapshotEntry = { check: string; verdict: "pass" | "fail" | "warn"; headline: string; runAt: string; runBy: string | null };

export const SIGNOFF_STATES = ["requested", "approved", "changes_requested"] as const;
export type SignoffState = (typeof SIGNOFF_STATES)[number];

/** A reviewer's waiver of failing rules, given to approve a revision whose verdict fails. */
export type SignoffWaiver = { rules: { id: string; reason: string }[] };

/** The evidence a decision was taken on: the verdict of (revision, rules hash, engine version). */
export type SignoffEvidence = { verdict: "pass" | "fail" | "warn"; rulesHash: string; engineVersion: string; failing: string[]; checkRunId: string | null };

/**
 * One reviewer's sign-off of one scenario revision. Bound to the revision's content hash: once the
 * scenario's latest revision has another hash, the sign-off is shown as stale (computed, not stored).
 */
export const signoffs = sqliteTable(
  "signoffs",
  {
    id: text("id").primaryKey(),
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    scenarioId: text("scenario_id")
      .notNull()
      .references(() => scenarios.id, { onDelete: "cascade" }),
    revisionId: text("revision_id")
      .notNull()
      .references(() => scenarioRevisions.id, { onDelete: "cascade" }),
    /** the revision's content hash when the sign-off was requested */
    contentHash: text("content_hash").notNull(),
    requestedBy: text("requested_by").references(() => users.id, { onDelete: "set null" }),
    reviewerId: text("reviewer_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    state: text("state", { enum: SIGNOFF_STATES }).notNull().default("requested"),
    /** the requester's note when asking, then the reviewer's comment when deciding */
    requestNote: text("request_note").notNull().default(""),
    comment: text("comment").notNull().default(""),
    /** the failing rules the reviewer waived, each with a reason (only on approval of a failing verdict) */
    waiver: text("waiver", { mode: "json" }).$type<SignoffWaiver>(),
    /** the verdict the decision was taken on */
    evidence: text("evidence", { mode: "json" }).$type<SignoffEvidence>(),
    /** the latest run of each check on the revision when the sign-off was requested (null: before this column) */
    verdictSnapshot: text("verdict_snapshot", { mode: "json" }).$type<VerdictSnapshotEntry[]>(),
    createdAt: createdAt(),
    decidedAt: integer("decided_at", { mode: "timestamp_ms" }),
    updatedAt: integer("updated_at", { mode: "timestamp_ms" })
      .notNull()
      .default(sql`(unixepoch() * 1000)`),
  },
  (table) => [
    index("signoffs_project_id_idx").on(table.projectId, table.createdAt),
    index("signoffs_scenario_id_idx").on(table.scenarioId),
    index("signoffs_reviewer_id_idx").on(table.reviewerId),
  ],
);
export type Signoff = typeof signoffs.$inferSelect;
export type NewSignoff = typeof signoffs.$inferInsert;

// ---------------------------------------------------------------------------------------------------
// Security hardening (issue 12): mail rate limits and personal API tokens.

/**
 * Messages sent per key within a fixed window, e.g. "reset:to:<email>" or "invite:from:<userId>".
 * Kept in the database so every app instance sharing it counts the same.
 */
export const mailRateLimits = sqliteTable("mail_rate_limits", {
  key: text("key").primaryKey(),
  count: integer("count").notNull().default(0),
  windowStart: integer("window_start", { mode: "timestamp_ms" }).notNull(),
});
export type MailRateLimit = typeof mailRateLimits.$inferSelect;

/** The most a token may do: a project role, or "read" (only actions that change nothing). */
export const TOKEN_CEILINGS = ["owner", "engineer", "reviewer", "read"] as const;
export type TokenCeiling = (typeof TOKEN_CEILINGS)[number];

/** Personal API tokens for scripts and CI. `token_hash` is the SHA-256 of the token; the token is shown once. */
export const apiTokens = sqliteTable(
  "api_tokens",
  {
    id: text("id").primaryKey(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    tokenHash: text("token_hash").notNull(),
    /** The first characters of the token, shown in the list so a person can tell tokens apart. */
    prefix: text("prefix").notNull(),
    /** The projects the token may reach (still only while its owner is a member there). */
    projectIds: text("project_ids", { mode: "json" }).notNull().$type<string[]>(),
    roleCeiling: text("role_ceiling", { enum: TOKEN_CEILINGS }).notNull(),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    lastUsedAt: integer("last_used_at", { mode: "timestamp_ms" }),
    revokedAt: integer("revoked_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (table) => [uniqueIndex("api_tokens_token_hash_idx").on(table.tokenHash), index("api_tokens_user_id_idx").on(table.userId)],
);
export type ApiToken = typeof apiTokens.$inferSelect;
