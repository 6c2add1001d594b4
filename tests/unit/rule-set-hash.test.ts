// The identity of an effective rule set (docs/checks.md "Verdict identity"): SHA-256 (FIPS 180-4) of its
// canonical JSON, object keys sorted as RFC 8785 §3.2.3 sorts them. Equal rules must hash equal whatever
// the order their keys were written or stored in; any change of a limit, band edge, port or source must
// change the hash. Properties with fast-check.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { createHash } from "node:crypto";
import { canonicalJson, hashRuleSet } from "@/engine/bundle";
import { effectiveRuleSet, ruleSetHashInput, type EffectiveRuleSet } from "@/engine/checks";
import type { RuleSpec } from "@/engine/types";

const PORTS = [{ name: "TX" }, { name: "RX" }, { name: "ANT" }];
const PROJECT: RuleSpec[] = [
  { kind: "isolation", id: "tx-rx", from: "TX", to: "RX", band: [2.4e9, 2.48e9], min_db: 30 },
  { kind: "match", id: "tx-match", port: "TX", band: [2.4e9, 2.48e9], min_return_loss_db: 12, max_vswr: 1.8 },
  { kind: "insertion_loss", id: "tx-ant", from: "TX", to: "ANT", band: [2.4e9, 2.48e9], max_db: 6 },
  { kind: "drive", id: "pa", sources: [{ port: "TX", dbm: 20 }], band: [2.4e9, 2.48e9] },
];

/** The same JSON value with every object's keys in a shuffled order (seeded). */
function shuffleKeys(value: unknown, seed: number): unknown {
  if (Array.isArray(value)) return value.map((v, i) => shuffleKeys(v, seed + i + 1));
  if (value === null || typeof value !== "object") return value;
  const keys = Object.keys(value);
  let s = seed;
  for (let i = keys.length - 1; i > 0; i--) {
    s = (s * 1103515245 + 12345) % 2147483648; // an LCG, only to pick an order
    const j = s % (i + 1);
    [keys[i], keys[j]] = [keys[j], keys[i]];
  }
  return Object.fromEntries(keys.map((k) => [k, shuffleKeys((value as Record<string, unknown>)[k], seed + 7)]));
}

/** Every numeric leaf of a rule's JSON, as a path. */
function numericPaths(value: unknown, at: (string | number)[] = []): (string | number)[][] {
  if (typeof value === "number") return [at];
  if (value === null || typeof value !== "object") return [];
  return Object.entries(value).flatMap(([k, v]) => numericPaths(v, [...at, Array.isArray(value) ? Number(k) : k]));
}

function withLeaf(value: unknown, at: (string | number)[], next: number): unknown {
  if (at.length === 0) return next;
  const copy = (Array.isArray(value) ? [...value] : { ...(value as object) }) as Record<string | number, unknown>;
  copy[at[0]] = withLeaf(copy[at[0]], at.slice(1), next);
  return copy;
}

const baseSet = () => effectiveRuleSet(PROJECT, { ports: PORTS, rule_overrides: [{ ...(PROJECT[0] as Extract<RuleSpec, { kind: "isolation" }>), id: "tx-rx", min_db: 35 }] });

describe("rule-set hashing", () => {
  it("is SHA-256 of the canonical JSON of what judges (FIPS 180-4 via node:crypto)", () => {
    const set = baseSet();
    expect(hashRuleSet(set)).toBe(createHash("sha256").update(canonicalJson(ruleSetHashInput(set)), "utf8").digest("hex"));
    // RFC 8785 §3.2.3: keys sorted by UTF-16 code units, no whitespace
    expect(canonicalJson({ b: 1, a: [2, { d: 3, c: 4 }] })).toBe('{"a":[2,{"c":4,"d":3}],"b":1}');
  });

  it("is stable under the key order of the rules, overrides and opt-outs", () => {
    const scenario = { ports: PORTS, rule_overrides: [{ ...PROJECT[0], id: "tx-rx", min_db: 35 }], rule_opt_outs: [{ id: "pa", reason: "no PA in this chain" }], rules: [{ kind: "match", id: "rx", port: "RX", band: [2.4e9, 2.5e9], max_vswr: 2 }] } as const;
    const reference = hashRuleSet(effectiveRuleSet(PROJECT, scenario as never));
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 2 ** 30 }), (seed) => {
        const project = shuffleKeys(PROJECT, seed) as RuleSpec[];
        const shuffled = shuffleKeys(scenario, seed + 3) as never;
        expect(hashRuleSet(effectiveRuleSet(project, shuffled))).toBe(reference);
      }),
      { numRuns: 100 },
    );
  });

  it("changes with any change of any limit, band edge or source power", () => {
    const reference = hashRuleSet(effectiveRuleSet(PROJECT, { ports: PORTS }));
    const leaves = PROJECT.flatMap((rule, r) => numericPaths(rule).map((at) => ({ r, at })));
    expect(leaves.length).toBe(13); // 3 isolation, 4 match, 3 insertion loss, 3 drive
    fc.assert(
      fc.property(fc.constantFrom(...leaves), fc.double({ min: -10, max: 10, noNaN: true }).filter((d) => Math.abs(d) > 1e-9), ({ r, at }, delta) => {
        const rules = PROJECT.map((rule, i) => {
          if (i !== r) return rule;
          const old = at.reduce<unknown>((v, k) => (v as Record<string | number, unknown>)[k], rule) as number;
          const next = old * (1 + delta * 1e-12) + delta; // also tiny relative changes of 2.4e9
          return withLeaf(rule, at, next === old ? old + 1 : next) as RuleSpec;
        });
        expect(hashRuleSet(effectiveRuleSet(rules, { ports: PORTS }))).not.toBe(reference);
      }),
      { numRuns: 200 },
    );
  });

  it("changes with the override's limit, a source change and an opt-out, not with who changed it", () => {
    const reference = hashRuleSet(baseSet());
    const over = (min_db: number, by?: string): EffectiveRuleSet =>
      effectiveRuleSet(PROJECT, { ports: PORTS, rule_overrides: [{ ...(PROJECT[0] as Extract<RuleSpec, { kind: "isolation" }>), id: "tx-rx", min_db, by, at: by ? "2026-12-04T00:00:00Z" : undefined }] });
    expect(hashRuleSet(over(35.000001))).not.toBe(reference);
    expect(hashRuleSet(over(35, "emil@portolan.example"))).toBe(reference);
    // the overridden project rule does not judge: tightening it leaves the scenario's verdict as it was
    const tighter = [{ ...PROJECT[0], min_db: 50 } as RuleSpec, ...PROJECT.slice(1)];
    expect(hashRuleSet(effectiveRuleSet(tighter, { ports: PORTS, rule_overrides: [{ ...(PROJECT[0] as Extract<RuleSpec, { kind: "isolation" }>), id: "tx-rx", min_db: 35 }] }))).toBe(reference);
    expect(hashRuleSet(effectiveRuleSet(PROJECT, { ports: PORTS }))).not.toBe(reference);
    expect(hashRuleSet(effectiveRuleSet(PROJECT, { ports: PORTS, rule_opt_outs: [{ id: "pa", reason: "a" }] }))).not.toBe(hashRuleSet(effectiveRuleSet(PROJECT, { ports: PORTS, rule_opt_outs: [{ id: "pa", reason: "b" }] })));
  });
});
