import { describe, expect, it } from "vitest";
import type { Scenario } from "@/engine/types";
import { addBlock, addLink, setSystemPort, type PartSummary } from "@/lib/browser/scenario-model";
import { describeDropped, replaceBlock } from "@/lib/browser/replace-block";
import { NAME_SEPARATOR, rankBlockMatch } from "@/lib/browser/block-ranking";

// Port counts: docs/blocks.md (engine/blocks/catalogue.ts): a switch with 2 throws has 3 ports, a coupler 4,
// an attenuator 2.

function empty(): Scenario {
  return { format: "portolan.scenario/1", name: "t", z0: 50, frequency: { start: 2.3e9, stop: 2.6e9, points: 31 }, blocks: [], links: [], ports: [] };
}

function must<T extends { ok: boolean }>(r: T): Extract<T, { ok: true }> {
  if (!r.ok) throw new Error((r as unknown as { reason: string }).reason);
  return r as Extract<T, { ok: true }>;
}

const FILTER_PART: PartSummary = { id: "p1", name: "SAW 2442", fileName: "saw2442.s2p", ports: 2 };

function frontEnd(): Scenario {
  let s = empty();
  s = addBlock(s, "coupler", { x: 0, y: 0 }).scenario; // CPL1 (4 ports)
  s = addBlock(s, "antenna", { x: 300, y: 0 }).scenario; // ANT1
  s = addBlock(s, "load", { x: 300, y: 100 }).scenario; // LOAD1
  s = must(addLink(s, "CPL1:2", "ANT1:1")).scenario;
  s = must(addLink(s, "CPL1:4", "LOAD1:1")).scenario;
  s = must(setSystemPort(s, "CPL1:1", { name: "TX", z0: 75 })).scenario;
  s = must(setSystemPort(s, "CPL1:3", { name: "MON" })).scenario;
  return s;
}

describe("replaceBlock()", () => {
  it("keeps the id, place, links and system ports (name and Z0) on ports the new block has", () => {
    const before = frontEnd();
    const r = must(replaceBlock(before, "CPL1", { kind: "hybrid90" }));
    const block = r.scenario.blocks.find((b) => b.id === "CPL1")!;
    expect(block.kind).toBe("hybrid90");
    expect(block.position).toEqual(before.blocks.find((b) => b.id === "CPL1")!.position);
    expect(r.scenario.links).toEqual(before.links);
    expect(r.scenario.ports).toEqual(before.ports);
    expect(r.droppedLinks).toEqual([]);
    expect(describeDropped(r)).toBeNull();
  });

  it("drops and lists links and system ports past the new port count", () => {
    const r = must(replaceBlock(frontEnd(), "CPL1", { kind: "touchstone", part: FILTER_PART }, [FILTER_PART]));
    const block = r.scenario.blocks.find((b) => b.id === "CPL1")!;
    expect(block).toMatchObject({ kind: "touchstone", file: "parts/saw2442.s2p", ports: 2 });
    expect(r.scenario.links).toEqual([["CPL1:2", "ANT1:1"]]);
    expect(r.scenario.ports.map((p) => p.name)).toEqual(["TX"]);
    expect(r.scenario.ports[0].z0).toBe(75);
    expect(r.droppedLinks).toEqual([["CPL1:4", "LOAD1:1"]]);
    expect(r.droppedPorts.map((p) => p.name)).toEqual(["MON"]);
    expect(describeDropped(r)).toBe("Dropped (no such port on the new block): link CPL1:4–LOAD1:1; system port MON at CPL1:3.");
  });

  it("refuses an unknown block and a replacement by the same kind", () => {
    expect(replaceBlock(frontEnd(), "NOPE", { kind: "load" }).ok).toBe(false);
    expect(replaceBlock(frontEnd(), "CPL1", { kind: "coupler" }).ok).toBe(false);
  });
});

describe("rankBlockMatch()", () => {
  const v = (...names: string[]) => names.join(NAME_SEPARATOR);
  it("ranks an exact name above a prefix, a word, a substring and a keyword", () => {
    const exact = rankBlockMatch(v("SAW 2442", "saw2442.s2p"), "saw 2442");
    const prefix = rankBlockMatch(v("SAW 2442 wide", "x.s2p"), "saw 2442");
    const word = rankBlockMatch(v("Directional coupler", "dircoupler"), "coup");
    const sub = rankBlockMatch(v("Phase shifter", "phase_shifter"), "hift");
    const kw = rankBlockMatch(v("Attenuator", "attenuator"), "pad", ["pad"]);
    expect(exact).toBe(1);
    expect(prefix).toBeLessThan(exact);
    expect(word).toBeLessThan(prefix);
    expect(sub).toBeLessThan(word);
    expect(kw).toBeLessThan(sub);
    expect(kw).toBeGreaterThan(0);
    expect(rankBlockMatch(v("Load", "load"), "zzz")).toBe(0);
    // a part named exactly like a kind's title ties with it and beats every partial match
    expect(rankBlockMatch(v("Filter", "filter.s2p"), "filter")).toBe(rankBlockMatch(v("Filter", "filter"), "filter"));
  });
});
