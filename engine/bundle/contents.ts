/**
 * What a bundle holds besides its manifest and report: the scenario file, the parts it uses, the composite
 * Touchstone and the check results (JSON and CSV), all computed by the same engine functions as the app
 * and the CLI.
 */
import { effectiveRuleSet, judgingRules, leakTrace, runAllChecks, type AllChecksResult, type EffectiveRuleSet, type LeakTraceResult, type RuleSource } from "../checks";
import { lineup, type LineupResult } from "../lineup";
import type { SpreadResult } from "../spread";
import { parseScenario } from "../scenario";
import { pinnedPartPath, solveScenario } from "../system";
import { writeCompositeTouchstone } from "../touchstone";
import { EngineInputError, type Scenario, type Solution } from "../types";
import { ENGINE_VERSION } from "../version";
import { BUNDLE_PATHS, BundleError, checkEntryName, hashRuleSet } from "./format";
import { bundleSweep, driveTables, settingsCsvRows, shownSettingText, switchSettings, type DriveTable, type SweepSummary, type SwitchSetting } from "./settings";

/** Format name of results/checks.json. */
export const CHECKS_FORMAT = "portolan.checks/1";

/** One rule of the effective set with its verdict on the revision ("not run" when it names a missing port). */
export type RuleVerdict = {
  id: string;
  source: RuleSource;
  verdict: AllChecksResult["verdict"] | "not run";
  quantity?: string;
  unit?: string;
  worst?: number;
  worst_hz?: number;
  limit?: number;
  margin?: number;
  /** for an override: the project rule's limit beside the scenario's */
  project_limit?: number;
  message: string;
};

/** A reviewer's waiver of failing rules on this revision, carried from the sign-off. */
export type BundleWaiver = { reviewer: string; decided_at: string; comment: string; rules: { id: string; reason: string }[] };

/** The effective rule set a bundle was judged by, with its hash (docs/checks.md "Verdict identity"). */
export type BundleRuleSet = EffectiveRuleSet & { sha256: string };

/**
 * results/checks.json: the effective rule set (each rule with its source), every rule's verdict, the
 * built-in checks, the leak trace of every isolation rule, and any waiver given on sign-off.
 */
export type ChecksDocument = {
  format: typeof CHECKS_FORMAT;
  scenario: string;
  verdict: AllChecksResult["verdict"];
  engine_version: string;
  rule_set: BundleRuleSet;
  rules: RuleVerdict[];
  waivers: BundleWaiver[];
  results: AllChecksResult;
  /** leak trace of each isolation rule at the worst frequency of its band (null when it cannot be traced) */
  leaks: { rule: string; from: string; to: string; trace: LeakTraceResult | null; error?: string }[];
  /** line-up of each noise_figure, gain and headroom rule's path (headroom: at its input level); present when there are such rules */
  lineups?: { rule: string; from: string; to: string; lineup: LineupResult | null; error?: string }[];
  /** the revision's current stored spread analysis (same rule set and engine), when it has one */
  spread?: SpreadSummary;
  /** the switch setting every verdict above was judged in (absent in bundles written before it was recorded) */
  switch_states?: SwitchSetting[];
  /** the state sweep: the same rules judged in every switch setting the scenario allows (engine/bundle/settings.ts) */
  sweep?: SweepSummary;
  /** the drive check table of each drive rule, rows ordered by urgency */
  drive?: DriveTable[];
};

/** A spread analysis as a bundle carries it: its samples and seed (to repeat it) and each rule's yield. */
export type SpreadSummary = {
  samples: number;
  seed: number;
  rules: { id: string; passed: number; total: number; yield: number; low: number; high: number; nominal_margin: number | null }[];
};

/** The summary of a spread analysis's result for checks.json (envelopes and samples stay in the app). */
export function summariseSpread(result: Pick<SpreadResult, "samples" | "seed" | "rules">): SpreadSummary {
  return {
    samples: result.samples,
    seed: result.seed,
    rules: result.rules.map((r) => ({ id: r.id, passed: r.passed, total: r.total, yield: r.yield, low: r.low, high: r.high, nominal_margin: Number.isFinite(r.nominal_margin) ? r.nominal_margin : null })),
  };
}

