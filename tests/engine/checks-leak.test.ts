import { describe, expect, it } from "vitest";
import { solveSystem } from "@/engine/network";
import { prepareSystem } from "@/engine/system";
import { idealizeBlock } from "@/engine/blocks";
import type { Scenario } from "@/engine/types";
import { leakTrace } from "@/engine/checks/leak-trace";
import { buildSystem, c, fromDb, onePort, twoPort, type C, type TestBlock } from "./checks-helpers";

const db = (x: number) => 20 * Math.log10(x);

// Transmit/receive front end drawn by hand: TX → circulator C (1→2→3→1, IL 0.5 dB, isolation 20 dB) with
// the antenna (return loss 10 dB) on C:2 and a switch SW (common 1; throw 2 = RX, throw 3 = open port,
// set to throw 3 while transmitting: 1→3 IL 0.4 dB, 1→2 isolation 25 dB) on C:3; RX = SW:2.
// Every part is matched except the antenna, so exactly two simple paths join TX to RX:
//   P1 = C 1→2, reflection off the antenna, C 2→3, SW 1→2: −0.5 − 10 − 0.5 − 25 = −36 dB
//   P2 = C 1→3 (circulator isolation), SW 1→2:             −20 − 25 = −45 dB
// and the composite is exactly P1 + P2 (signal-flow graph without loops; Mason's rule, Pozar 4th ed. §4.5).
function frontEnd(antGamma: C): TestBlock[] {
  const t = fromDb(-0.5), i = fromDb(-20);
  const circ: C[][] = [[c(0), c(i), c(t)], [c(t), c(0), c(i)], [c(i), c(t), c(0)]];
  const ts = fromDb(-0.4), is = fromDb(-25);
  const sw: C[][] = [[c(0), c(is), c(ts)], [c(is), c(0), c(0)], [c(ts), c(0), c(0)]];
  return [
    { id: "C", s: () => circ, traits: { reciprocal: false } },
    { id: "ANT", s: onePort(antGamma) },
    { id: "SW", s: () => sw },
  ];
}
const links: [string, string][] = [["C:2", "ANT:1"], ["C:3", "SW:1"]];
const ports = [{ name: "TX", at: "C:1" }, { name: "RX", at: "SW:2" }];

