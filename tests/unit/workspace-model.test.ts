import { describe, expect, it } from "vitest";
import type { Scenario } from "@/engine/types";
import {
  addBlock,
  addLink,
  checkLink,
  copyBlocks,
  cycleSwitchState,
  pasteBlocks,
  portCountOf,
  removeBlocks,
  renameBlock,
  setSwitchState,
  setSystemPort,
  updateBlock,
  type PartSummary,
} from "@/lib/browser/scenario-model";
import { scenarioForEngine } from "@/lib/domain/scenarios/for-engine";
import { createHistory, recordEdit, redo, undo, HISTORY_LIMIT } from "@/lib/browser/history";
import { placePorts } from "@/components/chart/port-layout";

// Port counts and numbering: docs/blocks.md (the engine catalogue, engine/blocks/catalogue.ts).

function empty(): Scenario {
  return { format: "portolan.scenario/1", name: "t", z0: 50, frequency: { start: 2.3e9, stop: 2.6e9, points: 31 }, blocks: [], links: [], ports: [] };
}

function must<T extends { ok: boolean }>(r: T): Extract<T, { ok: true }> {
  if (!r.ok) throw new Error((r as unknown as { reason: string }).reason);
  return r as Extract<T, { ok: true }>;
}

function chain(): Scenario {
  let s = empty();
  s = addBlock(s, "attenuator", { x: 0, y: 0 }).scenario; // PAD1
  s = addBlock(s, "switch", { x: 200, y: 0 }).scenario; // SW1
  s = addBlock(s, "antenna", { x: 400, y: 0 }).scenario; // ANT1
  s = must(addLink(s, "PAD1:2", "SW1:1")).scenario;
  s = must(addLink(s, "SW1:2", "ANT1:1")).scenario;
  s = must(setSystemPort(s, "PAD1:1", { name: "TX" })).scenario;
  s = must(setSystemPort(s, "SW1:3", { name: "RX", z0: 75 })).scenario;
  return s;
}

describe("adding and removing blocks", () => {
  it("gives new blocks unique ids and port counts from their kind", () => {
    let s = empty();
    const a = addBlock(s, "attenuator", { x: 10.4, y: 20.6 });
    s = a.scenario;
    const b = addBlock(s, "attenuator", { x: 0, y: 0 });
    expect([a.id, b.id]).toEqual(["PAD1", "PAD2"]);
    expect(a.scenario.blocks[0].position).toEqual({ x: 10, y: 21 });
    const sw = addBlock(s, "switch", { x: 0, y: 0 }).scenario.blocks[1];
    expect(portCountOf(sw)).toBe(3); // 1 common + 2 throws
    expect(sw.state).toBe(1);
    expect(portCountOf({ id: "C", kind: "coupler" })).toBe(4);
    expect(portCountOf({ id: "A", kind: "array", params: { elements: 5 } })).toBe(5);
  });

  it("places a part as a touchstone block naming its file", () => {
    const part: PartSummary = { id: "p1", name: "Diplexer rev B", fileName: "diplexer.s3p", ports: 3 };
    const { scenario, id } = addBlock(empty(), "touchstone", { x: 0, y: 0 }, part);
    expect(id).toBe("DIPLEXER_REV_B1");
    expect(scenario.blocks[0]).toMatchObject({ kind: "touchstone", file: "parts/diplexer.s3p", ports: 3 });
    expect(portCountOf({ id: "X", kind: "touchstone", file: "parts/x.s4p" })).toBe(4);
  });

  it("removes a block with its links and system ports", () => {
    const s = removeBlocks(chain(), ["SW1"]);
    expect(s.blocks.map((b) => b.id)).toEqual(["PAD1", "ANT1"]);
    expect(s.links).toEqual([]);
    expect(s.ports.map((p) => p.name)).toEqual(["TX"]);
  });

  it("drops links past a switch's port count when its throws shrink", () => {
    let s = chain();
    s = updateBlock(s, "SW1", { params: { throws: 1 } });
    expect(s.ports.map((p) => p.at)).toEqual(["PAD1:1"]); // RX was at SW1:3
    expect(s.links).toEqual([["PAD1:2", "SW1:1"], ["SW1:2", "ANT1:1"]]);
  });
});

