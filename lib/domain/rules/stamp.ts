import type { RuleOptOut, RuleOverride, Scenario } from "@/engine/types";

const same = (a: unknown, b: unknown): boolean => JSON.stringify(sorted(a)) === JSON.stringify(sorted(b));
function sorted(v: unknown): unknown {
  if (Array.isArray(v)) return v.map(sorted);
  if (v && typeof v === "object") return Object.fromEntries(Object.keys(v).sort().map((k) => [k, sorted((v as Record<string, unknown>)[k])]));
  return v;
}
const bare = <T extends { by?: string; at?: string }>(x: T): Omit<T, "by" | "at"> => {
  const { by: _by, at: _at, ...rest } = x;
  void _by;
  void _at;
  return rest;
};

/**
 * Who changed a scenario's overrides and opt-outs, as the server records it on save: an entry that is
 * new or differs from the base revision's (rule or reason) gets `by` = the saving user and `at` = now;
 * an unchanged one keeps what the base revision says. So "who changed it", shown beside every override,
 * is never whatever a client wrote.
 *
 * @example stampRuleChanges(base, next, "emil@portolan.example", new Date()).rule_overrides?.[0].by // "emil@portolan.example"
 */
export function stampRuleChanges<T extends Pick<Scenario, "rule_overrides" | "rule_opt_outs">>(base: Pick<Scenario, "rule_overrides" | "rule_opt_outs"> | null, next: T, who: string, when: Date): T {
  const at = when.toISOString();
  const before = {
    overrides: new Map((base?.rule_overrides ?? []).map((o) => [o.id, o])),
    optOuts: new Map((base?.rule_opt_outs ?? []).map((o) => [o.id, o])),
  };
  const stamp = <E extends RuleOverride | RuleOptOut>(entry: E, old: E | undefined): E =>
    old && same(bare(old), bare(entry)) ? ({ ...entry, by: old.by, at: old.at } as E) : ({ ...entry, by: who, at } as E);
  const out = { ...next };
  if (next.rule_overrides) out.rule_overrides = next.rule_overrides.map((o) => stamp(o, before.overrides.get(o.id)));
  if (next.rule_opt_outs) out.rule_opt_outs = next.rule_opt_outs.map((o) => stamp(o, before.optOuts.get(o.id)));
  return out;
}
