import type { RuleSpec } from "@/engine/types";

/** Where a rule in a merged list came from. */
export type RuleSource = "project" | "scenario" | "scenario-override";

export type MergedRule = { spec: RuleSpec; source: RuleSource };

function canonical(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonical).join(",")}]`;
  if (value && typeof value === "object") {
    return `{${Object.keys(value)
      .sort()
      .map((k) => `${JSON.stringify(k)}:${canonical((value as Record<string, unknown>)[k])}`)
      .join(",")}}`;
  }
  return JSON.stringify(value);
}

/**
 * The rules "Run all rules" evaluates: the project's rules merged with the scenario's own `rules`.
 * - project rules come first, in their order;
 * - a scenario rule whose `id` equals a project rule's replaces it in place (the scenario is more specific);
 * - a scenario rule identical to a project rule (same fields) is not repeated;
 * - every other scenario rule follows, in the scenario's order.
 */
export function mergeRules(projectRules: readonly RuleSpec[], scenarioRules: readonly RuleSpec[] = []): MergedRule[] {
  const merged: MergedRule[] = projectRules.map((spec) => ({ spec, source: "project" }));
  const seen = new Set(projectRules.map(canonical));
  for (const rule of scenarioRules) {
    const at = rule.id === undefined ? -1 : merged.findIndex((m) => m.source === "project" && m.spec.id === rule.id);
    if (at >= 0) {
      if (canonical(merged[at].spec) !== canonical(rule)) merged[at] = { spec: rule, source: "scenario-override" };
      continue;
    }
    if (seen.has(canonical(rule))) continue;
    seen.add(canonical(rule));
    merged.push({ spec: rule, source: "scenario" });
  }
  return merged;
}
