/**
 * What a bundle says about switch settings (issue 18 item 3): the setting its verdicts were judged in,
 * the state sweep summary (every combination of switch states the scenario allows, judged by the same
 * effective rules: worst case per rule and the setting that gives it) and the drive check table of each
 * drive rule, ordered as the workspace orders it. The question a reviewer asks is whether the verdict
 * holds in every switch setting, not only in the one the scenario was saved in.
 */
import { orderDriveRows, stateSweep, sweepSwitches, type DriveBlockResult, type DriveResult, type EffectiveRuleSet, type RuleResult, type RuleSource, type StateSweepResult, type Verdict } from "../checks";
import type { RuleSpec, Solution } from "../types";
import type { ChecksDocument } from "./contents";
import type { ReproducedItem } from "./reproduce";
import { EngineInputError } from "../types";

/** One switch block and the throw the bundle's verdicts were judged with (1 = common to port 2). */
export type SwitchSetting = { block: string; label?: string; throws: number; state: number };

/** Most failing settings listed by name in checks.json (the counts are always complete). */
export const SWEEP_LISTED_FAILURES = 64;

/** One rule over every switch setting: its worst case and the setting that gives it. */
export type SweepRuleSummary = {
  id: string;
  source: RuleSource | null;
  kind: RuleSpec["kind"];
  unit: "dB" | "dBm" | null;
  /** settings in which the rule passes, fails, or only warns */
  passing: number;
  failing: number;
  warning: number;
  /** the smallest margin over every setting (null when no setting could be judged) */
  worst_margin: number | null;
  worst: number | null;
  worst_hz: number | null;
  worst_verdict: Verdict | null;
  /** the setting of the smallest margin: one throw per swept switch, in the order of `switches` */
  worst_states: number[] | null;
  /** the margin in the setting the bundle's verdicts were judged in */
  shown_margin: number | null;
};

/** The state sweep as a bundle carries it (checks.json `sweep`). */
export type SweepSummary = {
  /** the swept switches, each with the throw the bundle's verdicts used */
  switches: SwitchSetting[];
  combinations: number;
  /** settings in which every rule passes / some rule fails / the worst is a warning / could not be solved */
  passing: number;
  failing: number;
  warning: number;
  unsolved: number;
  /** the rules pass in every setting the scenario allows */
  holds_in_every_setting: boolean;
  rules: SweepRuleSummary[];
  /** failing settings (at most SWEEP_LISTED_FAILURES of them) with the rules that fail there */
  failing_settings: { states: number[]; rules: string[] }[];
  /** why the sweep was not run (too many combinations), else absent */
  not_run?: string;
};

/** A drive rule's drive check table (checks.json `drive`): rows ordered by urgency (orderDriveRows). */
export type DriveTable = {
  rule: string;
  verdict: Verdict;
  basis: DriveResult["basis"];
  sources: DriveResult["sources"];
  band: [number, number] | null;
  rows: DriveBlockResult[];
};

/**
 * The switch blocks of a solved scenario and the throw each was judged with (`state`, default 1).
 *
 * @param solution - the solved scenario
 * @returns one entry per switch, in block order
 * @example switchSettings(sol) // [{ block: "TR", label: "T/R switch", throws: 2, state: 1 }]
 */
export function switchSettings(solution: Solution): SwitchSetting[] {
  const specs = new Map(solution.system.scenario.blocks.map((b) => [b.id, b]));
  return sweepSwitches(solution.system).map((sw) => {
    const spec = specs.get(sw.block);
    return { block: sw.block, ...(spec?.label ? { label: spec.label } : {}), throws: sw.throws, state: spec?.state ?? 1 };
  });
}

/**
 * A setting in words, the way the report and checks.csv print it.
 *
 * @example settingText(["TR", "ASW"], [2, 1]) // "TR=2 ASW=1"
 */
export function settingText(blocks: readonly string[], states: readonly number[]): string {
  return blocks.length === 0 ? "(no switches)" : blocks.map((b, i) => `${b}=${states[i]}`).join(" ");
}

/**
 * The combination number of a setting (mixed radix, first switch fastest): the inverse of combinationStates.
 *
 * @example combinationIndex([2, 3], [2, 4]) // 5
 */
export function combinationIndex(states: readonly number[], throws: readonly number[]): number {
  let c = 0;
  let radix = 1;
  states.forEach((s, i) => {
    c += (s - 1) * radix;
    radix *= throws[i];
  });
  return c;
}

/**
 * Summarises a state sweep for a bundle: per rule the worst case over every setting and the setting that
 * gives it, the margin in the setting shown, and the settings that fail.
 *
 * @param result - stateSweep over the rules the bundle judges by
 * @param switches - the switch settings the bundle's verdicts used (switchSettings)
 * @param units - unit of each rule id, from the verdicts of the setting shown
 * @param sources - source of each rule id in the effective rule set
 * @example summariseSweep(stateSweep(sol.system, rules), switchSettings(sol), units, sources).holds_in_every_setting
 */
