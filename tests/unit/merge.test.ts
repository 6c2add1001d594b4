// mergeScenarios: three-way merge of two people's edits by block id, link, system port, rule and plan field.
// The laws checked by property (merge with an unchanged side gives the other side; edits to disjoint
// units commute) are those of any three-way merge (common practice for version control merges, e.g.
// the diff3 rules: a unit changed on one side takes that side). Example cases are worked out by hand.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { mergeScenarios, type MergeResult } from "@/lib/domain/scenarios/merge";
import { canonicalJson } from "@/engine/canonical-json";
import type { BlockSpec, Scenario } from "@/engine/types";

const base: Scenario = {
  format: "portolan.scenario/1",
  name: "Front end",
  z0: 50,
  frequency: { start: 2.3e9, stop: 2.6e9, points: 301 },
  blocks: [
    { id: "PAD", kind: "attenuator", params: { loss_db: 3 }, position: { x: 0, y: 0 } },
    { id: "SW", kind: "switch", params: { throws: 2, insertion_loss_db: 0.5, isolation_db: 45 }, state: 1 },
    { id: "ANT", kind: "antenna", params: { return_loss_db: 15 } },
    { id: "LNA", kind: "amplifier", params: { gain_db: 12, nf_db: 1.2 } },
  ],
  links: [
    ["PAD:2", "SW:1"],
    ["SW:2", "ANT:1"],
    ["SW:3", "LNA:1"],
  ],
  ports: [
    { name: "TX", at: "PAD:1" },
    { name: "RX", at: "LNA:2" },
  ],
  rule_overrides: [{ id: "rx-gain", check: "gain", from: "TX", to: "RX", min_db: 10 } as never],
};

const withParam = (sc: Scenario, id: string, name: string, value: unknown): Scenario => ({
  ...sc,
  blocks: sc.blocks.map((b) => (b.id === id ? { ...b, params: { ...b.params, [name]: value } } : b)),
});

const scenarioOf = (r: MergeResult): Scenario => {
  if (!r.ok) throw new Error(`unexpected conflicts: ${r.conflicts.map((c) => c.key).join(", ")}`);
  return r.scenario;
};

const sortLinks = (links: Scenario["links"]) => links.map((l) => [...l].sort().join("~")).sort();

const eq = (a: Scenario, b: Scenario) => expect(canonicalJson(a)).toBe(canonicalJson(b));

