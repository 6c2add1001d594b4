import {
  defaultDriveSources,
  driveCheck,
  evaluateRule,
  formatHz,
  leakTrace,
  powerLedger,
  runAllChecks,
  stabilityCheck,
  stateSweep,
  worstVerdict,
  judgingRules,
  type EffectiveRuleSet,
  type RuleSource,
  type RuleResult,
  type Verdict,
} from "@/engine/checks";
import { lineup } from "@/engine/lineup";
import type { RuleSpec, Solution } from "@/engine/types";
import { AppError } from "@/lib/base/errors";
import type { CheckRunRequest } from "./inputs";
import type { CheckOutcome, SkippedRule } from "./types";

const signed = (x: number) => `${x >= 0 ? "+" : "−"}${Math.abs(x).toFixed(2)}`;

function ruleHeadline(r: RuleResult): string {
  if (!Number.isFinite(r.worst)) return r.messages[0] ?? r.verdict;
  return `${r.id}: worst ${r.quantity} ${r.worst.toFixed(2)} ${r.unit}${r.direction ? ` (${r.direction})` : ""} at ${formatHz(r.worstHz)}, margin ${signed(r.margin)} ${r.unit === "dBm" ? "dB" : r.unit}`;
}

/** A one-rule check: the rule's verdict, with its worst point and margin as the headline. */
function ruleOutcome(solution: Solution, rule: RuleSpec): { verdict: Verdict; figures: { headline: string; result: RuleResult } } {
  const result = evaluateRule(solution, rule, 0);
  return { verdict: result.verdict, figures: { headline: ruleHeadline(result), result } };
}

/** The rules of the effective set that can run, where each came from, and those that cannot run. */
function applicableRules(ruleSet: EffectiveRuleSet): { rules: RuleSpec[]; sources: { id: string; source: RuleSource }[]; skipped: SkippedRule[] } {
  return {
    rules: judgingRules(ruleSet),
    sources: ruleSet.rules.filter((r) => !r.not_run).map((r) => ({ id: r.id, source: r.source })),
    skipped: ruleSet.rules.filter((r) => r.not_run).map((r) => ({ id: r.id, source: r.source, reason: r.not_run! })),
  };
}

/**
 * Runs one check on a solved scenario (docs/checks.md). Verdicts: rule checks as evaluateRule; leak
 * trace "fail" when `min_db` is given and the traced isolation is below it, "warn" when the listed
 * paths leave more than 1 dB unexplained, else "pass"; state sweep "pass" when every combination
 * passes, "fail" when none does, else "warn"; stability and all rules the worst of their verdicts. The
 * state sweep and "all rules" judge by the revision's effective rule set (engine/checks/rule-set.ts).
 */