describe("link legality", () => {
  it("refuses a link from a port to itself", () => {
    const r = checkLink(chain(), "ANT1:1", "ANT1:1");
    expect(r.ok).toBe(false);
  });

  it("refuses a second link on a port, naming the existing one", () => {
    const r = addLink(chain(), "SW1:1", "ANT1:1");
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toContain("PAD1:2");
  });

  it("refuses to link a system port, and to mark a linked port", () => {
    let s = chain();
    s = addBlock(s, "load", { x: 0, y: 0 }).scenario; // LOAD1
    const r = addLink(s, "LOAD1:1", "PAD1:1");
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toContain("TX");
    expect(setSystemPort(s, "PAD1:2", { name: "X" }).ok).toBe(false);
  });

  it("refuses ports that do not exist and duplicate system port names", () => {
    const s = chain();
    expect(checkLink(s, "PAD1:3", "ANT1:1").ok).toBe(false);
    expect(checkLink(s, "NOPE:1", "ANT1:1").ok).toBe(false);
    const withLoad = addBlock(s, "load", { x: 0, y: 0 }).scenario;
    expect(setSystemPort(withLoad, "LOAD1:1", { name: "TX" }).ok).toBe(false);
    expect(setSystemPort(withLoad, "LOAD1:1", { name: "L", z0: -5 }).ok).toBe(false);
    expect(must(setSystemPort(withLoad, "LOAD1:1", { name: "L", z0: 100 })).scenario.ports[2]).toEqual({ name: "L", at: "LOAD1:1", z0: 100 });
  });

  it("allows a link between two free ports", () => {
    let s = chain();
    s = addBlock(s, "load", { x: 0, y: 0 }).scenario;
    expect(checkLink(s, "LOAD1:1", "ANT1:1").ok).toBe(false); // ANT1:1 is taken
    s = removeBlocks(s, ["ANT1"]);
    const r = must(addLink(s, "LOAD1:1", "SW1:2"));
    expect(r.scenario.links).toContainEqual(["LOAD1:1", "SW1:2"]);
  });
});

describe("renaming and switches", () => {
  it("renames a block in its links and system ports", () => {
    const s = must(renameBlock(chain(), "SW1", "TR_SWITCH")).scenario;
    expect(s.links).toEqual([["PAD1:2", "TR_SWITCH:1"], ["TR_SWITCH:2", "ANT1:1"]]);
    expect(s.ports[1].at).toBe("TR_SWITCH:3");
  });

  it("refuses a rename to a used, empty or ':' id", () => {
    expect(renameBlock(chain(), "SW1", "PAD1").ok).toBe(false);
    expect(renameBlock(chain(), "SW1", "").ok).toBe(false);
    expect(renameBlock(chain(), "SW1", "A:B").ok).toBe(false);
  });

  it("toggles the switch throw in place and wraps", () => {
    let s = chain();
    s = cycleSwitchState(s, "SW1");
    expect(s.blocks[1].state).toBe(2);
    s = cycleSwitchState(s, "SW1");
    expect(s.blocks[1].state).toBe(1);
    expect(setSwitchState(s, "SW1", 3).ok).toBe(false);
  });
});

describe("copy and paste", () => {
  it("pastes copies with new ids and the links among them, without system ports", () => {
    const s = chain();
    const clip = copyBlocks(s, ["PAD1", "SW1"]);
    expect(clip.links).toEqual([["PAD1:2", "SW1:1"]]);
    const { scenario, ids } = pasteBlocks(s, clip, { x: 40, y: 40 });
    expect(ids).toEqual(["PAD2", "SW2"]);
    expect(scenario.links).toContainEqual(["PAD2:2", "SW2:1"]);
    expect(scenario.ports).toHaveLength(2);
    expect(scenario.blocks.find((b) => b.id === "SW2")?.position).toEqual({ x: 240, y: 40 });
    // pasting twice keeps ids unique
    const again = pasteBlocks(scenario, clip);
    expect(again.ids).toEqual(["PAD3", "SW3"]);
    // the copy is independent of the original
    clip.blocks[0].params = { loss_db: 99 };
    expect(scenario.blocks.find((b) => b.id === "PAD2")?.params).toEqual({ loss_db: 3 });
  });
});

