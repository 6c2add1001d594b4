// summarizeChanges: the stored words of what a revision changed. Expected lines are worked out by hand
// from the two inputs (units from the parameter name suffixes of docs/blocks.md: _db → dB, _hz → Hz).
import { describe, expect, it } from "vitest";
import { summarizeChanges, summaryText } from "@/lib/domain/scenarios/summary";
import type { Scenario } from "@/engine/types";

const before: Scenario = {
  format: "portolan.scenario/1",
  name: "A",
  z0: 50,
  frequency: { start: 2.3e9, stop: 2.6e9, points: 301 },
  blocks: [
    { id: "PAD", kind: "attenuator", params: { loss_db: 3 } },
    { id: "SW", kind: "switch", params: { throws: 2, insertion_loss_db: 0.5 }, state: 1 },
    { id: "DUT", kind: "touchstone", file: "parts/old.s2p" },
  ],
  links: [
    ["PAD:2", "SW:1"],
    ["SW:2", "DUT:1"],
  ],
  ports: [{ name: "TX", at: "PAD:1" }],
};

describe("summarizeChanges", () => {
  it("says which blocks were added, removed and replaced, parameters old → new with units, links, ports and plan", () => {
    const after: Scenario = {
      ...before,
      frequency: { start: 2.3e9, stop: 2.6e9, points: 601 },
      blocks: [
        { id: "PAD", kind: "attenuator", params: { loss_db: 6 }, position: { x: 10, y: 0 } },
        { id: "DUT", kind: "touchstone", file: "parts/new.s2p" },
        { id: "ANT", kind: "antenna", params: { return_loss_db: 15 } },
      ],
      links: [["PAD:2", "DUT:1"]],
      ports: [{ name: "TX", at: "PAD:1", z0: 75 }],
    };
    const s = summarizeChanges(before, after, 4);
    expect(s.against).toBe(4);
    expect(s.changes).toEqual([
      { area: "parameters", text: "PAD loss_db: 3 dB → 6 dB" },
      { area: "blocks", text: "removed SW (switch)" },
      { area: "blocks", text: "replaced DUT: parts/old.s2p → parts/new.s2p" },
      { area: "blocks", text: "added ANT (antenna)" },
      { area: "links", text: "unlinked PAD:2 — SW:1" },
      { area: "links", text: "unlinked SW:2 — DUT:1" },
      { area: "links", text: "linked PAD:2 — DUT:1" },
      { area: "ports", text: "system port TX z0: 50 Ω → 75 Ω" },
      { area: "plan", text: "frequency plan: 2.3 GHz to 2.6 GHz, 301 points → 2.3 GHz to 2.6 GHz, 601 points" },
    ]);
    expect(summaryText(s)).toContain("PAD loss_db: 3 dB → 6 dB; removed SW (switch); replaced DUT");
  });

  it("names a switch state and a rule override change; a moved block alone is no change", () => {
    const after: Scenario = { ...before, blocks: before.blocks.map((b) => (b.id === "SW" ? { ...b, state: 2 } : b)), rule_overrides: [{ id: "il", check: "insertion_loss", from: "TX", to: "TX", max_db: 3 } as never] };
    expect(summarizeChanges(before, after, 1).changes.map((c) => c.text)).toEqual(["SW switch state: 1 → 2", "added override of rule il"]);
    const moved: Scenario = { ...before, blocks: before.blocks.map((b) => ({ ...b, position: { x: 5, y: 5 } })) };
    expect(summaryText(summarizeChanges(before, moved, 1))).toBe("no change to what the engine reads");
    expect(summaryText(summarizeChanges(null, before, null))).toBe("first revision: 3 blocks, 2 links");
  });
});
