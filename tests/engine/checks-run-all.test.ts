import { describe, expect, it } from "vitest";
import { solveSystem } from "@/engine/network";
import { prepareSystem } from "@/engine/system";
import { runAllChecks } from "@/engine/checks/run-all";
import type { Scenario } from "@/engine/types";

// A matched amplifier (20 dB gain, 30 dB reverse isolation) behind a 3 dB pad: IN→OUT gain 17 dB exactly
// (dB of matched cascades add, common practice); a built-in amplifier model with infinite return loss is
// unilateral-like and unconditionally stable (K > 1, |Δ| < 1; Pozar 4th ed. §12.2).
const scenario: Scenario = {
  format: "portolan.scenario/1",
  name: "pad and amplifier",
  z0: 50,
  frequency: { start: 1e9, stop: 2e9, points: 5 },
  blocks: [
    { id: "PAD", kind: "attenuator", params: { loss_db: 3 } },
    { id: "AMP", kind: "amplifier", params: { gain_db: 20, reverse_isolation_db: 30 } },
  ],
  links: [["PAD:2", "AMP:1"]],
  ports: [{ name: "IN", at: "PAD:1" }, { name: "OUT", at: "AMP:2" }],
  rules: [
    { kind: "insertion_loss", id: "gain", from: "IN", to: "OUT", band: [1e9, 2e9], max_db: -16.5 },
    { kind: "isolation", id: "rev", from: "OUT", to: "IN", band: [1e9, 2e9], min_db: 34, one_way: true },
  ],
};

describe("runAllChecks()", () => {
  const sys = prepareSystem(scenario);
  const r = runAllChecks(scenario, sys, solveSystem(sys));

  it("runs every rule with figures worked by hand", () => {
    expect(r.rules.map((x) => [x.id, x.verdict])).toEqual([["gain", "pass"], ["rev", "fail"]]);
    expect(r.rules[0].worst).toBeCloseTo(-17, 9); // insertion loss of a 17 dB gain
    expect(r.rules[1].worst).toBeCloseTo(33, 9); // 30 dB reverse isolation + 3 dB pad
    expect(r.rules[1].margin).toBeCloseTo(-1, 9);
    expect(r.verdict).toBe("fail");
  });

  it("adds ledger closure for every port, passivity, reciprocity and stability of the amplifier and the active composite", () => {
    expect(r.checks.map((c) => c.name)).toEqual(["rule:gain", "rule:rev", "ledger:IN", "ledger:OUT", "passivity", "reciprocity", "stability:AMP", "stability:composite"]);
    for (const l of r.ledgers) expect(Math.abs(l.worstClosure)).toBeLessThan(1e-9);
    const amp = r.ledgers[0].blocks.find((b) => b.block === "AMP");
    expect(amp?.role).toBe("added");
    expect(r.dataQuality.composite.expectPassive).toBe(false);
    expect(r.stability[0].verdict).toBe("pass");
    expect(JSON.parse(JSON.stringify(r)).checks).toHaveLength(8);
  });
});