describe("mergeScenarios, by hand", () => {
  it("merges edits to different blocks without asking", () => {
    const mine = withParam(base, "LNA", "gain_db", 15);
    const theirs = withParam(base, "PAD", "loss_db", 6);
    const merged = scenarioOf(mergeScenarios(base, mine, theirs));
    expect(merged.blocks.find((b) => b.id === "LNA")?.params).toEqual({ gain_db: 15, nf_db: 1.2 });
    expect(merged.blocks.find((b) => b.id === "PAD")?.params).toEqual({ loss_db: 6 });
  });

  it("merges different parameters of one block, and the same change made on both sides", () => {
    const mine = withParam(withParam(base, "SW", "isolation_db", 40), "ANT", "return_loss_db", 12);
    const theirs = withParam(withParam(base, "SW", "insertion_loss_db", 0.7), "ANT", "return_loss_db", 12);
    const merged = scenarioOf(mergeScenarios(base, mine, theirs));
    expect(merged.blocks.find((b) => b.id === "SW")?.params).toEqual({ throws: 2, insertion_loss_db: 0.7, isolation_db: 40 });
    expect(merged.blocks.find((b) => b.id === "ANT")?.params).toEqual({ return_loss_db: 12 });
  });

  it("asks about the same parameter changed to different values, naming both values with units", () => {
    const r = mergeScenarios(base, withParam(base, "LNA", "gain_db", 15), withParam(base, "LNA", "gain_db", 18));
    expect(r.ok).toBe(false);
    expect(r.conflicts).toEqual([{ key: "block:LNA:param:gain_db", area: "parameter", label: "LNA gain_db", mine: "15 dB", theirs: "18 dB" }]);
    const theirs = scenarioOf(mergeScenarios(base, withParam(base, "LNA", "gain_db", 15), withParam(base, "LNA", "gain_db", 18), { "block:LNA:param:gain_db": "theirs" }));
    expect(theirs.blocks.find((b) => b.id === "LNA")?.params?.gain_db).toBe(18);
  });

  it("asks when one side deleted a block the other edited; choosing the deletion drops its links", () => {
    const mine: Scenario = { ...base, blocks: base.blocks.filter((b) => b.id !== "ANT"), links: base.links.filter((l) => !l.join().includes("ANT")) };
    const theirs = withParam(base, "ANT", "return_loss_db", 20);
    const r = mergeScenarios(base, mine, theirs);
    expect(r.ok).toBe(false);
    expect(r.conflicts.map((c) => [c.key, c.mine, c.theirs])).toEqual([["block:ANT", "deleted", "kept and edited (antenna)"]]);
    const deleted = scenarioOf(mergeScenarios(base, mine, theirs, { "block:ANT": "mine" }));
    expect(deleted.blocks.map((b) => b.id)).toEqual(["PAD", "SW", "LNA"]);
    expect(deleted.links).toEqual([
      ["PAD:2", "SW:1"],
      ["SW:3", "LNA:1"],
    ]);
    const kept = scenarioOf(mergeScenarios(base, mine, theirs, { "block:ANT": "theirs" }));
    expect(kept.blocks.find((b) => b.id === "ANT")?.params).toEqual({ return_loss_db: 20 });
    // kept, it keeps the link the deletion had taken with it (the kept side's items come after the lead side's)
    expect(sortLinks(kept.links)).toEqual(sortLinks(base.links));
  });

  it("a kept block keeps its system port, which the deleting side had dropped with it", () => {
    const mine: Scenario = { ...base, blocks: base.blocks.filter((b) => b.id !== "PAD"), links: base.links.filter((l) => !l.join().includes("PAD")), ports: base.ports.filter((p) => p.name !== "TX") };
    const theirs = withParam(base, "PAD", "loss_db", 6);
    const kept = scenarioOf(mergeScenarios(base, mine, theirs, { "block:PAD": "theirs" }));
    expect(kept.ports.map((p) => p.name).sort()).toEqual(["RX", "TX"]);
    expect(sortLinks(kept.links)).toEqual(sortLinks(base.links));
    expect(kept.blocks.map((b) => b.id)).toEqual(["SW", "ANT", "LNA", "PAD"]);
  });

  it("deletes silently a block the other side did not touch", () => {
    const mine: Scenario = { ...base, blocks: base.blocks.filter((b) => b.id !== "ANT"), links: base.links.filter((l) => !l.join().includes("ANT")) };
    const theirs = withParam(base, "LNA", "nf_db", 1.5);
    const merged = scenarioOf(mergeScenarios(base, mine, theirs));
    expect(merged.blocks.map((b) => b.id)).toEqual(["PAD", "SW", "LNA"]);
    expect(merged.blocks.find((b) => b.id === "LNA")?.params?.nf_db).toBe(1.5);
  });

  it("unions links added on both sides and honours a removal on either side", () => {
    const added: BlockSpec = { id: "LOAD", kind: "load", params: { return_loss_db: 30 } };
    const mine: Scenario = { ...base, blocks: [...base.blocks, added], links: [...base.links.filter((l) => l[0] !== "PAD:2"), ["SW:1", "LOAD:1"]] };
    const theirs: Scenario = { ...base, ports: [...base.ports, { name: "ANT2", at: "ANT:2" }] };
    const merged = scenarioOf(mergeScenarios(base, mine, theirs));
    expect(merged.links).toEqual([
      ["SW:2", "ANT:1"],
      ["SW:3", "LNA:1"],
      ["SW:1", "LOAD:1"],
    ]);
    expect(merged.ports.map((p) => p.name)).toEqual(["TX", "RX", "ANT2"]);
  });

  it("asks when both sides linked one port to different places", () => {
    const withBlock = (sc: Scenario, id: string): Scenario => ({ ...sc, blocks: [...sc.blocks, { id, kind: "load", params: { return_loss_db: 30 } }] });
    const mine: Scenario = { ...withBlock(base, "L1"), links: [...base.links, ["LNA:2", "L1:1"]] };
    const theirs: Scenario = { ...withBlock(base, "L2"), links: [...base.links, ["LNA:2", "L2:1"]] };
    const r = mergeScenarios(base, mine, theirs);
    expect(r.conflicts.map((c) => c.key)).toEqual(["link:LNA:2"]);
    const chosen = scenarioOf(mergeScenarios(base, mine, theirs, { "link:LNA:2": "theirs" }));
    expect(chosen.links.filter((l) => l.includes("LNA:2"))).toEqual([["LNA:2", "L2:1"]]);
  });

  it("merges the frequency plan field by field and asks about the same rule changed on both sides", () => {
    const mine: Scenario = { ...base, frequency: { start: 2.4e9, stop: 2.6e9, points: 301 }, rule_overrides: [{ id: "rx-gain", check: "gain", from: "TX", to: "RX", min_db: 11 } as never] };
    const theirs: Scenario = { ...base, frequency: { start: 2.3e9, stop: 2.6e9, points: 601 }, rule_overrides: [{ id: "rx-gain", check: "gain", from: "TX", to: "RX", min_db: 9 } as never] };
    const r = mergeScenarios(base, mine, theirs);
    expect(r.conflicts.map((c) => c.key)).toEqual(["rule:rule_overrides:rx-gain"]);
    const merged = scenarioOf(mergeScenarios(base, mine, theirs, { "rule:rule_overrides:rx-gain": "mine" }));
    expect(merged.frequency).toEqual({ start: 2.4e9, stop: 2.6e9, points: 601 });
    expect((merged.rule_overrides?.[0] as { min_db: number }).min_db).toBe(11);
  });
});

