// State sweep: every combination of switch states (mixed-radix enumeration), each solved exactly with
// the switch blocks replaced and evaluated against the rules; a combinations × rules table of margins.
import { EngineInputError, SingularSystemError } from "../types";
import type { PreparedSystem, RuleSpec, SData } from "../types";
import { evaluateBlock } from "../blocks";
import { solveSystem } from "../network";
import { evaluateRules, ruleName } from "./rules";
import { bandIndices } from "./band";
import { sliceSystem } from "./slice-system";
import type { Verdict } from "./types";

/** Most combinations a sweep accepts. */
export const MAX_SWEEP_COMBINATIONS = 4096;

export type SweepCell = { verdict: Verdict; worst: number; worstHz: number; margin: number };

export type SweepRow = {
  /** selected throw of each swept switch (1-based, order of `switches`) */
  states: number[];
  /** one cell per rule (order of `rules`); empty when the combination could not be solved */
  cells: SweepCell[];
  /** smallest margin over the rules (null without rules or when unsolved) */
  worstMargin: number | null;
  verdict: Verdict;
  error?: string;
};

export type StateSweepResult = {
  switches: { block: string; throws: number }[];
  combinations: number;
  rules: { id: string; kind: RuleSpec["kind"]; name: string }[];
  rows: SweepRow[];
  /** the combination with the largest and the smallest worst margin (null without rules) */
  best: { row: number; states: number[]; worstMargin: number } | null;
  worst: { row: number; states: number[]; worstMargin: number } | null;
  passing: number;
  failing: number;
  ms: number;
  messages: string[];
};

/**
 * The switch blocks of a system and their throw counts (ports − 1).
 * @example sweepSwitches(sys) // [{ block: "SW1", index: 2, throws: 4 }]
 */
export function sweepSwitches(sys: PreparedSystem): { block: string; index: number; throws: number }[] {
  const out: { block: string; index: number; throws: number }[] = [];
  sys.blocks.forEach((b, index) => {
    if (b.kind === "switch") out.push({ block: b.id, index, throws: b.s.n - 1 });
  });
  return out;
}

/**
 * Evaluates every switch of the system in every state once: S per switch per throw (system Z0, plan).
 * @returns table[switch][state − 1]
 * @example switchStates(sys)[0][1] // S of the first switch set to throw 2
 */
export function switchStates(sys: PreparedSystem): SData[][] {
  return sweepSwitches(sys).map((sw) => {
    const spec = sys.scenario.blocks.find((b) => b.id === sw.block);
    if (!spec) throw new EngineInputError("blocks", `switch ${sw.block} is not in the scenario`);
    return Array.from({ length: sw.throws }, (_, i) => evaluateBlock({ ...spec, state: i + 1 }, sys.frequencies, sys.z0).s);
  });
}

/**
 * The states of combination number `c` (mixed radix, first switch fastest).
 * @example combinationStates(5, [2, 4]) // [2, 3]
 */
export function combinationStates(c: number, throws: readonly number[]): number[] {
  const out: number[] = [];
  let r = c;
  for (const n of throws) {
    out.push((r % n) + 1);
    r = Math.floor(r / n);
  }
  return out;
}

/**
 * Plan indices the rules look at: the union of their bands (all points when a rule has no band, e.g. a
 * drive rule without one). Solving only there gives the same verdicts, since a rule never reads a point
 * outside its band.
 * @example ruleIndices(sys, [{ kind: "match", port: "A", band: [2e9, 2.1e9], max_vswr: 2 }]) // [k…]
 */
export function ruleIndices(sys: PreparedSystem, rules: RuleSpec[]): number[] {
  const nf = sys.frequencies.length;
  const all = Array.from({ length: nf }, (_, k) => k);
  if (rules.length === 0) return all;
  const keep = new Uint8Array(nf);
  for (let i = 0; i < rules.length; i++) {
    const band = rules[i].band;
    if (!band) return all;
    for (const k of bandIndices(sys.frequencies, band, ruleName(rules[i], i))) keep[k] = 1;
  }
  return all.filter((k) => keep[k] === 1);
}

/**
 * Evaluates a range of combinations [first, last) against the rules; used by
 * the state sweep. `states` and `sys` must cover the same plan points (see ruleIndices and sliceSystem).
 * @returns one row per combination, in combination order
 * @example sweepRows(sys, rules, switchStates(sys), [4, 2], 0, 8).length // 8
 */
export function sweepRows(sys: PreparedSystem, rules: RuleSpec[], states: SData[][], throws: number[], first: number, last: number): SweepRow[] {
  const sws = sweepSwitches(sys);
  const waves = rules.some((r) => r.kind === "drive");
  const rows: SweepRow[] = [];
  for (let c = first; c < last; c++) {
    const st = combinationStates(c, throws);
    const replace: Record<string, SData> = {};
    sws.forEach((sw, i) => { replace[sw.block] = states[i][st[i] - 1]; });
    try {
      const sol = solveSystem(sys, { replace, waves });
      const res = evaluateRules(sol, rules, { replace });
      const cells = res.map((r) => ({ verdict: r.verdict, worst: r.worst, worstHz: r.worstHz, margin: r.margin }));
      let worstMargin: number | null = null;
      for (const cell of cells) if (Number.isFinite(cell.margin) && (worstMargin === null || cell.margin < worstMargin)) worstMargin = cell.margin;
      const verdict: Verdict = cells.some((x) => x.verdict === "fail") ? "fail" : cells.some((x) => x.verdict === "warn") ? "warn" : "pass";
      rows.push({ states: st, cells, worstMargin, verdict });
    } catch (err) {
      if (!(err instanceof SingularSystemError)) throw err;
      rows.push({ states: st, cells: [], worstMargin: null, verdict: "fail", error: err.message });
    }
  }
  return rows;
}

