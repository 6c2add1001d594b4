import { describe, expect, it } from "vitest";
import { solveSystem } from "@/engine/network";
import { evaluateRule, evaluateRules } from "@/engine/checks/rules";
import { portMatrix, portMatrixExtremes } from "@/engine/checks/port-matrix";
import { EngineInputError } from "@/engine/types";
import { buildSystem, c, fromDb } from "./checks-helpers";

// One non-reciprocal 2-port F between system ports A (F:1) and B (F:2) on a 1–5 GHz plan:
// S21 = 10^(−L/20) with L = f/1 GHz dB (1…5 dB), S12 = −30 dB, S11 = 1/3 (VSWR 2), S22 = 0.
// With matched system ports the composite equals F, so every figure below follows by hand from
// L, RL = −20·log10|Γ| and VSWR = (1+|Γ|)/(1−|Γ|) (common practice).
const plan = [1e9, 2e9, 3e9, 4e9, 5e9];
const sys = buildSystem({
  frequencies: plan,
  blocks: [{ id: "F", s: (_k, f) => [[c(1 / 3), c(fromDb(-30))], [c(fromDb(-f / 1e9)), c(0)]], traits: { reciprocal: false } }],
  links: [],
  ports: [{ name: "A", at: "F:1" }, { name: "B", at: "F:2" }],
});
const sol = solveSystem(sys);