describe("leakTrace()", () => {
  const sys = buildSystem({ frequencies: [2.4e9, 2.44e9, 2.48e9], blocks: frontEnd(c(fromDb(-10))), links, ports });
  const sol = solveSystem(sys);
  const r = leakTrace(sol, { from: "TX", to: "RX", band: [2.4e9, 2.48e9] });

  it("ranks the antenna reflection above circulator isolation, with the hops and products worked by hand", () => {
    expect(r.paths).toHaveLength(2);
    expect(r.paths[0].db).toBeCloseTo(-36, 10);
    expect(r.paths[0].hops.map((h) => [h.block, h.inPort, h.outPort])).toEqual([["C", 1, 2], ["ANT", 1, 1], ["C", 2, 3], ["SW", 1, 2]]);
    expect(r.paths[0].hops[1].db).toBeCloseTo(-10, 10);
    expect(r.paths[1].db).toBeCloseTo(-45, 10);
    expect(r.paths[1].hops.map((h) => [h.block, h.inPort, h.outPort])).toEqual([["C", 1, 3], ["SW", 1, 2]]);
    expect(r.paths[0].text).toBe("TX → C 1→2 (-0.50 dB) → ANT 1→1 (-10.00 dB) → C 2→3 (-0.50 dB) → SW 1→2 (-25.00 dB) → RX");
  });

  it("the listed paths account for the whole composite when there are no loops", () => {
    const expected = db(fromDb(-36) + fromDb(-45)); // both real and positive: they add in phase
    expect(r.trueDb).toBeCloseTo(expected, 10);
    expect(r.listedSumDb).toBeCloseTo(expected, 10);
    expect(Math.abs(r.accountedDb)).toBeLessThan(1e-9);
    expect(r.residualRelativeDb).toBeLessThan(-200);
  });

  it("the ideal-antenna what-if equals a separate solve of the modified system", () => {
    const separate = solveSystem(buildSystem({ frequencies: [2.44e9], blocks: frontEnd(c(0)), links, ports }));
    const sepDb = db(Math.hypot(separate.s.data[2 * 2], separate.s.data[2 * 2 + 1])); // S21 at k = 0
    expect(sepDb).toBeCloseTo(-45, 10);
    const ant = r.whatIf.find((w) => w.block === "ANT");
    expect(ant?.valueDb).toBeCloseTo(sepDb, 10);
    expect(ant?.improvementDb).toBeCloseTo(db(fromDb(-36) + fromDb(-45)) + 45, 10);
    expect(ant?.message).toMatch(/^if ANT were ideal, TX→RX isolation would improve by 11\.6\d dB$/);
    expect(r.whatIf.map((w) => w.block).sort()).toEqual(["ANT", "C", "SW"]);
  });

  it("explains what simple paths miss when waves bounce: mismatched pads in a chain", () => {
    // Two pads (|S21| = 0.8, Γ = 0.3 at the joined ports). The only simple path is the direct one; the
    // composite is S21a·S21b / (1 − S22a·S11b) (cascade of mismatched two-ports, Pozar 4th ed. §4.3/§11),
    // so the listed path falls short by 20·log10(1 − 0.09) dB and the residual is 0.09 relative to it.
    const g = 0.3, t = 0.8;
    const pads = buildSystem({
      frequencies: [1e9],
      blocks: [{ id: "P1", s: twoPort(c(0), c(t), c(t), c(g)) }, { id: "P2", s: twoPort(c(g), c(t), c(t), c(0)) }],
      links: [["P1:2", "P2:1"]],
      ports: [{ name: "A", at: "P1:1" }, { name: "B", at: "P2:2" }],
    });
    const lt = leakTrace(solveSystem(pads), { from: "A", to: "B", frequencyHz: 1e9, whatIf: false });
    expect(lt.paths).toHaveLength(1);
    expect(lt.trueDb).toBeCloseTo(db((t * t) / (1 - g * g)), 10);
    expect(lt.accountedDb).toBeCloseTo(db(1 - g * g), 10);
    expect(lt.residualRelativeDb).toBeCloseTo(db(g * g), 10);
    expect(lt.messages[0]).toMatch(/residual/);
  });

  it("includes the step between a system port's own Z0 and the system Z0", () => {
    // A matched 3 dB pad between a 75 Ω port and a 50 Ω port: the power-wave step transmits
    // 2√(75·50)/(75+50) (Kurokawa 1965 power waves, real references).
    const pad = buildSystem({
      frequencies: [1e9],
      blocks: [{ id: "PAD", s: twoPort(c(0), c(fromDb(-3)), c(fromDb(-3)), c(0)) }],
      links: [],
      ports: [{ name: "A", at: "PAD:1", z0: 75 }, { name: "B", at: "PAD:2" }],
    });
    const lt = leakTrace(solveSystem(pad), { from: "A", to: "B", frequencyHz: 1e9, whatIf: false });
    const step = (2 * Math.sqrt(75 * 50)) / 125;
    expect(lt.paths[0].hops[0]).toMatchObject({ kind: "port", block: "A" });
    expect(lt.paths[0].db).toBeCloseTo(-3 + db(step), 10);
    expect(lt.trueDb).toBeCloseTo(-3 + db(step), 10);
    expect(Math.abs(lt.accountedDb)).toBeLessThan(1e-9);
  });

  it("traces the worst frequency of a band: where |S_to,from| is largest", () => {
    // Leak of −30, −25, −35 dB at 1, 2, 3 GHz: the band 1–3 GHz is traced at 2 GHz.
    const leak = [-30, -25, -35];
    const l = buildSystem({
      frequencies: [1e9, 2e9, 3e9],
      blocks: [{ id: "L", s: (k) => [[c(0), c(fromDb(leak[k]))], [c(fromDb(leak[k])), c(0)]] }],
      links: [],
      ports: [{ name: "A", at: "L:1" }, { name: "B", at: "L:2" }],
    });
    const lt = leakTrace(solveSystem(l), { from: "A", to: "B", band: [1e9, 3e9] });
    expect(lt.frequencyHz).toBe(2e9);
    expect(lt.requestedHz).toBeNull();
    expect(lt.trueDb).toBeCloseTo(-25, 10);
    expect(lt.whatIf[0].message).toMatch(/^if L were ideal, A→B isolation would not change \(25\.00 dB\)$/);
  });

  it("handles gains above one (an amplifier on the path) with an exact ranking", () => {
    // Amplifier 20 dB, reverse isolation 40 dB, between two pads; the strongest A→B path runs through the
    // gain (−3 + 20 − 3 = 14 dB).
    const amp = buildSystem({
      frequencies: [1e9],
      blocks: [
        { id: "P1", s: twoPort(c(0.1), c(fromDb(-3)), c(fromDb(-3)), c(0.1)) },
        { id: "AMP", kind: "amplifier", s: twoPort(c(0.2), c(fromDb(-40)), c(fromDb(20)), c(0.2)), traits: { passive: false, reciprocal: false } },
        { id: "P2", s: twoPort(c(0.1), c(fromDb(-3)), c(fromDb(-3)), c(0.1)) },
      ],
      links: [["P1:2", "AMP:1"], ["AMP:2", "P2:1"]],
      ports: [{ name: "A", at: "P1:1" }, { name: "B", at: "P2:2" }],
    });
    const lt = leakTrace(solveSystem(amp), { from: "A", to: "B", frequencyHz: 1e9, whatIf: false });
    expect(lt.ranking).toBe("exact");
    expect(lt.paths[0].db).toBeCloseTo(14, 10);
    expect(lt.paths.every((p, i) => i === 0 || p.db <= lt.paths[i - 1].db + 1e-12)).toBe(true);
  });
});