export function summariseSweep(result: StateSweepResult, switches: SwitchSetting[], units: Map<string, "dB" | "dBm">, sources: Map<string, RuleSource>): SweepSummary {
  const throws = result.switches.map((s) => s.throws);
  const shownRow = result.rows[combinationIndex(switches.map((s) => s.state), throws)];
  const rules: SweepRuleSummary[] = result.rules.map((rule, j) => {
    let passing = 0, failing = 0, warning = 0;
    let worstRow: number | null = null;
    result.rows.forEach((row, i) => {
      const cell = row.cells[j];
      if (!cell) return;
      if (cell.verdict === "pass") passing++;
      else if (cell.verdict === "fail") failing++;
      else warning++;
      if (Number.isFinite(cell.margin) && (worstRow === null || cell.margin < result.rows[worstRow].cells[j].margin)) worstRow = i;
    });
    const worst = worstRow === null ? null : result.rows[worstRow];
    const shown = shownRow?.cells[j];
    return {
      id: rule.id,
      source: sources.get(rule.id) ?? null,
      kind: rule.kind,
      unit: units.get(rule.id) ?? null,
      passing,
      failing,
      warning,
      worst_margin: worst ? worst.cells[j].margin : null,
      worst: worst ? worst.cells[j].worst : null,
      worst_hz: worst ? worst.cells[j].worstHz : null,
      worst_verdict: worst ? worst.cells[j].verdict : null,
      worst_states: worst ? worst.states : null,
      shown_margin: shown && Number.isFinite(shown.margin) ? shown.margin : null,
    };
  });
  const failingRows = result.rows.filter((r) => r.verdict === "fail" && !r.error);
  const unsolved = result.rows.filter((r) => r.error).length;
  const warning = result.rows.filter((r) => r.verdict === "warn").length;
  return {
    switches,
    combinations: result.combinations,
    passing: result.passing,
    failing: failingRows.length,
    warning,
    unsolved,
    holds_in_every_setting: result.rows.length > 0 && result.passing === result.rows.length,
    rules,
    failing_settings: failingRows.slice(0, SWEEP_LISTED_FAILURES).map((r) => ({ states: r.states, rules: result.rules.filter((_, j) => r.cells[j]?.verdict === "fail").map((x) => x.id) })),
  };
}

/**
 * The state sweep of a bundle: stateSweep over the judging rules (the same call as the app's "state
 * sweep" check), summarised. Above MAX_SWEEP_COMBINATIONS it is not run, and says why.
 *
 * @param solution - the scenario solved in the setting it was saved with
 * @param rules - the rules the bundle judges by (judgingRules of the effective set)
 * @param verdicts - the rule verdicts of the setting shown (for units)
 * @param ruleSet - the effective rule set (for sources)
 * @example bundleSweep(sol, rules, results.rules, set).failing
 */
export function bundleSweep(solution: Solution, rules: RuleSpec[], verdicts: RuleResult[], ruleSet: EffectiveRuleSet): SweepSummary {
  const switches = switchSettings(solution);
  const units = new Map(verdicts.map((r) => [r.id, r.unit]));
  const sources = new Map(ruleSet.rules.map((r) => [r.id, r.source]));
  try {
    return summariseSweep(stateSweep(solution.system, rules), switches, units, sources);
  } catch (err) {
    if (!(err instanceof EngineInputError)) throw err;
    return { switches, combinations: 0, passing: 0, failing: 0, warning: 0, unsolved: 0, holds_in_every_setting: false, rules: [], failing_settings: [], not_run: err.message };
  }
}

/**
 * The drive check table of every drive rule judged (its full drive check rides on the rule's result).
 *
 * @param verdicts - rule results of the setting shown
 * @returns one table per drive rule, rows ordered by urgency
 * @example driveTables(results.rules)[0].rows[0].verdict // "fail" first when a part is over its rating
 */
export function driveTables(verdicts: RuleResult[]): DriveTable[] {
  const out: DriveTable[] = [];
  for (const r of verdicts) {
    const drive = r.kind === "drive" ? (r.extra?.drive as DriveResult | undefined) : undefined;
    if (!drive) continue;
    out.push({ rule: r.id, verdict: drive.verdict, basis: drive.basis, sources: drive.sources, band: drive.band, rows: orderDriveRows(drive.blocks) });
  }
  return out;
}

/** The setting the verdicts used, as checks.csv prints it beside every verdict. */
export function shownSettingText(doc: Pick<ChecksDocument, "switch_states">): string {
  const sws = doc.switch_states ?? [];
  return settingText(sws.map((s) => s.block), sws.map((s) => s.state));
}