describe("evaluateRule()", () => {
  it("an unmet insertion-loss rule fails at the right frequency with the right margin", () => {
    // worst IL over 1–3 GHz is 3 dB at 3 GHz; limit 2.5 dB → margin −0.5 dB.
    const r = evaluateRule(sol, { kind: "insertion_loss", from: "A", to: "B", band: [1e9, 3e9], max_db: 2.5 }, 0);
    expect(r.verdict).toBe("fail");
    expect(r.worstHz).toBe(3e9);
    expect(r.worst).toBeCloseTo(3, 10);
    expect(r.margin).toBeCloseTo(-0.5, 10);
    expect(r.points).toBe(3);
    expect(r.values.map((v) => Number(v.toFixed(9)))).toEqual([1, 2, 3]);
  });

  it("band edges are inclusive within a relative 1e-12, not beyond", () => {
    // 3e9 − 1e-4 Hz is 3e-14 relative below the plan point: it still counts; 3e9 − 1 Hz does not.
    const inside = evaluateRule(sol, { kind: "insertion_loss", from: "A", to: "B", band: [2e9 + 1e-4, 3e9 - 1e-4], max_db: 10 }, 0);
    expect(inside.frequenciesHz).toEqual([2e9, 3e9]);
    const narrower = evaluateRule(sol, { kind: "insertion_loss", from: "A", to: "B", band: [2e9, 3e9 - 1], max_db: 10 }, 0);
    expect(narrower.frequenciesHz).toEqual([2e9]);
    expect(() => evaluateRule(sol, { kind: "insertion_loss", from: "A", to: "B", band: [2e9 + 1, 3e9 - 1], max_db: 10 }, 0)).toThrow(EngineInputError);
  });

  it("a band holding no plan point is an input error naming the rule", () => {
    const run = () => evaluateRule(sol, { kind: "isolation", id: "iso-ab", from: "A", to: "B", band: [5.5e9, 6e9], min_db: 20 }, 3);
    expect(run).toThrow(EngineInputError);
    expect(run).toThrow(/rule "iso-ab".*no point/);
    expect(() => evaluateRule(sol, { kind: "isolation", from: "A", to: "B", band: [2.1e9, 2.2e9], min_db: 20 }, 4)).toThrow(/rules\[4\]/);
  });

  it("an unknown port is an input error naming the rule and the known ports", () => {
    expect(() => evaluateRule(sol, { kind: "insertion_loss", id: "il", from: "A", to: "RX", band: [1e9, 2e9], max_db: 1 }, 0)).toThrow(/rule "il"\.to.*"RX".*A, B/);
  });

  it("isolation checks both directions unless one_way", () => {
    // A→B: −20·log10|S21| = 1…5 dB; B→A: 30 dB. Both ways, worst is 1 dB (A→B at 1 GHz).
    const both = evaluateRule(sol, { kind: "isolation", from: "B", to: "A", band: [1e9, 5e9], min_db: 20 }, 0);
    expect(both.verdict).toBe("fail");
    expect(both.worst).toBeCloseTo(1, 10);
    expect(both.worstHz).toBe(1e9);
    expect(both.direction).toBe("A→B");
    expect(both.margin).toBeCloseTo(-19, 10);
    const oneWay = evaluateRule(sol, { kind: "isolation", from: "B", to: "A", band: [1e9, 5e9], min_db: 20, one_way: true }, 0);
    expect(oneWay.verdict).toBe("pass");
    expect(oneWay.worst).toBeCloseTo(30, 10);
    expect(oneWay.margin).toBeCloseTo(10, 10);
  });

  it("match uses the stricter of return loss and VSWR limits and reports the worst VSWR", () => {
    // |Γ| = 1/3: RL 9.542 dB, VSWR 2. VSWR 1.9 ⇔ RL −20·log10(0.9/2.9) = 10.163 dB.
    const vswr = evaluateRule(sol, { kind: "match", port: "A", band: [1e9, 5e9], max_vswr: 1.9 }, 0);
    expect(vswr.verdict).toBe("fail");
    expect(vswr.limit).toBeCloseTo(-20 * Math.log10(0.9 / 2.9), 10);
    expect(vswr.margin).toBeCloseTo(20 * Math.log10(3) + 20 * Math.log10(0.9 / 2.9), 10);
    expect(vswr.extra?.worstVswr).toBeCloseTo(2, 12);
    const rl = evaluateRule(sol, { kind: "match", port: "A", band: [1e9, 5e9], min_return_loss_db: 9 }, 0);
    expect(rl.verdict).toBe("pass");
    expect(rl.margin).toBeCloseTo(20 * Math.log10(3) - 9, 10);
    // A perfectly matched port reports a finite return loss (the −400 dB floor), so results stay JSON.
    const perfect = evaluateRule(sol, { kind: "match", port: "B", band: [1e9, 5e9], min_return_loss_db: 20 }, 0);
    expect(perfect.worst).toBe(400);
    expect(JSON.parse(JSON.stringify(perfect))).toEqual(perfect);
  });

  it("evaluateRules() runs the scenario's rules in order", () => {
    const withRules = { ...sol, system: { ...sys, scenario: { ...sys.scenario, rules: [
      { kind: "insertion_loss" as const, from: "A", to: "B", band: [1e9, 5e9] as [number, number], max_db: 6 },
      { kind: "match" as const, port: "A", band: [1e9, 1e9] as [number, number], max_vswr: 2.5 },
    ] } } };
    expect(evaluateRules(withRules).map((r) => [r.id, r.verdict])).toEqual([["rules[0]", "pass"], ["rules[1]", "pass"]]);
  });
});

describe("portMatrix()", () => {
  it("gives |S_ij| in dB and phase at the nearest plan point and says which", () => {
    const m = portMatrix(sol, 2.2e9);
    expect(m.frequencyHz).toBe(2e9);
    expect(m.messages[0]).toMatch(/nearest plan point/);
    expect(m.magDb[1][0]).toBeCloseTo(-2, 10);
    expect(m.magDb[0][1]).toBeCloseTo(-30, 10);
    expect(m.magDb[0][0]).toBeCloseTo(-20 * Math.log10(3), 10);
    expect(m.phaseDeg[1][0]).toBeCloseTo(0, 12);
  });

  it("gives the extremes of each |S_ij| over a band with their frequencies", () => {
    const x = portMatrixExtremes(sol, [2e9, 4e9]);
    expect(x.maxDb[1][0]).toBeCloseTo(-2, 10);
    expect(x.maxHz[1][0]).toBe(2e9);
    expect(x.minDb[1][0]).toBeCloseTo(-4, 10);
    expect(x.minHz[1][0]).toBe(4e9);
    expect(x.points).toBe(3);
  });
});