/** Everything computed from a scenario for a bundle. */
export type BundleResults = {
  scenario: Scenario;
  solution: Solution;
  checks: ChecksDocument;
};

/**
 * The scenario as the engine reads it: workspace-only fields of blocks (`expr`, the expressions typed in
 * the inspector) removed; the engine ignores them anyway, this keeps its errors about real fields.
 *
 * @param content - a stored scenario (scenario file plus workspace fields)
 * @returns a copy without `expr` on blocks
 * @example engineScenario({ ...sc, blocks: [{ id: "A", kind: "attenuator", params: { loss_db: 3 }, expr: { loss_db: "3" } }] })
 */
export function engineScenario(content: unknown): unknown {
  if (content === null || typeof content !== "object" || Array.isArray(content)) return content;
  const c = content as Record<string, unknown>;
  if (!Array.isArray(c.blocks)) return content;
  return {
    ...c,
    blocks: c.blocks.map((b) => {
      if (b === null || typeof b !== "object") return b;
      const { expr: _expr, ...rest } = b as Record<string, unknown>;
      void _expr;
      return rest;
    }),
  };
}

/**
 * The part files a scenario uses (its touchstone blocks' `file` values without inline `data`), as the bundle
 * stores them: `parts/<name>` for version 1, `parts/v<N>/<name>` for a block pinning `part_version` N
 * (pinnedPartPath; scenario.json itself is stored unchanged, so its content hash stays the revision's).
 *
 * @param scenario - the scenario (stored or parsed)
 * @returns paths inside the bundle, e.g. ["parts/ant.s1p", "parts/v2/ant.s1p"], sorted, without duplicates
 * @throws BundleError when a block names a file outside `parts/` or with an unsafe path
 * @example usedPartFiles(sc) // ["parts/ant.s1p"]
 */
export function usedPartFiles(scenario: { blocks?: unknown }): string[] {
  const files = new Set<string>();
  for (const b of Array.isArray(scenario.blocks) ? scenario.blocks : []) {
    const block = b as { kind?: unknown; file?: unknown; data?: unknown; id?: unknown; part_version?: unknown };
    if (block.kind !== "touchstone" || block.data !== undefined || typeof block.file !== "string") continue;
    checkEntryName(block.file);
    if (!block.file.startsWith("parts/") || block.file.split("/").length !== 2) {
      throw new BundleError("invalid", `Block ${String(block.id)} names the file "${block.file}"; bundle parts live directly under parts/.`, block.file);
    }
    const version = typeof block.part_version === "number" && Number.isInteger(block.part_version) && block.part_version > 1 ? block.part_version : undefined;
    files.add(pinnedPartPath(block.file, version));
  }
  return [...files].sort();
}

function ruleVerdicts(ruleSet: EffectiveRuleSet, results: AllChecksResult): RuleVerdict[] {
  const byId = new Map(results.rules.map((r) => [r.id, r]));
  const limitOf = (rule: EffectiveRuleSet["rules"][number]["project_rule"]): number | undefined => {
    if (!rule) return undefined;
    if (rule.kind === "isolation") return rule.min_db;
    if (rule.kind === "insertion_loss") return rule.max_db;
    if (rule.kind === "match") return rule.min_return_loss_db;
    return undefined;
  };
  return ruleSet.rules.map((entry) => {
    const r = byId.get(entry.id);
    if (entry.not_run || !r) return { id: entry.id, source: entry.source, verdict: "not run", message: entry.not_run ?? "not evaluated" };
    return {
      id: entry.id,
      source: entry.source,
      verdict: r.verdict,
      quantity: r.quantity,
      unit: r.unit,
      worst: r.worst,
      worst_hz: r.worstHz,
      limit: r.limit,
      margin: r.margin,
      ...(entry.project_rule ? { project_limit: limitOf(entry.project_rule) } : {}),
      message: r.messages[0] ?? "",
    };
  });
}