/**
 * checks.csv rows of the state sweep (one per rule: its worst setting, worst value and margin, how many
 * settings pass) and of the drive tables (one per block, in the workspace's order), in the columns of
 * checksCsv: check, source, title, verdict, quantity, unit, worst, worst_hz, limit, margin, message, switch_states.
 *
 * @example settingsCsvRows(doc)[0][0] // "sweep:tx-rx-isolation"
 */
export function settingsCsvRows(doc: ChecksDocument): unknown[][] {
  const rows: unknown[][] = [];
  const sweep = doc.sweep;
  if (sweep) {
    const blocks = sweep.switches.map((s) => s.block);
    const judged = new Map(doc.results.rules.map((r) => [r.id, r]));
    if (sweep.not_run) rows.push(["sweep", "", "state sweep", "not run", "", "", "", "", "", "", sweep.not_run, ""]);
    for (const r of sweep.rules) {
      const message = `worst of ${sweep.combinations} switch setting${sweep.combinations === 1 ? "" : "s"}; passes in ${r.passing}, fails in ${r.failing}`;
      rows.push([`sweep:${r.id}`, r.source ?? "", `${r.kind} over every switch setting`, r.worst_verdict ?? "", judged.get(r.id)?.quantity ?? "", r.unit ?? "", r.worst, r.worst_hz, judged.get(r.id)?.limit, r.worst_margin, message, r.worst_states ? settingText(blocks, r.worst_states) : ""]);
    }
  }
  const shown = shownSettingText(doc);
  for (const table of doc.drive ?? []) {
    for (const b of table.rows) {
      rows.push([`drive:${table.rule}:${b.block}`, "", `drive level at ${b.block} (port ${b.worstPort}, ${table.basis} sum)`, b.verdict ?? "no rating", "incident power", "dBm", b.worstDbm, b.worstHz, b.ratingDbm, b.margin, b.ratingDbm === null ? "no rating_dbm on the block" : "", shown]);
    }
  }
  return rows;
}

function sameNumber(a: number | null | undefined, b: number | null | undefined, tol: number): boolean {
  if (a === null || a === undefined || b === null || b === undefined) return (a ?? null) === (b ?? null);
  return Math.abs(a - b) <= tol;
}

/**
 * Compares what a bundle says about switch settings with a re-run: the setting judged, the sweep (counts,
 * and per rule its worst margin and setting) and the drive tables (row order and margins). A bundle
 * written before it carried these has nothing to compare, and nothing is listed.
 *
 * @param stored - checks.json of the bundle
 * @param rerun - the re-run's checks document
 * @param tol - dB tolerance of margins (FIGURE_TOLERANCE_DB)
 * @example compareSettings(stored, rerun.checks, 1e-6).every((i) => i.same)
 */
export function compareSettings(stored: ChecksDocument, rerun: ChecksDocument, tol: number): ReproducedItem[] {
  const items: ReproducedItem[] = [];
  if (stored.switch_states !== undefined) {
    const a = shownSettingText(stored);
    const b = shownSettingText(rerun);
    items.push({ name: "switch settings", stored: a, rerun: b, same: a === b });
  }
  if (stored.sweep !== undefined && rerun.sweep !== undefined) {
    const s = stored.sweep;
    const r = rerun.sweep;
    const counts = (x: SweepSummary) => `${x.passing} pass, ${x.failing} fail of ${x.combinations}`;
    items.push({ name: "state sweep", stored: counts(s), rerun: counts(r), same: counts(s) === counts(r) && (s.not_run ?? "") === (r.not_run ?? "") });
    const byId = new Map(r.rules.map((x) => [x.id, x]));
    for (const before of s.rules) {
      const now = byId.get(before.id);
      const text = (x: SweepRuleSummary | undefined) => (x ? `worst margin ${x.worst_margin === null ? "—" : x.worst_margin.toFixed(6)} in ${x.worst_states?.join(",") ?? "—"}` : "(absent)");
      const same = !!now && sameNumber(before.worst_margin, now.worst_margin, tol) && (before.worst_states ?? []).join(",") === (now.worst_states ?? []).join(",") && before.passing === now.passing && before.failing === now.failing;
      items.push({ name: `sweep:${before.id}`, stored: text(before), rerun: text(now), same });
    }
  }
  if (stored.drive !== undefined) {
    const now = new Map((rerun.drive ?? []).map((t) => [t.rule, t]));
    for (const before of stored.drive) {
      const t = now.get(before.rule);
      const order = (x: DriveTable | undefined) => (x ? x.rows.map((row) => row.block).join(" > ") : "(absent)");
      const same = !!t && order(before) === order(t) && before.rows.every((row, i) => sameNumber(row.margin, t.rows[i].margin, tol) && sameNumber(row.worstDbm, t.rows[i].worstDbm, tol));
      items.push({ name: `drive:${before.rule}`, stored: order(before), rerun: order(t), same });
    }
  }
  return items;
}