// Random edits of the base: parameter values, a block removed (with its links), a block added, a link
// removed, plan points, a system port's z0, the override's bound. Each edit names the unit it touches.
type Edit = { unit: string; apply: (sc: Scenario) => Scenario };

const editArb: fc.Arbitrary<Edit> = fc.oneof(
  fc.record({ block: fc.constantFrom("PAD", "SW", "ANT", "LNA"), value: fc.integer({ min: 1, max: 60 }) }).map(({ block, value }) => ({
    unit: `block:${block}`,
    apply: (sc: Scenario) => {
      const b = sc.blocks.find((x) => x.id === block);
      if (!b) return sc;
      const name = Object.keys(b.params ?? {})[0] ?? "x_db";
      return withParam(sc, block, name, value);
    },
  })),
  fc.constantFrom("PAD", "ANT").map((block) => ({
    unit: `block:${block}`,
    apply: (sc: Scenario) => ({ ...sc, blocks: sc.blocks.filter((b) => b.id !== block), links: sc.links.filter((l) => !l.some((end) => end.startsWith(`${block}:`))), ports: sc.ports.filter((p) => !p.at.startsWith(`${block}:`)) }),
  })),
  fc.integer({ min: 1, max: 40 }).map((loss) => ({
    unit: "block:NEW",
    apply: (sc: Scenario) => ({ ...sc, blocks: [...sc.blocks.filter((b) => b.id !== "NEW"), { id: "NEW", kind: "attenuator" as const, params: { loss_db: loss } }] }),
  })),
  fc.integer({ min: 2, max: 2001 }).map((points) => ({ unit: "plan:points", apply: (sc: Scenario) => ({ ...sc, frequency: { ...sc.frequency, points } as Scenario["frequency"] }) })),
  fc.integer({ min: 10, max: 100 }).map((z0) => ({ unit: "port:RX", apply: (sc: Scenario) => ({ ...sc, ports: sc.ports.map((p) => (p.name === "RX" ? { ...p, z0 } : p)) }) })),
  fc.integer({ min: 0, max: 30 }).map((min) => ({ unit: "rule", apply: (sc: Scenario) => ({ ...sc, rule_overrides: (sc.rule_overrides ?? []).map((o) => ({ ...o, min_db: min }) as never) }) })),
);

const editsArb = fc.array(editArb, { minLength: 0, maxLength: 4 });
const applyAll = (edits: Edit[]) => edits.reduce((sc, e) => e.apply(sc), base);

// a removed block also takes the links and ports at it: those units count as touched too
const touched = (edits: Edit[]) => new Set(edits.flatMap((e) => (e.unit === "block:ANT" ? [e.unit] : e.unit === "block:PAD" ? [e.unit, "port:TX"] : e.unit === "block:LNA" ? [e.unit, "port:RX"] : [e.unit])));

describe("mergeScenarios, properties", () => {
  it("merge(base, a, base) = a and merge(base, base, b) = b", () => {
    fc.assert(
      fc.property(editsArb, (edits) => {
        const a = applyAll(edits);
        eq(scenarioOf(mergeScenarios(base, a, base)), a);
        eq(scenarioOf(mergeScenarios(base, base, a)), a);
      }),
    );
  });

  it("edits of different units merge without conflict, and the result does not depend on who saved first", () => {
    fc.assert(
      fc.property(editsArb, editsArb, (ea, eb) => {
        const ta = touched(ea);
        fc.pre(![...touched(eb)].some((u) => ta.has(u)));
        const a = applyAll(ea);
        const b = applyAll(eb);
        const ab = mergeScenarios(base, a, b);
        const ba = mergeScenarios(base, b, a);
        expect(ab.ok && ba.ok).toBe(true);
        const sa = scenarioOf(ab);
        const sb = scenarioOf(ba);
        // the same content, up to the order of blocks, links and ports (which side leads)
        const norm = (sc: Scenario) => ({ ...sc, blocks: [...sc.blocks].sort((x, y) => x.id.localeCompare(y.id)), links: sc.links.map((l) => [...l].sort().join("~")).sort(), ports: [...sc.ports].sort((x, y) => x.name.localeCompare(y.name)) });
        expect(canonicalJson(norm(sa))).toBe(canonicalJson(norm(sb)));
        // and it holds both sides' edits: re-applying either side's edits changes nothing
        expect(canonicalJson(norm(ea.reduce((sc, e) => e.apply(sc), sa)))).toBe(canonicalJson(norm(sa)));
        expect(canonicalJson(norm(eb.reduce((sc, e) => e.apply(sc), sa)))).toBe(canonicalJson(norm(sa)));
      }),
    );
  });
});
