import { describe, expect, it } from "vitest";
import { solveSystem } from "@/engine/network";
import { prepareSystem } from "@/engine/system";
import { stateSweep, combinationStates, MAX_SWEEP_COMBINATIONS } from "@/engine/checks/state-sweep";
import { evaluateRules } from "@/engine/checks/rules";
import { EngineInputError, type Scenario } from "@/engine/types";

// An SP3T (SW1) whose third throw is the receive port, and an SPDT (SW2) behind its second throw.
const scenario: Scenario = {
  format: "portolan.scenario/1",
  name: "sweep test",
  z0: 50,
  frequency: { start: 2.3e9, stop: 2.5e9, points: 11 },
  blocks: [
    { id: "SW1", kind: "switch", params: { throws: 3, insertion_loss_db: 0.5, isolation_db: 30 }, state: 1 },
    { id: "SW2", kind: "switch", params: { throws: 2, insertion_loss_db: 0.4, isolation_db: 25, off_state: "reflective" }, state: 1 },
    { id: "ANT1", kind: "antenna", params: { return_loss_db: 10, phase_deg: 40 } },
    { id: "ANT2", kind: "antenna", params: { return_loss_db: 15 } },
    { id: "LOAD", kind: "load", params: { return_loss_db: 20 } },
  ],
  links: [["SW1:2", "ANT1:1"], ["SW1:3", "SW2:1"], ["SW2:2", "ANT2:1"], ["SW2:3", "LOAD:1"]],
  ports: [{ name: "TX", at: "SW1:1" }, { name: "RX", at: "SW1:4" }],
  rules: [
    { kind: "isolation", id: "iso", from: "TX", to: "RX", band: [2.4e9, 2.48e9], min_db: 20 },
    { kind: "match", id: "tx-match", port: "TX", band: [2.3e9, 2.5e9], min_return_loss_db: 12 },
  ],
};

describe("stateSweep()", () => {
  const sys = prepareSystem(scenario);
  const r = stateSweep(sys);

  it("has one row per combination: the product of the throws", () => {
    expect(r.switches).toEqual([{ block: "SW1", throws: 3 }, { block: "SW2", throws: 2 }]);
    expect(r.combinations).toBe(6);
    expect(r.rows).toHaveLength(6);
    expect(new Set(r.rows.map((x) => x.states.join())).size).toBe(6);
    expect(combinationStates(5, [3, 2])).toEqual([3, 2]);
  });

  it("every row matches solving that combination alone", () => {
    for (const row of r.rows) {
      const alone: Scenario = {
        ...scenario,
        blocks: scenario.blocks.map((b) => (b.id === "SW1" ? { ...b, state: row.states[0] } : b.id === "SW2" ? { ...b, state: row.states[1] } : b)),
      };
      const res = evaluateRules(solveSystem(prepareSystem(alone)));
      res.forEach((x, i) => {
        expect(row.cells[i].verdict).toBe(x.verdict);
        expect(row.cells[i].margin).toBeCloseTo(x.margin, 9);
        expect(row.cells[i].worstHz).toBe(x.worstHz);
      });
    }
  });

  it("connecting TX to RX fails isolation; best and worst combinations are named", () => {
    for (const row of r.rows) {
      if (row.states[0] === 3) expect(row.cells[0].verdict).toBe("fail");
      else expect(row.cells[0].verdict).toBe("pass");
    }
    expect(r.worst?.states[0]).toBe(3);
    expect(r.best).not.toBeNull();
    expect(r.best?.worstMargin).toBe(Math.max(...r.rows.map((x) => x.worstMargin as number)));
    expect(r.messages[0]).toMatch(/6 combinations of 2 switches × 2 rules/);
    expect(JSON.parse(JSON.stringify(r)).rows).toHaveLength(6);
  });

  it("sweeps drive rules too (they need the internal waves at every plan point)", () => {
    const withDrive: Scenario = {
      ...scenario,
      blocks: scenario.blocks.map((b) => (b.id === "ANT2" ? { ...b, rating_dbm: 30 } : b)),
      rules: [{ kind: "drive", id: "pa", sources: [{ port: "TX", dbm: 33 }] }],
    };
    const sw = stateSweep(prepareSystem(withDrive));
    for (const row of sw.rows) {
      const alone: Scenario = {
        ...withDrive,
        blocks: withDrive.blocks.map((b) => (b.id === "SW1" ? { ...b, state: row.states[0] } : b.id === "SW2" ? { ...b, state: row.states[1] } : b)),
      };
      const res = evaluateRules(solveSystem(prepareSystem(alone)));
      expect(row.cells[0].verdict).toBe(res[0].verdict);
      expect(row.cells[0].margin).toBeCloseTo(res[0].margin, 9);
    }
    // ANT2 only sees the 33 dBm (minus 0.5 + 0.4 dB) when both switches route to it.
    expect(sw.rows.filter((x) => x.verdict === "fail").map((x) => x.states)).toEqual([[2, 1]]);
  });

  it("refuses more than 4096 combinations, naming the count", () => {
    const many: Scenario = {
      ...scenario,
      blocks: Array.from({ length: 7 }, (_, i) => ({ id: `S${i}`, kind: "switch" as const, params: { throws: 4, insertion_loss_db: 0.5, isolation_db: 30 }, state: 1 })),
      links: Array.from({ length: 6 }, (_, i) => [`S${i}:2`, `S${i + 1}:1`] as [string, string]),
      ports: [{ name: "A", at: "S0:1" }],
      rules: [],
    };
    expect(MAX_SWEEP_COMBINATIONS).toBe(4096);
    const run = () => stateSweep(prepareSystem(many));
    expect(run).toThrow(EngineInputError);
    expect(run).toThrow(/16384 combinations/);
  });
});
