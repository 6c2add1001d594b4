import type { BlockSpec, PortRef, Scenario } from "@/engine/types";
import { valueText } from "./diff";
import { canonicalJson } from "@/engine/canonical-json";

/**
 * Three-way merge of scenario edits: `mine` and `theirs` both started from `base`. Units merged on their
 * own: each block (by id) and, inside it, each parameter (with its typed expression and spread) and each
 * other field; each link (by its two ends, whichever is written first); each system port (by name); each
 * scenario rule, override and opt-out (by rule id); each field of the frequency plan and the other
 * scenario settings. A unit changed on one side only takes that side's value; changed the same way on
 * both, that value; changed differently on both, a conflict the person settles (mine or theirs). A block
 * deleted on one side and edited (or newly linked) on the other is a conflict too, and so is a port that
 * both sides linked to different places.
 */

export type MergeChoice = "mine" | "theirs";

export type MergeConflict = {
  /** stable key of the unit, what a resolution names: "block:LNA:param:gain_db", "rule:override:rx-il" */
  key: string;
  area: "block" | "parameter" | "link" | "port" | "rule" | "plan" | "setting";
  /** the unit in words: "LNA gain_db", "block LNA", "override of rule rx-il" */
  label: string;
  mine: string;
  theirs: string;
};

export type MergeResult = { ok: true; scenario: Scenario; conflicts: MergeConflict[] } | { ok: false; conflicts: MergeConflict[] };

// compared as RFC 8785 canonical JSON (key order and absent members do not count); absent = absent
const same = (a: unknown, b: unknown) => a === b || (a !== undefined && b !== undefined && canonicalJson(a) === canonicalJson(b));

type Collect = { conflicts: Map<string, MergeConflict>; resolutions: Record<string, MergeChoice> };

/**
 * One unit's three-way merge: the changed side's value, or on a real conflict the resolution's (the
 * conflict is recorded either way, so that the caller can say what was settled).
 */
function merge3<T>(c: Collect, base: T, mine: T, theirs: T, conflict: Omit<MergeConflict, "mine" | "theirs">, text: (v: T) => string): T {
  if (same(mine, theirs) || same(theirs, base)) return mine;
  if (same(mine, base)) return theirs;
  if (!c.conflicts.has(conflict.key)) c.conflicts.set(conflict.key, { ...conflict, mine: text(mine), theirs: text(theirs) });
  return c.resolutions[conflict.key] === "theirs" ? theirs : mine;
}

/** The merged order of keyed items: the side that reordered or inserted leads, the other side's additions follow. */
function mergedOrder(base: string[], mine: string[], theirs: string[], keep: (key: string) => boolean): string[] {
  const lead = same(mine, base) ? theirs : mine;
  const other = lead === mine ? theirs : mine;
  const out = lead.filter(keep);
  const seen = new Set(out);
  for (const k of other) {
    if (seen.has(k) || !keep(k)) continue;
    out.push(k);
    seen.add(k);
  }
  return out;
}

/** Keyed collection present on three sides: which keys survive (added on a side, or kept by both). */
function present(key: string, base: Map<string, unknown>, mine: Map<string, unknown>, theirs: Map<string, unknown>): boolean {
  const inBase = base.has(key);
  if (!inBase) return mine.has(key) || theirs.has(key);
  return mine.has(key) && theirs.has(key);
}

/** Whether an optional field is present after the merge: the side that added or removed it wins. */
function kept(base: unknown, mine: unknown, theirs: unknown): boolean {
  const [b, m, t] = [base !== undefined, mine !== undefined, theirs !== undefined];
  return m === b ? t : m;
}

function fieldText(name: string) {
  return (v: unknown) => valueText(name, v);
}

const blockFieldKey = (id: string, field: string, sub?: string) => (sub === undefined ? `block:${id}:${field}` : `block:${id}:param:${sub}`);

/** Fields of a block merged key by key (params, their typed expressions and spreads share the parameter's key). */
const PER_KEY_FIELDS = ["params", "expr", "spread"] as const;