/**
 * Solves a scenario from its file and parts and runs every check, as the bundle records them: the rules
 * judged are those of the effective rule set given (the app passes the revision's: project rules,
 * overrides, scenario-only rules); without one, the scenario file's own (a file read alone).
 *
 * @param content - the scenario file (JSON value; workspace fields allowed)
 * @param parts - Touchstone texts keyed as blocks name them ("parts/x.s2p")
 * @param ruleSet - the effective rule set to judge by (default: the file's own rules and overrides)
 * @param waivers - waivers given on sign-off of this revision, carried into checks.json
 * @param spread - summary of the revision's current stored spread analysis (summariseSpread), carried into checks.json
 * @returns parsed scenario, solution and the checks document
 * @throws EngineInputError / SingularSystemError when the scenario cannot be solved
 * @example computeBundleResults(JSON.parse(readFileSync("scenario.json", "utf8")), { "parts/ant.s1p": text }).checks.verdict
 */
export function computeBundleResults(content: unknown, parts: Record<string, string>, ruleSet?: EffectiveRuleSet, waivers: BundleWaiver[] = [], spread?: SpreadSummary): BundleResults {
  const scenario = parseScenario(engineScenario(content), { parts });
  const solution = solveScenario(scenario, { parts });
  const set = ruleSet ?? effectiveRuleSet([], scenario);
  const rules = judgingRules(set);
  const results = runAllChecks({ ...scenario, rules }, solution.system, solution);
  const leaks: ChecksDocument["leaks"] = [];
  for (const [i, rule] of rules.entries()) {
    if (rule.kind !== "isolation") continue;
    const name = rule.id ?? `rules[${i}]`;
    try {
      leaks.push({ rule: name, from: rule.from, to: rule.to, trace: leakTrace(solution, { from: rule.from, to: rule.to, band: rule.band, k: 5 }) });
    } catch (err) {
      if (!(err instanceof EngineInputError)) throw err;
      leaks.push({ rule: name, from: rule.from, to: rule.to, trace: null, error: err.message });
    }
  }
  const lineups: NonNullable<ChecksDocument["lineups"]> = [];
  for (const [i, rule] of rules.entries()) {
    if (rule.kind !== "noise_figure" && rule.kind !== "gain" && rule.kind !== "headroom") continue;
    const name = rule.id ?? `rules[${i}]`;
    try {
      const inputDbm = rule.kind === "headroom" ? rule.input_dbm : undefined;
      lineups.push({ rule: name, from: rule.from, to: rule.to, lineup: lineup(solution.system, { from: rule.from, to: rule.to, inputDbm }) });
    } catch (err) {
      if (!(err instanceof EngineInputError)) throw err;
      lineups.push({ rule: name, from: rule.from, to: rule.to, lineup: null, error: err.message });
    }
  }
  const rule_set: BundleRuleSet = { sha256: hashRuleSet(set), rules: set.rules, opted_out: set.opted_out };
  // the setting judged, every other setting the switches allow, and the drive tables (settings.ts)
  const settings = { switch_states: switchSettings(solution), sweep: bundleSweep(solution, rules, results.rules, set), drive: driveTables(results.rules) };
  return {
    scenario,
    solution,
    checks: { format: CHECKS_FORMAT, scenario: scenario.name, verdict: results.verdict, engine_version: ENGINE_VERSION, rule_set, rules: ruleVerdicts(set, results), waivers, results, leaks, ...(lineups.length > 0 ? { lineups } : {}), ...(spread ? { spread } : {}), ...settings },
  };
}

/**
 * The composite as Touchstone with 17 significant digits (so that reading it back gives the solved values
 * to rounding): 1.1 when every system port has the same Z0, else 2.0 with [Reference].
 *
 * @param solution - the solved scenario
 * @returns bundle path ("results/composite.sNp") and text
 * @example compositeFile(sol).path // "results/composite.s2p"
 */
