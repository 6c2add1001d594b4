// diffScenarios: what differs between two scenarios in what the engine reads. Expected values are worked
// out by hand from the two inputs of each case (the diff is set arithmetic on ids, link pairs and fields).
import { describe, expect, it } from "vitest";
import { changeText, diffScenarios } from "@/lib/domain/scenarios/diff";
import type { Scenario } from "@/engine/types";

const base: Scenario = {
  format: "portolan.scenario/1",
  name: "A",
  z0: 50,
  frequency: { start: 2.3e9, stop: 2.6e9, points: 301 },
  blocks: [
    { id: "PAD", kind: "attenuator", params: { loss_db: 3 }, position: { x: 0, y: 0 } },
    { id: "SW", kind: "switch", params: { throws: 2, insertion_loss_db: 0.5, isolation_db: 45 }, state: 1 },
    { id: "ANT", kind: "antenna", params: { return_loss_db: 15 } },
  ],
  links: [
    ["PAD:2", "SW:1"],
    ["SW:2", "ANT:1"],
  ],
  ports: [
    { name: "TX", at: "PAD:1" },
    { name: "RX", at: "SW:3" },
  ],
};

describe("diffScenarios", () => {
  it("finds nothing between a scenario and a copy that only moved blocks and relabelled them", () => {
    const moved: Scenario = { ...base, name: "B", blocks: base.blocks.map((b) => ({ ...b, position: { x: 99, y: 9 }, label: "moved" })) };
    const d = diffScenarios(base, moved);
    expect(d.same).toBe(true);
    expect(d.blocks).toEqual([]);
  });

  it("reports a changed parameter and a switch state with before and after", () => {
    const b: Scenario = {
      ...base,
      blocks: base.blocks.map((x) => (x.id === "SW" ? { ...x, params: { ...x.params, isolation_db: 25 }, state: 2 } : x)),
    };
    expect(diffScenarios(base, b).blocks).toEqual([
      { change: "changed", id: "SW", kind: "switch", params: [{ name: "isolation_db", before: 45, after: 25 }], fields: [], state: { before: 1, after: 2 } },
    ]);
  });

  it("reports a part block's active flag set, with before and after", () => {
    const part: Scenario = { ...base, blocks: [...base.blocks, { id: "LNA", kind: "touchstone", file: "parts/lna.s2p" }] };
    const marked: Scenario = { ...part, blocks: part.blocks.map((x) => (x.id === "LNA" ? { ...x, active: true } : x)) };
    expect(diffScenarios(part, marked).blocks).toEqual([
      { change: "changed", id: "LNA", kind: "touchstone", params: [], fields: [{ name: "active", before: undefined, after: true }], state: null },
    ]);
  });

  it("reports added and removed blocks, links (either order of ends) and system ports", () => {
    const b: Scenario = {
      ...base,
      blocks: [...base.blocks.filter((x) => x.id !== "ANT"), { id: "LOAD", kind: "load", params: { return_loss_db: 30 } }],
      // the first link written the other way round is the same link
      links: [
        ["SW:1", "PAD:2"],
        ["SW:2", "LOAD:1"],
      ],
      ports: [{ name: "TX", at: "PAD:1" }, { name: "RX", at: "SW:3", z0: 75 }, { name: "MON", at: "LOAD:2" }],
    };
    const d = diffScenarios(base, b);
    expect(d.blocks).toEqual([
      { change: "removed", id: "ANT", kind: "antenna" },
      { change: "added", id: "LOAD", kind: "load" },
    ]);
    expect(d.links).toEqual([
      { change: "removed", link: ["SW:2", "ANT:1"] },
      { change: "added", link: ["SW:2", "LOAD:1"] },
    ]);
    expect(d.ports).toEqual([
      { change: "z0", name: "RX", before: 50, after: 75 },
      { change: "added", name: "MON", at: "LOAD:2" },
    ]);
    expect(d.same).toBe(false);
  });

  it("reports a moved system port, another part file and the frequency plan", () => {
    const a: Scenario = { ...base, blocks: [...base.blocks, { id: "F", kind: "touchstone", file: "parts/a.s2p" }] };
    const b: Scenario = {
      ...a,
      frequency: { start: 2.3e9, stop: 2.6e9, points: 601 },
      blocks: a.blocks.map((x) => (x.id === "F" ? { ...x, file: "parts/b.s2p" } : x)),
      ports: [{ name: "TX", at: "PAD:1" }, { name: "RX", at: "SW:2" }],
    };
    const d = diffScenarios(a, b);
    expect(d.blocks).toEqual([{ change: "changed", id: "F", kind: "touchstone", params: [], fields: [{ name: "file", before: "parts/a.s2p", after: "parts/b.s2p" }], state: null }]);
    expect(d.ports).toEqual([{ change: "moved", name: "RX", before: "SW:3", after: "SW:2" }]);
    expect(d.settings.map((s) => s.name)).toEqual(["frequency"]);
  });
});

describe("differences in words and units", () => {
  it("writes values with the unit their parameter names carry, and 'not set' instead of undefined", () => {
    expect(changeText({ name: "isolation_db", before: 45, after: 25 })).toBe("isolation_db: 45 dB → 25 dB");
    expect(changeText({ name: "center_hz", before: undefined, after: 2.44e9 })).toBe("center_hz: not set → 2.44 GHz");
    expect(changeText({ name: "rating_dbm", before: 10, after: undefined })).toBe("rating_dbm: 10 dBm → not set");
  });

  it("writes a frequency plan as a range and point count, not as JSON", () => {
    const text = changeText({ name: "frequency", before: { start: 2.3e9, stop: 2.6e9, points: 301 }, after: { list: [1e9, 2e9, 3e9] } });
    expect(text).toBe("frequency: 2.3 GHz to 2.6 GHz, 301 points → 3 frequencies, 1 GHz to 3 GHz");
    expect(text).not.toMatch(/[{}"]|undefined/);
  });
});
