import { judgingRules, type EffectiveRuleSet, type Verdict } from "@/engine/checks";
import { runSpread, type SpreadResult } from "@/engine/spread";
import type { Scenario } from "@/engine/types";
import type { CheckRunRequest } from "./inputs";
import type { CheckOutcome } from "./types";

const percent = (x: number) => `${(100 * x).toFixed(1)}%`;

/**
 * The verdict of a spread analysis: "fail" when the nominal design already misses a rule, "warn" when it
 * meets every rule but some sample misses one (the yield is below 1), "pass" when every sample meets
 * every rule. The yields and intervals are the figures; the verdict only says which of the three it is.
 */
export function spreadVerdict(result: SpreadResult): Verdict {
  if (result.rules.some((r) => r.nominal_margin < 0)) return "fail";
  return result.rules.every((r) => r.passed === r.total) ? "pass" : "warn";
}

/**
 * Runs the spread analysis of a parsed scenario under the revision's effective rule set (the rules that
 * can run; the others are listed as skipped, as for "all rules"). The seed must already be fixed (the
 * server draws it before the job starts, so the stored inputs hold it).
 *
 * @param onProgress - the fraction of samples done (0…1), after each batch
 */
export async function executeSpread(
  request: Extract<CheckRunRequest, { check: "spread" }>,
  scenario: Scenario,
  parts: Record<string, string>,
  ruleSet: EffectiveRuleSet,
  opts: { maxBytes?: number; onProgress?: (fraction: number) => void } = {},
): Promise<Extract<CheckOutcome, { check: "spread" }>> {
  const { samples, seed } = request.inputs;
  if (seed === undefined) throw new Error("a spread run needs its seed fixed before it starts");
  const result = await runSpread(scenario, { samples, seed, parts, rules: judgingRules(ruleSet), maxBytes: opts.maxBytes, onProgress: opts.onProgress });
  const yields = result.rules.map((r) => `${r.id} ${percent(r.yield)} (${percent(r.low)}–${percent(r.high)})`).join("; ");
  const headline = `${result.samples} samples, seed ${result.seed}: yield ${yields}`;
  return {
    check: "spread",
    verdict: spreadVerdict(result),
    figures: {
      headline,
      result,
      ruleSources: ruleSet.rules.filter((r) => !r.not_run).map((r) => ({ id: r.id, source: r.source })),
      skipped: ruleSet.rules.filter((r) => r.not_run).map((r) => ({ id: r.id, source: r.source, reason: r.not_run! })),
    },
  };
}