export function executeCheck(request: CheckRunRequest, solution: Solution, ruleSet: EffectiveRuleSet): CheckOutcome {
  const scenario = solution.system.scenario;
  switch (request.check) {
    case "isolation":
      return { check: request.check, ...ruleOutcome(solution, { kind: "isolation", id: request.check, ...request.inputs }) };
    case "match":
      return { check: request.check, ...ruleOutcome(solution, { kind: "match", id: request.check, ...request.inputs }) };
    case "insertion_loss":
      return { check: request.check, ...ruleOutcome(solution, { kind: "insertion_loss", id: request.check, ...request.inputs }) };
    case "leak_trace": {
      const { min_db, ...opts } = request.inputs;
      const result = leakTrace(solution, opts);
      const isolation = -result.trueDb;
      let verdict: Verdict = Math.abs(result.accountedDb) > 1 ? "warn" : "pass";
      if (min_db !== undefined && isolation < min_db) verdict = "fail";
      const top = result.paths[0];
      const headline = `${result.from}→${result.to} at ${formatHz(result.frequencyHz)}: ${result.trueDb.toFixed(2)} dB, ${result.paths.length} path${result.paths.length === 1 ? "" : "s"}${top ? `; strongest ${top.db.toFixed(2)} dB` : ""}`;
      return { check: request.check, verdict, figures: { headline, result } };
    }
    case "power_ledger": {
      const result = powerLedger(solution, request.inputs.port, request.inputs.band);
      return { check: request.check, verdict: result.verdict, figures: { headline: `ledger from ${result.port}: closure ${result.worstClosure.toExponential(2)} at ${formatHz(result.worstClosureHz)}`, result } };
    }
    case "drive": {
      const sources = request.inputs.sources ?? defaultDriveSources(scenario);
      if (!sources) throw new AppError("unprocessable", 422, "Give the source powers: this scenario has no drive rule to take them from.", { sources: "Add at least one source." });
      const result = driveCheck(solution, { sources, band: request.inputs.band, coherent: request.inputs.coherent });
      const headline = result.worst
        ? `worst ${result.worst.block}:${result.worst.port} ${result.worst.dbm.toFixed(2)} dBm at ${formatHz(result.worst.hz)}, rating ${result.worst.ratingDbm.toFixed(1)} dBm, margin ${signed(result.worst.margin)} dB`
        : `highest incident power ${result.maxDbm.toFixed(2)} dBm at ${formatHz(result.maxHz)}; no block is rated`;
      return { check: request.check, verdict: result.verdict, figures: { headline, result } };
    }
    case "state_sweep": {
      const { rules, sources, skipped } = applicableRules(ruleSet);
      const result = stateSweep(solution.system, rules);
      const verdict: Verdict = result.rows.length === 0 || result.failing === 0 ? "pass" : result.passing === 0 ? "fail" : "warn";
      const headline = `${result.combinations} combination${result.combinations === 1 ? "" : "s"} × ${rules.length} rule${rules.length === 1 ? "" : "s"}: ${result.passing} pass, ${result.failing} fail`;
      return { check: request.check, verdict, figures: { headline, result, ruleSources: sources, skipped } };
    }
    case "stability": {
      const result = stabilityCheck(solution);
      const verdict = worstVerdict(result.map((r) => r.verdict));
      const headline = result.length === 0 ? "no amplifier and no two-port composite: nothing to check" : result.map((r) => `${r.subject}: min K ${r.minK === null ? "∞" : r.minK.toFixed(3)}`).join("; ");
      return { check: request.check, verdict, figures: { headline, result } };
    }
    case "lineup": {
      const { from, to, input_dbm, blocks } = request.inputs;
      const result = lineup(solution.system, { from, to, inputDbm: input_dbm, blocks });
      // a level past a P1dB is a warning: the linear figures no longer hold there
      const verdict: Verdict = result.stages.some((s) => s.headroomDb?.some((h) => h < 0)) ? "warn" : "pass";
      const range = (xs: number[]) => {
        const fin = xs.filter(Number.isFinite);
        return fin.length === 0 ? "—" : `${Math.min(...fin).toFixed(2)} to ${Math.max(...fin).toFixed(2)} dB`;
      };
      const headline = `${from}→${to} through ${result.stages.length} stage${result.stages.length === 1 ? "" : "s"}: gain ${range(result.gainDb)}, noise figure ${range(result.nfDb)}`;
      return { check: request.check, verdict, figures: { headline, result } };
    }
    case "spread":
      // sampled, not one solve: it runs as a job through executeSpread (execute-spread.ts)
      throw new Error("the spread analysis runs through executeSpread, not on one solution");
    case "all_rules": {
      const { rules, sources, skipped } = applicableRules(ruleSet);
      const result = runAllChecks({ ...scenario, rules }, solution.system, solution);
      const failing = result.rules.filter((r) => r.verdict === "fail").map((r) => r.id);
      const headline = `${result.rules.length} rule${result.rules.length === 1 ? "" : "s"}, ${result.checks.length} checks: ${failing.length === 0 ? "no rule fails" : `failing ${failing.join(", ")}`}`;
      return { check: request.check, verdict: result.verdict, figures: { headline, result, ruleSources: sources, skipped } };
    }
  }
}