describe("leakTrace() on block models", () => {
  // The same transmit/receive arrangement from built-in models: circulator (IL 1 dB, isolation 20 dB; with
  // t + ι = 0.891 + 0.1 ≤ 1 the model keeps both as entered), antenna (return loss 10 dB), SPDT switch
  // (IL 0.4 dB, isolation 25 dB) set to its second throw while transmitting. The reflection off the antenna
  // through the circulator and the switch isolation (−1 − 10 − 1 − 25 = −37 dB) dominates the circulator's
  // own isolation (−20 − 25 = −45 dB).
  const scenario: Scenario = {
    format: "portolan.scenario/1",
    name: "T/R leak",
    z0: 50,
    frequency: { list: [2.4e9, 2.45e9, 2.5e9] },
    blocks: [
      { id: "CIRC", kind: "circulator", params: { insertion_loss_db: 1, isolation_db: 20 } },
      { id: "ANT", kind: "antenna", params: { return_loss_db: 10 } },
      { id: "SW", kind: "switch", params: { throws: 2, insertion_loss_db: 0.4, isolation_db: 25 }, state: 2 },
    ],
    links: [["CIRC:2", "ANT:1"], ["CIRC:3", "SW:1"]],
    ports: [{ name: "TX", at: "CIRC:1" }, { name: "RX", at: "SW:2" }],
  };
  const sol = solveSystem(prepareSystem(scenario));
  const r = leakTrace(sol, { from: "TX", to: "RX", frequencyHz: 2.45e9 });

  it("finds the antenna reflection first and the circulator isolation second", () => {
    expect(r.frequencyHz).toBe(2.45e9);
    expect(r.paths[0].hops.map((h) => h.block)).toEqual(["CIRC", "ANT", "CIRC", "SW"]);
    expect(r.paths[0].db).toBeCloseTo(-37, 6);
    expect(r.paths[1].hops.map((h) => h.block)).toEqual(["CIRC", "SW"]);
    expect(r.paths[1].db).toBeCloseTo(-45, 6);
    expect(Math.abs(r.accountedDb)).toBeLessThan(0.01);
  });

  it("each ideal-block what-if equals a separate solve of the scenario with that block idealised", () => {
    for (const w of r.whatIf) {
      const modified: Scenario = { ...scenario, blocks: scenario.blocks.map((b) => (b.id === w.block ? idealizeBlock(b) : b)) };
      const sep = solveSystem(prepareSystem(modified));
      const k = 1; // 2.45 GHz
      const o = 2 * ((k * 2 + 1) * 2 + 0);
      const sepDb = Math.max(-400, db(Math.hypot(sep.s.data[o], sep.s.data[o + 1])));
      expect(w.valueDb).toBeCloseTo(sepDb, 9);
      expect(w.improvementDb).toBeCloseTo(r.trueDb - sepDb, 9);
    }
    const ant = r.whatIf.find((w) => w.block === "ANT");
    expect(ant?.valueDb).toBeCloseTo(-45, 6); // only the circulator-isolation path is left
    const sw = r.whatIf.find((w) => w.block === "SW");
    expect(sw?.message).toMatch(/every leak path runs through SW/);
  });
});