export function compositeFile(solution: Solution): { path: string; text: string } {
  const text = writeCompositeTouchstone(solution, { scenarioName: solution.system.scenario.name, digits: 17 });
  return { path: `${BUNDLE_PATHS.composite}.s${solution.ports.length}p`, text };
}

function csvCell(value: unknown): string {
  const s = value === null || value === undefined ? "" : typeof value === "number" ? (Number.isFinite(value) ? String(value) : "") : String(value);
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/**
 * results/checks.csv: one row per check with its verdict, and for rules their source (project, scenario
 * override, scenario only), the worst value, where, the limit and the margin; rules that could not run
 * and opted-out project rules follow with their reason, then the state sweep's worst case per rule and the
 * drive tables (settingsCsvRows); the overall verdict is the last row (RFC 4180 quoting). The last column
 * names the switch setting each row was judged in.
 *
 * @param doc - the checks document
 * @returns CSV text with a header row
 * @example checksCsv(results.checks).split("\n")[0] // "check,source,title,verdict,quantity,unit,worst,worst_hz,limit,margin,message,switch_states"
 */
export function checksCsv(doc: ChecksDocument): string {
  const rows: unknown[][] = [["check", "source", "title", "verdict", "quantity", "unit", "worst", "worst_hz", "limit", "margin", "message", "switch_states"]];
  const shown = doc.switch_states ? shownSettingText(doc) : "";
  const rules = new Map(doc.results.rules.map((r) => [`rule:${r.id}`, r]));
  const sources = new Map((doc.rule_set?.rules ?? []).map((r) => [`rule:${r.id}`, r.source]));
  for (const c of doc.results.checks) {
    const r = rules.get(c.name);
    rows.push([c.name, sources.get(c.name) ?? (r ? "scenario" : "built-in"), c.title, c.verdict, r?.quantity ?? "", r?.unit ?? "", r?.worst, r?.worstHz, r?.limit, r?.margin, c.messages[0] ?? "", shown]);
  }
  for (const r of doc.rules ?? []) {
    if (r.verdict === "not run") rows.push([`rule:${r.id}`, r.source, "", "not run", "", "", "", "", "", "", r.message, ""]);
  }
  for (const o of doc.rule_set?.opted_out ?? []) rows.push([`rule:${o.id}`, "project", "", "opted out", "", "", "", "", "", "", o.reason, ""]);
  rows.push(...settingsCsvRows(doc));
  rows.push(["overall", "", "all rules and built-in checks", doc.verdict, "", "", "", "", "", "", "", shown]);
  return `${rows.map((row) => row.map(csvCell).join(",")).join("\r\n")}\r\n`;
}

/**
 * Every file of a bundle except the manifest and the report: scenario.json, the parts, the composite and
 * the check results.
 *
 * @param content - the stored scenario (written as is to scenario.json, so an import restores it exactly)
 * @param parts - Touchstone texts keyed as blocks name them
 * @param results - from computeBundleResults
 * @returns bundle path → text, in a stable order
 * @throws BundleError when a used part is missing from `parts`
 * @example bundleFiles(content, parts, computeBundleResults(content, parts)).get("scenario.json")
 */
export function bundleFiles(content: unknown, parts: Record<string, string>, results: BundleResults): Map<string, string> {
  const files = new Map<string, string>();
  files.set(BUNDLE_PATHS.scenario, `${JSON.stringify(content, null, 2)}\n`);
  for (const file of usedPartFiles(content as { blocks?: unknown })) {
    const text = parts[file];
    if (text === undefined) throw new BundleError("invalid", `The scenario uses ${file}, which is not among the parts.`, file);
    files.set(file, text);
  }
  const composite = compositeFile(results.solution);
  files.set(composite.path, composite.text);
  files.set(BUNDLE_PATHS.checksJson, `${JSON.stringify(results.checks, null, 1)}\n`);
  files.set(BUNDLE_PATHS.checksCsv, checksCsv(results.checks));
  return files;
}
