// The effective rule set of a scenario revision: the project's rules as the scenario inherits, overrides or
// opts out of them, plus the scenario's own rules (docs/checks.md "Effective rules"). Every verdict of
// "all rules", the state sweep, bundles and sign-offs is judged by this one set.
import { z } from "zod";
import { RuleSchema } from "../scenario/schema";
import type { RuleOptOut, RuleOverride, RuleSpec, Scenario } from "../types";

/** Where a rule of the effective set comes from. */
export const RULE_SOURCES = ["project", "scenario-override", "scenario"] as const;
export type RuleSource = (typeof RULE_SOURCES)[number];

/** The words people read for each source. */
export const RULE_SOURCE_LABELS: Record<RuleSource, string> = {
  project: "project",
  "scenario-override": "scenario override",
  scenario: "scenario only",
};

/** A rule with its name filled in (unnamed scenario rules are named by their place, `rules[i]`). */
export type NamedRule = RuleSpec & { id: string };

export type EffectiveRule = {
  id: string;
  source: RuleSource;
  /** the rule that judges the revision */
  rule: NamedRule;
  /** for an override: the project rule it replaces (both limits are shown) */
  project_rule?: NamedRule;
  /** who wrote the override and when (ISO 8601), when the scenario says so */
  by?: string;
  at?: string;
  /** why the rule cannot run on this revision (it names a system port the scenario lacks) */
  not_run?: string;
  /** a remark shown beside the rule, e.g. an override of a project rule that no longer exists */
  note?: string;
};

export type OptedOutRule = {
  id: string;
  reason: string;
  by?: string;
  at?: string;
  /** the project rule opted out of; null when the project no longer has it */
  project_rule: NamedRule | null;
};

export type EffectiveRuleSet = {
  /** project rules first, in the project's order, then the scenario's own rules in the file's order */
  rules: EffectiveRule[];
  opted_out: OptedOutRule[];
};

const namedRuleSchema = z.intersection(RuleSchema, z.object({ id: z.string().min(1) }));

/** The effective rule set as a bundle's `rules.json` holds it (read back by `portolan check bundle.zip`). */
export const EffectiveRuleSetSchema = z.object({
  rules: z.array(
    z.object({
      id: z.string().min(1),
      source: z.enum(RULE_SOURCES),
      rule: namedRuleSchema,
      project_rule: namedRuleSchema.optional(),
      by: z.string().optional(),
      at: z.string().optional(),
      not_run: z.string().optional(),
      note: z.string().optional(),
    }),
  ),
  opted_out: z.array(z.object({ id: z.string().min(1), reason: z.string(), by: z.string().optional(), at: z.string().optional(), project_rule: namedRuleSchema.nullable() })),
});

/** The system ports a rule names. */
export function rulePorts(rule: RuleSpec): string[] {
  switch (rule.kind) {
    case "match":
      return [rule.port];
    case "drive":
      return rule.sources.map((s) => s.port);
    default:
      return [rule.from, rule.to];
  }
}

/** Structural equality of two JSON values, key order ignored (a rule read back from storage may reorder keys). */
function sameJson(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (a === null || b === null || typeof a !== "object" || typeof b !== "object") return false;
  if (Array.isArray(a) !== Array.isArray(b)) return false;
  const ka = Object.keys(a).filter((k) => (a as Record<string, unknown>)[k] !== undefined);
  const kb = Object.keys(b).filter((k) => (b as Record<string, unknown>)[k] !== undefined);
  if (ka.length !== kb.length) return false;
  return ka.every((k) => sameJson((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k]));
}

/** The rule of an override without who wrote it. */
export function overrideRule(o: RuleOverride): NamedRule {
  const { by: _by, at: _at, ...rule } = o;
  void _by;
  void _at;
  return rule as NamedRule;
}

/**
 * A scenario's rule part after moving hidden copies of project rules into the open: a scenario rule
 * (in `rules`) whose id names a project rule is dropped when identical, and becomes an explicit override
 * when it differs (unless the scenario already overrides or opts out of that rule). What the stored-data
 * migration writes, and how `effectiveRuleSet` reads older revisions, so both give the same verdicts.
 *
 * @returns the new `rules` and `rule_overrides`, and whether anything moved
 * @example normaliseScenarioRules([{ kind: "isolation", id: "iso", … min_db: 30 }], { rules: [{ …, id: "iso", min_db: 35 }] }).rule_overrides // [{ …, min_db: 35 }]
 */
