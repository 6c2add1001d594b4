// Every rule of a scenario and the built-in checks (ledger closure, passivity, reciprocity, stability of
// active blocks) in one call, with one overall verdict: the web app's "run all rules", the CLI and bundles.
import type { PreparedSystem, Scenario, Solution } from "../types";
import { dataQuality, type DataQualityResult } from "./data-quality";
import { powerLedgers, type LedgerResult } from "./power-ledger";
import { evaluateRules } from "./rules";
import { stabilityCheck, type StabilityResult } from "./stability";
import type { CheckSummary, RuleResult, Verdict } from "./types";

export type AllChecksResult = {
  verdict: Verdict;
  scenario: string;
  points: number;
  rules: RuleResult[];
  ledgers: LedgerResult[];
  dataQuality: DataQualityResult;
  stability: StabilityResult[];
  /** one line per check, rules first, in a stable order */
  checks: CheckSummary[];
  warnings: string[];
  /** information beside the results, such as how part data was interpolated onto the plan */
  notes: string[];
};

/**
 * Worst of verdicts: fail > warn > pass (pass for an empty list).
 * @example worstVerdict(["pass", "warn"]) // "warn"
 */
export function worstVerdict(verdicts: Verdict[]): Verdict {
  if (verdicts.includes("fail")) return "fail";
  if (verdicts.includes("warn")) return "warn";
  return "pass";
}

/**
 * Runs the scenario's rules and the built-in checks on a solved system:
 * - every rule (evaluateRule);
 * - the power ledger of every system port (closure within 1e-9);
 * - passivity and reciprocity of every block and of the composite where expected (dataQuality);
 * - stability of every active 2-port block (amplifiers, and measured parts marked active or whose data shows
 *   gain), and of the composite between every two system ports when it holds an active block (verdict "fail"
 *   when potentially unstable: K ≤ 1 or |Δ| ≥ 1 at some point).
 *
 * @param scenario the scenario (its rules are run)
 * @param prepared the prepared system (solution.system when solved from it)
 * @param solution the solved composite
 * @returns every result and a flat list of named verdicts; `verdict` is the worst of them
 * @throws EngineInputError naming a rule with bad ports or an empty band
 * @example runAllChecks(scenario, sys, solveSystem(sys)).verdict // "pass"
 */
export function runAllChecks(scenario: Scenario, prepared: PreparedSystem, solution: Solution): AllChecksResult {
  const rules = evaluateRules(solution, scenario.rules ?? []);
  const ledgers = powerLedgers(solution);
  const quality = dataQuality(solution);
  const stability = stabilityCheck(solution, { composite: "active" });
  const checks: CheckSummary[] = [];
  for (const r of rules) checks.push({ name: `rule:${r.id}`, title: `${r.kind} ${r.direction ?? ""}`.trim(), verdict: r.verdict, messages: r.messages });
  for (const l of ledgers) checks.push({ name: `ledger:${l.port}`, title: `power ledger closure from ${l.port}`, verdict: l.verdict, messages: l.messages });
  checks.push({ name: "passivity", title: "passivity of blocks and composite", verdict: quality.passivity, messages: quality.messages.filter((m) => !m.includes("reciprocal")) });
  checks.push({ name: "reciprocity", title: "reciprocity where expected", verdict: quality.reciprocity, messages: quality.messages.filter((m) => m.includes("reciprocal") || m.includes("reciprocity")) });
  for (const s of stability) checks.push({ name: `stability:${s.subject}`, title: `stability of ${s.subject}`, verdict: s.verdict, messages: s.messages });
  return {
    verdict: worstVerdict(checks.map((c) => c.verdict)),
    scenario: scenario.name,
    points: prepared.frequencies.length,
    rules,
    ledgers,
    dataQuality: quality,
    stability,
    checks,
    warnings: [...solution.warnings],
    notes: [...(prepared.notes ?? [])],
  };
}