describe("undo and redo", () => {
  it("steps back and forward through scenario snapshots", () => {
    const s0 = empty();
    let h = createHistory();
    const s1 = addBlock(s0, "attenuator", { x: 0, y: 0 }).scenario;
    h = recordEdit(h, s0, { at: 0 });
    const s2 = addBlock(s1, "load", { x: 0, y: 0 }).scenario;
    h = recordEdit(h, s1, { at: 10 });
    const u1 = undo(h, s2);
    expect(u1?.scenario).toBe(s1);
    const u2 = undo(u1!.history, s1);
    expect(u2?.scenario).toBe(s0);
    expect(undo(u2!.history, s0)).toBeNull();
    const r1 = redo(u2!.history, s0);
    expect(r1?.scenario).toBe(s1);
    // a new edit after undo clears the redo list
    const h2 = recordEdit(r1!.history, s1, { at: 20 });
    expect(redo(h2, s1)).toBeNull();
  });

  it("folds a burst of edits to one field into one step and caps the history", () => {
    const s0 = empty();
    let h = createHistory();
    h = recordEdit(h, s0, { key: "PAD1.loss_db", at: 0 });
    h = recordEdit(h, { ...s0, name: "x" }, { key: "PAD1.loss_db", at: 500 });
    expect(h.past).toHaveLength(1);
    h = recordEdit(h, { ...s0, name: "y" }, { key: "PAD1.loss_db", at: 5000 });
    expect(h.past).toHaveLength(2);
    for (let i = 0; i < HISTORY_LIMIT + 10; i++) h = recordEdit(h, s0, { at: i });
    expect(h.past).toHaveLength(HISTORY_LIMIT);
  });
});

describe("scenarioForEngine", () => {
  it("removes expression text and positions but keeps the parameters", () => {
    const s = chain();
    s.blocks[0] = { ...s.blocks[0], expr: { loss_db: "1.5 * 2" } } as Scenario["blocks"][number];
    const out = scenarioForEngine(s);
    expect("expr" in out.blocks[0]).toBe(false);
    expect("position" in out.blocks[0]).toBe(false);
    expect(out.blocks[0].params).toEqual({ loss_db: 3 });
  });
});

describe("port placement on the block cards", () => {
  it("places every port of every kind exactly once, inside its side", () => {
    // port counts of docs/blocks.md; switch and array over a range of sizes
    const cases: [Parameters<typeof placePorts>[0], number][] = [
      ["load", 1], ["antenna", 1], ["attenuator", 2], ["line", 2], ["filter", 2], ["amplifier", 2],
      ["splitter", 3], ["tee", 3], ["circulator", 3], ["coupler", 4], ["hybrid90", 4], ["hybrid180", 4],
      ["switch", 2], ["switch", 5], ["switch", 17], ["array", 1], ["array", 8], ["touchstone", 1], ["touchstone", 2], ["touchstone", 7],
    ];
    for (const [kind, n] of cases) {
      const placed = placePorts(kind, n);
      expect(placed.map((p) => p.port).sort((a, b) => a - b)).toEqual(Array.from({ length: n }, (_, k) => k + 1));
      for (const p of placed) expect(p.at > 0 && p.at < 1).toBe(true);
    }
  });

  it("puts inputs on the left and outputs on the right", () => {
    // amplifier 1 in, 2 out; splitter 1 common; switch 1 common (docs/blocks.md)
    expect(placePorts("amplifier", 2).find((p) => p.port === 1)?.side).toBe("left");
    expect(placePorts("amplifier", 2).find((p) => p.port === 2)?.side).toBe("right");
    expect(placePorts("splitter", 3).filter((p) => p.side === "right").map((p) => p.port)).toEqual([2, 3]);
    expect(placePorts("switch", 4).filter((p) => p.side === "left").map((p) => p.port)).toEqual([1]);
  });
});
