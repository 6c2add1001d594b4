import { formatHz } from "@/engine/checks/band";
import type { BlockSpec, PortRef, Scenario } from "@/engine/types";
import { canonicalJson } from "@/engine/canonical-json";

/** A changed parameter (or another field of a block): its value before and after; undefined = not set. */
export type FieldChange = { name: string; before: unknown; after: unknown };

export type BlockDiff =
  | { change: "added"; id: string; kind: string }
  | { change: "removed"; id: string; kind: string }
  | { change: "changed"; id: string; kind: string; params: FieldChange[]; fields: FieldChange[]; state: { before: number | undefined; after: number | undefined } | null };

export type LinkDiff = { change: "added" | "removed"; link: [PortRef, PortRef] };

export type PortDiff =
  | { change: "added" | "removed"; name: string; at: PortRef }
  | { change: "moved"; name: string; before: PortRef; after: PortRef }
  | { change: "z0"; name: string; before: number | undefined; after: number | undefined };

/** A change of the scenario's own rule entries (overrides, opt-outs, scenario-only rules), by rule name. */
export type RuleEntryDiff = { change: "added" | "removed" | "changed"; entry: "override" | "opt-out" | "scenario rule"; id: string; before?: unknown; after?: unknown };

export type ScenarioDiff = {
  blocks: BlockDiff[];
  /** the scenario's rule entries that differ (project rules are the same for both scenarios of a project) */
  rules: RuleEntryDiff[];
  links: LinkDiff[];
  ports: PortDiff[];
  /** scenario-level fields that differ: z0, frequency plan */
  settings: FieldChange[];
  /** true when nothing the engine reads differs (positions and labels are ignored) */
  same: boolean;
};

// compared as RFC 8785 canonical JSON (key order and absent members do not count); absent = absent
const equal = (a: unknown, b: unknown) => a === b || (a !== undefined && b !== undefined && canonicalJson(a) === canonicalJson(b));

/** Block fields compared besides `params` and `state` (chart position, label and editor expressions are not). */
const BLOCK_FIELDS = ["kind", "file", "data", "ports", "rating_dbm", "active"] as const;

function diffBlock(a: BlockSpec, b: BlockSpec): BlockDiff | null {
  const pa = (a.params ?? {}) as Record<string, unknown>;
  const pb = (b.params ?? {}) as Record<string, unknown>;
  const params: FieldChange[] = [...new Set([...Object.keys(pa), ...Object.keys(pb)])]
    .sort()
    .filter((k) => !equal(pa[k], pb[k]))
    .map((k) => ({ name: k, before: pa[k], after: pb[k] }));
  const fields: FieldChange[] = BLOCK_FIELDS.filter((k) => !equal(a[k], b[k])).map((k) => ({ name: k, before: a[k], after: b[k] }));
  const state = a.state !== b.state ? { before: a.state, after: b.state } : null;
  if (params.length === 0 && fields.length === 0 && !state) return null;
  return { change: "changed", id: a.id, kind: b.kind, params, fields, state };
}

const linkKey = ([x, y]: [PortRef, PortRef]) => (x < y ? `${x}~${y}` : `${y}~${x}`);

/**
 * What differs between two scenarios (or two revisions of one), in what the engine reads: blocks added,
 * removed or changed (parameters, switch state, part file, rating, active flag), links added or removed (a link is the
 * same whichever end is written first), system ports added, removed, moved or with another Z0, and the
 * system Z0 and frequency plan. Blocks are matched by id.
 * @example diffScenarios(a, b).blocks // [{ change: "changed", id: "TR", params: [{ name: "isolation_db", before: 45, after: 25 }], … }]
 */