function mergeBlock(c: Collect, base: BlockSpec, mine: BlockSpec, theirs: BlockSpec): BlockSpec {
  const out: Record<string, unknown> = {};
  const b = base as Record<string, unknown>;
  const m = mine as Record<string, unknown>;
  const t = theirs as Record<string, unknown>;
  const fields = [...new Set([...Object.keys(m), ...Object.keys(t), ...Object.keys(b)])];
  for (const field of fields) {
    if ((PER_KEY_FIELDS as readonly string[]).includes(field)) {
      const bm = (b[field] ?? {}) as Record<string, unknown>;
      const mm = (m[field] ?? {}) as Record<string, unknown>;
      const tm = (t[field] ?? {}) as Record<string, unknown>;
      const merged: Record<string, unknown> = {};
      const keys = [...new Set([...Object.keys(mm), ...Object.keys(tm), ...Object.keys(bm)])];
      for (const k of keys) {
        const v = merge3(c, bm[k], mm[k], tm[k], { key: blockFieldKey(mine.id, field, k), area: "parameter", label: `${mine.id} ${k}` }, fieldText(k));
        if (v !== undefined) merged[k] = v;
      }
      // keep "absent" and "{}" apart as the sides wrote them, so that an untouched block stays equal
      if (Object.keys(merged).length > 0 || kept(b[field], m[field], t[field])) out[field] = merged;
      continue;
    }
    const v = merge3(c, b[field], m[field], t[field], { key: blockFieldKey(mine.id, field), area: "block", label: `${mine.id} ${field}` }, fieldText(field));
    if (v !== undefined) out[field] = v;
  }
  return out as BlockSpec;
}

const linkKey = ([x, y]: [PortRef, PortRef]) => (x < y ? `${x}~${y}` : `${y}~${x}`);
const blockOf = (ref: PortRef) => ref.slice(0, ref.lastIndexOf(":"));

function blockSummary(block: BlockSpec | undefined): string {
  return block ? `kept and edited (${block.kind})` : "deleted";
}

/** Scenario fields merged as one value each (the frequency plan is merged field by field when both keep its shape). */
const SETTINGS = ["z0", "temperature_k", "extrapolate", "format"] as const;

/**
 * Merge `mine` and `theirs`, both edited from `base`. With `resolutions` naming a side for every real
 * conflict the merge is complete (`ok`, the conflicts that were settled listed); otherwise `ok: false`
 * with the conflicts still to settle. Pure: the same inputs give the same scenario.
 * @example merge(base, withGainChanged, withLossChanged) // { ok: true, scenario: both edits, conflicts: [] }
 */
