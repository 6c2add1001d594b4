/**
 * What a bundle holds besides its manifest and report: the scenario file, the parts it uses, the composite
 * Touchstone and the check results (JSON and CSV), all computed by the same engine functions as the app
 * and the CLI.
 */
import { leakTrace, runAllChecks, type AllChecksResult, type LeakTraceResult } from "../checks";
import { lineup, type LineupResult } from "../lineup";
import { parseScenario } from "../scenario";
import { solveScenario } from "../system";
import { writeCompositeTouchstone } from "../touchstone";
import { EngineInputError, type Scenario, type Solution } from "../types";
import { BUNDLE_PATHS, BundleError, checkEntryName } from "./format";

/** Format name of results/checks.json. */
export const CHECKS_FORMAT = "portolan.checks/1";

/** results/checks.json: every rule and built-in check, and the leak trace of every isolation rule. */
export type ChecksDocument = {
  format: typeof CHECKS_FORMAT;
  scenario: string;
  verdict: AllChecksResult["verdict"];
  results: AllChecksResult;
  /** leak trace of each isolation rule at the worst frequency of its band (null when it cannot be traced) */
  leaks: { rule: string; from: string; to: string; trace: LeakTraceResult | null; error?: string }[];
  /** line-up of each noise_figure, gain and headroom rule's path (headroom: at its input level); present when there are such rules */
  lineups?: { rule: string; from: string; to: string; lineup: LineupResult | null; error?: string }[];
};

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
 * The part files a scenario uses (its touchstone blocks' `file` values without inline `data`).
 *
 * @param scenario - the scenario (stored or parsed)
 * @returns file names as blocks name them, e.g. ["parts/ant.s1p"], sorted, without duplicates
 * @throws BundleError when a block names a file outside `parts/` or with an unsafe path
 * @example usedPartFiles(sc) // ["parts/ant.s1p"]
 */
export function usedPartFiles(scenario: { blocks?: unknown }): string[] {
  const files = new Set<string>();
  for (const b of Array.isArray(scenario.blocks) ? scenario.blocks : []) {
    const block = b as { kind?: unknown; file?: unknown; data?: unknown; id?: unknown };
    if (block.kind !== "touchstone" || block.data !== undefined || typeof block.file !== "string") continue;
    checkEntryName(block.file);
    if (!block.file.startsWith("parts/") || block.file.split("/").length !== 2) {
      throw new BundleError("invalid", `Block ${String(block.id)} names the file "${block.file}"; bundle parts live directly under parts/.`, block.file);
    }
    files.add(block.file);
  }
  return [...files].sort();
}

/**
 * Solves a scenario from its file and parts and runs every check, as the bundle records them.
 *
 * @param content - the scenario file (JSON value; workspace fields allowed)
 * @param parts - Touchstone texts keyed as blocks name them ("parts/x.s2p")
 * @returns parsed scenario, solution and the checks document
 * @throws EngineInputError / SingularSystemError when the scenario cannot be solved
 * @example computeBundleResults(JSON.parse(readFileSync("scenario.json", "utf8")), { "parts/ant.s1p": text }).checks.verdict
 */
export function computeBundleResults(content: unknown, parts: Record<string, string>): BundleResults {
  const scenario = parseScenario(engineScenario(content), { parts });
  const solution = solveScenario(scenario, { parts });
  const results = runAllChecks(scenario, solution.system, solution);
  const leaks: ChecksDocument["leaks"] = [];
  for (const [i, rule] of (scenario.rules ?? []).entries()) {
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
  for (const [i, rule] of (scenario.rules ?? []).entries()) {
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
  const checks: ChecksDocument = { format: CHECKS_FORMAT, scenario: scenario.name, verdict: results.verdict, results, leaks, ...(lineups.length > 0 ? { lineups } : {}) };
  return { scenario, solution, checks };
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
 * results/checks.csv: one row per check with its verdict, and for rules the worst value, where, the limit
 * and the margin (RFC 4180 quoting).
 *
 * @param doc - the checks document
 * @returns CSV text with a header row
 * @example checksCsv(results.checks).split("\n")[0] // "check,title,verdict,quantity,unit,worst,worst_hz,limit,margin,message"
 */
export function checksCsv(doc: ChecksDocument): string {
  const rows: unknown[][] = [["check", "title", "verdict", "quantity", "unit", "worst", "worst_hz", "limit", "margin", "message"]];
  const rules = new Map(doc.results.rules.map((r) => [`rule:${r.id}`, r]));
  for (const c of doc.results.checks) {
    const r = rules.get(c.name);
    rows.push([c.name, c.title, c.verdict, r?.quantity ?? "", r?.unit ?? "", r?.worst, r?.worstHz, r?.limit, r?.margin, c.messages[0] ?? ""]);
  }
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