export function diffScenarios(a: Scenario, b: Scenario): ScenarioDiff {
  const blocksA = new Map(a.blocks.map((x) => [x.id, x]));
  const blocksB = new Map(b.blocks.map((x) => [x.id, x]));
  const blocks: BlockDiff[] = [];
  for (const x of a.blocks) {
    const y = blocksB.get(x.id);
    if (!y) blocks.push({ change: "removed", id: x.id, kind: x.kind });
    else {
      const d = diffBlock(x, y);
      if (d) blocks.push(d);
    }
  }
  for (const y of b.blocks) if (!blocksA.has(y.id)) blocks.push({ change: "added", id: y.id, kind: y.kind });

  const linksA = new Map(a.links.map((l) => [linkKey(l), l]));
  const linksB = new Map(b.links.map((l) => [linkKey(l), l]));
  const links: LinkDiff[] = [
    ...[...linksA].filter(([k]) => !linksB.has(k)).map(([, link]) => ({ change: "removed" as const, link })),
    ...[...linksB].filter(([k]) => !linksA.has(k)).map(([, link]) => ({ change: "added" as const, link })),
  ];

  const portsA = new Map(a.ports.map((p) => [p.name, p]));
  const portsB = new Map(b.ports.map((p) => [p.name, p]));
  const ports: PortDiff[] = [];
  for (const p of a.ports) {
    const q = portsB.get(p.name);
    if (!q) ports.push({ change: "removed", name: p.name, at: p.at });
    else {
      if (p.at !== q.at) ports.push({ change: "moved", name: p.name, before: p.at, after: q.at });
      if ((p.z0 ?? a.z0) !== (q.z0 ?? b.z0)) ports.push({ change: "z0", name: p.name, before: p.z0 ?? a.z0, after: q.z0 ?? b.z0 });
    }
  }
  for (const q of b.ports) if (!portsA.has(q.name)) ports.push({ change: "added", name: q.name, at: q.at });

  const settings: FieldChange[] = [];
  if (a.z0 !== b.z0) settings.push({ name: "z0", before: a.z0, after: b.z0 });
  if (!equal(a.frequency, b.frequency)) settings.push({ name: "frequency", before: a.frequency, after: b.frequency });

  const rules: RuleEntryDiff[] = [];
  const entries = (sc: Scenario) => ({
    override: new Map((sc.rule_overrides ?? []).map((o) => { const { by: _b, at: _a, ...r } = o; void _b; void _a; return [o.id, r as unknown]; })),
    "opt-out": new Map((sc.rule_opt_outs ?? []).map((o) => [o.id, o.reason as unknown])),
    "scenario rule": new Map((sc.rules ?? []).map((r, i) => [r.id ?? `rules[${i}]`, r as unknown])),
  });
  const ea = entries(a);
  const eb = entries(b);
  for (const entry of ["override", "opt-out", "scenario rule"] as const) {
    for (const [id, before] of ea[entry]) {
      if (!eb[entry].has(id)) rules.push({ change: "removed", entry, id, before });
      else if (!equal(before, eb[entry].get(id))) rules.push({ change: "changed", entry, id, before, after: eb[entry].get(id) });
    }
    for (const [id, after] of eb[entry]) if (!ea[entry].has(id)) rules.push({ change: "added", entry, id, after });
  }

  return { blocks, rules, links, ports, settings, same: blocks.length + rules.length + links.length + ports.length + settings.length === 0 };
}

/** Units read from a parameter's name suffix (docs/blocks.md names parameters with their unit). */
const UNIT_SUFFIXES: [RegExp, (x: number) => string][] = [
  [/_hz$/, (x) => formatHz(x)],
  [/_dbm$/, (x) => `${x} dBm`],
  [/_db$/, (x) => `${x} dB`],
  [/_deg$/, (x) => `${x}°`],
  [/_(ohm|ohms)$/, (x) => `${x} Ω`],
  [/^z0$/, (x) => `${x} Ω`],
];

/** A frequency plan in words: "2.3 GHz to 2.6 GHz, 301 points" or "3 frequencies, 1 GHz to 3 GHz". */
export function planText(plan: unknown): string {
  const p = plan as { start?: number; stop?: number; points?: number; list?: number[] } | undefined;
  if (!p || typeof p !== "object") return "not set";
  if (Array.isArray(p.list)) {
    const lo = Math.min(...p.list);
    const hi = Math.max(...p.list);
    return p.list.length === 1 ? `1 frequency, ${formatHz(lo)}` : `${p.list.length} frequencies, ${formatHz(lo)} to ${formatHz(hi)}`;
  }
  if (typeof p.start === "number" && typeof p.stop === "number") return `${formatHz(p.start)} to ${formatHz(p.stop)}, ${p.points ?? "?"} point${p.points === 1 ? "" : "s"}`;
  return "not set";
}

/**
 * A value of a changed field in words with its unit, never `undefined` or raw JSON: "45 dB", "2.44 GHz",
 * "not set", "parts/x.s2p", a frequency plan as planText.
 * @example valueText("isolation_db", 45) // "45 dB"
 */
export function valueText(name: string, value: unknown): string {
  if (value === undefined || value === null) return "not set";
  if (name === "frequency") return planText(value);
  if (typeof value === "number") {
    const unit = UNIT_SUFFIXES.find(([re]) => re.test(name));
    return unit ? unit[1](value) : String(value);
  }
  if (typeof value === "string") return value;
  if (typeof value === "boolean") return value ? "yes" : "no";
  if (Array.isArray(value)) return value.map((v) => valueText(name, v)).join(", ");
  return Object.entries(value as Record<string, unknown>)
    .map(([k, v]) => `${k} ${valueText(k, v)}`)
    .join(", ");
}

/** "isolation_db: 45 dB → 25 dB" */
export function changeText(c: FieldChange): string {
  return `${c.name}: ${valueText(c.name, c.before)} → ${valueText(c.name, c.after)}`;
}