export function normaliseScenarioRules(
  projectRules: readonly RuleSpec[],
  scenario: Pick<Scenario, "rules" | "rule_overrides" | "rule_opt_outs">,
): { rules: RuleSpec[]; rule_overrides: RuleOverride[]; changed: boolean } {
  const byId = new Map(projectRules.filter((r) => r.id !== undefined).map((r) => [r.id!, r]));
  const overrides = [...(scenario.rule_overrides ?? [])];
  const taken = new Set([...overrides.map((o) => o.id), ...(scenario.rule_opt_outs ?? []).map((o) => o.id)]);
  const rules: RuleSpec[] = [];
  let changed = false;
  for (const rule of scenario.rules ?? []) {
    const project = rule.id === undefined ? undefined : byId.get(rule.id);
    if (!project) {
      rules.push(rule);
      continue;
    }
    changed = true;
    if (sameJson(project, rule) || taken.has(rule.id!)) continue;
    overrides.push({ ...rule, id: rule.id! } as RuleOverride);
    taken.add(rule.id!);
  }
  return { rules, rule_overrides: overrides, changed };
}

/**
 * The one function that says which rules judge a revision:
 * - every project rule, in the project's order, unless the scenario opts out of it (then it is listed in
 *   `opted_out` with the reason) or overrides it (then the override judges, with the project rule beside it);
 * - then the scenario's own rules, named `rules[i]` when unnamed;
 * - an override of a rule the project no longer has judges as a scenario rule, with a note;
 * - a rule naming a system port the scenario lacks is listed with `not_run` and judges nothing.
 * Hidden copies of project rules in `rules` (files written before overrides existed) are read as
 * `normaliseScenarioRules` moves them.
 *
 * @param projectRules - the project's rules, in their order (each named)
 * @param scenario - the revision's content (ports and rule fields are read)
 * @returns the rules with their sources, and the opt-outs
 * @example effectiveRuleSet(projectRules, scenario).rules.filter((r) => !r.not_run).map((r) => r.rule)
 */
export function effectiveRuleSet(
  projectRules: readonly RuleSpec[],
  scenario: Pick<Scenario, "rules" | "rule_overrides" | "rule_opt_outs"> & { ports?: readonly { name: string }[] },
): EffectiveRuleSet {
  const { rules: own, rule_overrides } = normaliseScenarioRules(projectRules, scenario);
  const overrides = new Map(rule_overrides.map((o) => [o.id, o]));
  const optOuts = new Map((scenario.rule_opt_outs ?? []).map((o) => [o.id, o]));
  const ports = scenario.ports ? new Set(scenario.ports.map((p) => p.name)) : null;
  const rules: EffectiveRule[] = [];
  const opted_out: OptedOutRule[] = [];
  const used = new Set<string>();
  const push = (entry: EffectiveRule) => {
    const missing = ports ? rulePorts(entry.rule).filter((p) => !ports.has(p)) : [];
    if (missing.length > 0) entry.not_run = `the scenario has no system port ${missing.map((p) => `"${p}"`).join(", ")}`;
    rules.push(entry);
  };
  projectRules.forEach((spec, i) => {
    const project = { ...spec, id: spec.id ?? `project[${i}]` } as NamedRule;
    used.add(project.id);
    const out: RuleOptOut | undefined = optOuts.get(project.id);
    if (out) {
      opted_out.push({ id: project.id, reason: out.reason, by: out.by, at: out.at, project_rule: project });
      return;
    }
    const over = overrides.get(project.id);
    if (over) {
      push({ id: project.id, source: "scenario-override", rule: overrideRule(over), project_rule: project, by: over.by, at: over.at });
      return;
    }
    push({ id: project.id, source: "project", rule: project });
  });
  for (const o of optOuts.values()) {
    if (!used.has(o.id)) opted_out.push({ id: o.id, reason: o.reason, by: o.by, at: o.at, project_rule: null });
  }
  for (const o of overrides.values()) {
    if (used.has(o.id)) continue;
    used.add(o.id);
    push({ id: o.id, source: "scenario", rule: overrideRule(o), by: o.by, at: o.at, note: `overrides project rule "${o.id}", which the project no longer has; judged as a scenario rule` });
  }
  own.forEach((spec, i) => {
    const id = spec.id ?? `rules[${i}]`;
    push({ id, source: "scenario", rule: { ...spec, id } as NamedRule });
  });
  return { rules, opted_out };
}

/** The rules of a set that judge (those that can run on the revision). */
export function judgingRules(set: EffectiveRuleSet): NamedRule[] {
  return set.rules.filter((r) => !r.not_run).map((r) => r.rule);
}

/**
 * What the rule-set hash covers: each rule's id, source and the rule itself, and each opt-out's id and
 * reason. Who changed a rule and when are left out (re-entering the same limits changes no verdict);
 * which rules cannot run follows from the revision, whose own hash is stored beside this one.
 */
export function ruleSetHashInput(set: EffectiveRuleSet): unknown {
  return {
    rules: set.rules.map((r) => ({ id: r.id, source: r.source, rule: r.rule })),
    opted_out: set.opted_out.map((o) => ({ id: o.id, reason: o.reason })),
  };
}