export function mergeScenarios(base: Scenario, mine: Scenario, theirs: Scenario, resolutions: Record<string, MergeChoice> = {}): MergeResult {
  const c: Collect = { conflicts: new Map(), resolutions };
  const out: Record<string, unknown> = { ...(mine as Record<string, unknown>) };

  // scenario settings
  for (const field of SETTINGS) {
    const v = merge3(c, (base as Record<string, unknown>)[field], (mine as Record<string, unknown>)[field], (theirs as Record<string, unknown>)[field], { key: `setting:${field}`, area: "setting", label: field }, fieldText(field));
    if (v === undefined) delete out[field];
    else out[field] = v;
  }
  out.name = mine.name;

  // frequency plan: field by field while both sides keep the plan's shape (sweep or list)
  const shape = (p: unknown) => Object.keys((p ?? {}) as object).sort().join(",");
  if (shape(base.frequency) === shape(mine.frequency) && shape(base.frequency) === shape(theirs.frequency)) {
    const plan: Record<string, unknown> = {};
    for (const k of Object.keys(mine.frequency ?? {})) {
      plan[k] = merge3(c, (base.frequency as Record<string, unknown>)[k], (mine.frequency as Record<string, unknown>)[k], (theirs.frequency as Record<string, unknown>)[k], { key: `plan:${k}`, area: "plan", label: `frequency plan ${k}` }, fieldText(k === "points" ? "points" : `${k}_hz`));
    }
    out.frequency = plan;
  } else {
    out.frequency = merge3(c, base.frequency, mine.frequency, theirs.frequency, { key: "plan", area: "plan", label: "frequency plan" }, fieldText("frequency"));
  }

  // variables, key by key
  if (base.variables !== undefined || mine.variables !== undefined || theirs.variables !== undefined) {
    const bv = base.variables ?? {};
    const mv = mine.variables ?? {};
    const tv = theirs.variables ?? {};
    const vars: Record<string, string | number> = {};
    for (const k of [...new Set([...Object.keys(mv), ...Object.keys(tv), ...Object.keys(bv)])]) {
      const v = merge3(c, bv[k], mv[k], tv[k], { key: `variable:${k}`, area: "setting", label: `variable ${k}` }, fieldText(k));
      if (v !== undefined) vars[k] = v;
    }
    if (Object.keys(vars).length === 0 && !kept(base.variables, mine.variables, theirs.variables)) delete out.variables;
    else out.variables = vars;
  }

  // links first (a new link to a block counts as an edit of that block when the other side deleted it)
  const lb = new Map(base.links.map((l) => [linkKey(l), l]));
  const lm = new Map(mine.links.map((l) => [linkKey(l), l]));
  const lt = new Map(theirs.links.map((l) => [linkKey(l), l]));
  const newlyLinked = (side: Map<string, [PortRef, PortRef]>) => new Set([...side].filter(([k]) => !lb.has(k)).flatMap(([, [x, y]]) => [blockOf(x), blockOf(y)]));
  const linkedMine = newlyLinked(lm);
  const linkedTheirs = newlyLinked(lt);

  // blocks
  const bb = new Map(base.blocks.map((x) => [x.id, x]));
  const bm = new Map(mine.blocks.map((x) => [x.id, x]));
  const bt = new Map(theirs.blocks.map((x) => [x.id, x]));
  const blocks = new Map<string, BlockSpec>();
  /** blocks one side deleted that the merge keeps (the other side's edits chosen), with the deleting side */
  const revived = new Map<string, MergeChoice>();
  for (const id of new Set([...bm.keys(), ...bt.keys(), ...bb.keys()])) {
    const b = bb.get(id);
    const m = bm.get(id);
    const t = bt.get(id);
    if (!b) {
      // added on one side, or on both: both the same, or merged as if from an empty block of its kind
      if (m && t) blocks.set(id, same(m, t) ? m : mergeBlock(c, { id, kind: m.kind } as BlockSpec, m, t));
      else blocks.set(id, (m ?? t) as BlockSpec);
      continue;
    }
    if (m && t) {
      blocks.set(id, mergeBlock(c, b, m, t));
      continue;
    }
    if (!m && !t) continue; // deleted on both sides
    // deleted on one side: a conflict when the other side edited it or linked something new to it
    const kept = (m ?? t) as BlockSpec;
    const edited = !same(kept, b) || (m ? linkedMine.has(id) : linkedTheirs.has(id));
    if (!edited) continue;
    const key = `block:${id}`;
    if (!c.conflicts.has(key)) c.conflicts.set(key, { key, area: "block", label: `block ${id}`, mine: blockSummary(m), theirs: blockSummary(t) });
    const choice = resolutions[key] ?? "mine";
    const chosen = choice === "mine" ? m : t;
    if (chosen) {
      blocks.set(id, chosen);
      revived.set(id, m ? "theirs" : "mine");
    }
  }
  // A kept block keeps its links and system ports: the deleting side dropped them only with the block.
  const at = (ref: PortRef) => revived.get(blockOf(ref));
  for (const [k, l] of lb) {
    const deleter = at(l[0]) ?? at(l[1]);
    if (deleter) (deleter === "mine" ? lm : lt).set(k, l);
  }
  const blockOrder = mergedOrder(
    base.blocks.map((x) => x.id),
    mine.blocks.map((x) => x.id),
    theirs.blocks.map((x) => x.id),
    (id) => blocks.has(id),
  );
  out.blocks = blockOrder.map((id) => blocks.get(id) as BlockSpec);

  // links: base ∪ added on either side − removed on either side, then only between blocks that remain
  const linkKeys = mergedOrder([...lb.keys()], [...lm.keys()], [...lt.keys()], (k) => present(k, lb, lm, lt));
  let links = linkKeys.map((k) => (lm.get(k) ?? lt.get(k)) as [PortRef, PortRef]).filter(([x, y]) => blocks.has(blockOf(x)) && blocks.has(blockOf(y)));
  // a port each side linked somewhere else: one link per port, so the person chooses
  const addedBy = (k: string): MergeChoice | null => (lb.has(k) ? null : lm.has(k) ? "mine" : "theirs");
  const portUse = new Map<PortRef, string[]>();
  for (const l of links) for (const end of l) portUse.set(end, [...(portUse.get(end) ?? []), linkKey(l)]);
  const dropped = new Set<string>();
  for (const [port, keys] of portUse) {
    if (keys.length < 2) continue;
    const mineKeys = keys.filter((k) => addedBy(k) === "mine" || (lm.has(k) && !lt.has(k)));
    const theirKeys = keys.filter((k) => addedBy(k) === "theirs" || (lt.has(k) && !lm.has(k)));
    if (mineKeys.length === 0 || theirKeys.length === 0) continue; // one side's own doing: not a merge question
    const key = `link:${port}`;
    const text = (ks: string[]) => ks.map((k) => k.replace("~", " — ")).join(", ");
    if (!c.conflicts.has(key)) c.conflicts.set(key, { key, area: "link", label: `links at ${port}`, mine: text(mineKeys), theirs: text(theirKeys) });
    for (const k of (resolutions[key] ?? "mine") === "mine" ? theirKeys : mineKeys) dropped.add(k);
  }
  links = links.filter((l) => !dropped.has(linkKey(l)));
  out.links = links;

  // system ports by name
  const pb = new Map(base.ports.map((p) => [p.name, p]));
  const pm = new Map(mine.ports.map((p) => [p.name, p]));
  const pt = new Map(theirs.ports.map((p) => [p.name, p]));
  for (const [name, p] of pb) {
    const deleter = at(p.at);
    const side = deleter === "mine" ? pm : deleter === "theirs" ? pt : null;
    if (side && !side.has(name)) side.set(name, p);
  }
  const ports = new Map<string, unknown>();
  for (const name of new Set([...pm.keys(), ...pt.keys(), ...pb.keys()])) {
    const v = merge3(c, pb.get(name), pm.get(name), pt.get(name), { key: `port:${name}`, area: "port", label: `system port ${name}` }, (p) => (p ? `at ${p.at}${p.z0 !== undefined ? `, ${p.z0} Ω` : ""}` : "removed"));
    if (v !== undefined) ports.set(name, v);
  }
  out.ports = mergedOrder([...pb.keys()], [...pm.keys()], [...pt.keys()], (k) => ports.has(k)).map((k) => ports.get(k));

  // scenario rules, overrides and opt-outs, by rule id (a scenario rule without id by its place)
  const entries = [
    ["rules", "scenario rule"],
    ["rule_overrides", "override of rule"],
    ["rule_opt_outs", "opt-out of rule"],
  ] as const;
  for (const [field, what] of entries) {
    const list = (sc: Scenario) => ((sc[field] ?? []) as { id?: string }[]).map((e, i) => [e.id ?? `#${i + 1}`, e] as [string, unknown]);
    const eb = new Map(list(base));
    const em = new Map(list(mine));
    const et = new Map(list(theirs));
    const merged = new Map<string, unknown>();
    for (const id of new Set([...em.keys(), ...et.keys(), ...eb.keys()])) {
      const v = merge3(c, eb.get(id), em.get(id), et.get(id), { key: `rule:${field}:${id}`, area: "rule", label: `${what} ${id}` }, (e) => (e === undefined ? "removed" : "edited"));
      if (v !== undefined) merged.set(id, v);
    }
    const value = mergedOrder([...eb.keys()], [...em.keys()], [...et.keys()], (k) => merged.has(k)).map((k) => merged.get(k));
    if (value.length === 0 && !kept(base[field], mine[field], theirs[field])) delete out[field];
    else out[field] = value;
  }

  const conflicts = [...c.conflicts.values()];
  if (conflicts.some((x) => resolutions[x.key] === undefined)) return { ok: false, conflicts: conflicts.filter((x) => resolutions[x.key] === undefined) };
  return { ok: true, scenario: out as Scenario, conflicts };
}