/**
 * Sweeps every combination of switch states, evaluating the rules (default: the scenario's) for each.
 * Only the switch blocks are re-evaluated (once per state); each combination is one solveSystem call with
 * those blocks replaced, at the plan points inside the rules' bands only (ruleIndices), without internal
 * waves unless a drive rule needs them. Runs in the calling thread: splitting the 256 combinations of the
 * reference front end over two worker threads (structured-cloned system, tsx loader in each worker) was
 * measured at 5.8–8.1 s against 0.77–1.09 s in one thread on the shared 2-core machine (worker start-up
 * and JIT warm-up dominate), so workers are not used.
 *
 * @param sys prepared system
 * @param rules rules to evaluate (default sys.scenario.rules)
 * @returns a combinations × rules table of worst values and margins, best and worst combinations
 * @throws EngineInputError above MAX_SWEEP_COMBINATIONS combinations (naming the count) or for bad rules
 * @example stateSweep(sys).worst?.states // e.g. [3, 1, 2]
 */
export function stateSweep(sys: PreparedSystem, rules: RuleSpec[] = sys.scenario.rules ?? []): StateSweepResult {
  const t0 = performance.now();
  const sws = sweepSwitches(sys);
  const throws = sws.map((s) => s.throws);
  const combinations = countCombinations(throws, sws.map((s) => s.block));
  const sub = sliceSystem(sys, ruleIndices(sys, rules));
  const states = switchStates(sub);
  const rows = sweepRows(sub, rules, states, throws, 0, combinations);
  return summarise(sys, rules, sws, combinations, rows, performance.now() - t0);
}

/**
 * Product of the throw counts, checked against MAX_SWEEP_COMBINATIONS.
 * @throws EngineInputError naming the count when above the limit
 * @example countCombinations([4, 4, 4, 2, 2], ["A", "B", "C", "D", "E"]) // 256
 */
export function countCombinations(throws: readonly number[], names: readonly string[]): number {
  let combinations = 1;
  for (const n of throws) combinations *= n;
  if (combinations > MAX_SWEEP_COMBINATIONS) {
    throw new EngineInputError("state sweep", `${combinations} combinations of switch states (${names.map((s, i) => `${s}: ${throws[i]}`).join(", ")}) exceed the limit of ${MAX_SWEEP_COMBINATIONS}; fix some switches by leaving them out of the sweep`);
  }
  return combinations;
}

/**
 * Assembles the sweep result from its rows: best and worst combinations, counts, messages.
 * @example summarise(sys, rules, sweepSwitches(sys), rows.length, rows, 12.5).worst?.states
 */
export function summarise(sys: PreparedSystem, rules: RuleSpec[], sws: { block: string; throws: number }[], combinations: number, rows: SweepRow[], ms: number): StateSweepResult {
  let best: StateSweepResult["best"] = null, worst: StateSweepResult["worst"] = null;
  rows.forEach((r, i) => {
    if (r.worstMargin === null) return;
    if (!best || r.worstMargin > best.worstMargin) best = { row: i, states: r.states, worstMargin: r.worstMargin };
    if (!worst || r.worstMargin < worst.worstMargin) worst = { row: i, states: r.states, worstMargin: r.worstMargin };
  });
  const passing = rows.filter((r) => r.verdict === "pass").length;
  const failing = rows.filter((r) => r.verdict === "fail").length;
  const messages: string[] = [];
  const fmt = (st: number[]) => st.map((s, i) => `${sws[i].block}=${s}`).join(" ");
  messages.push(`state sweep: ${combinations} combination${combinations === 1 ? "" : "s"} of ${sws.length} switch${sws.length === 1 ? "" : "es"} × ${rules.length} rule${rules.length === 1 ? "" : "s"}; ${passing} pass, ${failing} fail (${ms.toFixed(0)} ms)`);
  const b = best as StateSweepResult["best"], w = worst as StateSweepResult["worst"];
  if (b) messages.push(`best: ${fmt(b.states)} (worst margin ${b.worstMargin.toFixed(2)})`);
  if (w) messages.push(`worst: ${fmt(w.states)} (worst margin ${w.worstMargin.toFixed(2)})`);
  return {
    switches: sws.map((s) => ({ block: s.block, throws: s.throws })),
    combinations,
    rules: rules.map((r, i) => ({ id: r.id ?? `rules[${i}]`, kind: r.kind, name: ruleName(r, i) })),
    rows,
    best: b,
    worst: w,
    passing,
    failing,
    ms,
    messages,
  };
}
