import { describe, expect, it } from "vitest";
import { internalWaves, internalWavesMany, solveDense, solveSystem } from "../../engine/network";
import { powerLedger, powerLedgers } from "../../engine/checks";
import { EngineInputError, type PreparedSystem, type Solution } from "../../engine/types";
import { makeSystem, maxDiff, randomS, randomTopology, rng, type TopologyOptions } from "./network-helpers";

// Random excitations, one array per excitation ([k][system port], interleaved re/im).
function randomIncidents(r: () => number, sys: PreparedSystem, count: number): Float64Array[] {
  const len = 2 * sys.frequencies.length * sys.systemPorts.length;
  return Array.from({ length: count }, () => Float64Array.from({ length: len }, () => 2 * r() - 1));
}

function scaleOf(x: Float64Array): number {
  let m = 1e-300;
  for (const v of x) m = Math.max(m, Math.abs(v));
  return m;
}

// Largest |b_p − Σ_q S_pq a_q| over every block port and frequency, relative to the largest |b|: the
// definition of the scattering matrix, b = S a (Pozar, Microwave Engineering, 4th ed., eq. 4.40).
function bMinusSa(sol: Solution, a: Float64Array, b: Float64Array): number {
  const sys = sol.system;
  const nf = sol.frequencies.length;
  const P = sys.blockPorts.length;
  let worst = 0;
  sys.blocks.forEach((blk, i) => {
    const n = blk.s.n;
    const off = sys.blockOffset[i];
    const d = blk.s.data;
    for (let k = 0; k < nf; k++) {
      for (let r = 0; r < n; r++) {
        let sr = 0;
        let si = 0;
        for (let c = 0; c < n; c++) {
          const mr = d[2 * ((k * n + r) * n + c)];
          const mi = d[2 * ((k * n + r) * n + c) + 1];
          const xr = a[2 * (k * P + off + c)];
          const xi = a[2 * (k * P + off + c) + 1];
          sr += mr * xr - mi * xi;
          si += mr * xi + mi * xr;
        }
        const o = 2 * (k * P + off + r);
        worst = Math.max(worst, Math.hypot(b[o] - sr, b[o + 1] - si));
      }
    }
  });
  return worst / scaleOf(b);
}

describe("internalWavesMany (several excitations in one pass)", () => {
  // nf = 37 and 8 excitations: several frequency tiles, the last one partial
  const cases: (TopologyOptions & { seed: number })[] = [
    { seed: 3, blocks: 6, maxPorts: 4, extraLinks: 2, flavour: "passive", unterminated: true, nf: 37, portZ0: [50, 75] },
    { seed: 8, blocks: 9, maxPorts: 3, extraLinks: 3, flavour: "general", unterminated: false, nf: 37, portZ0: [50] },
    { seed: 15, blocks: 12, maxPorts: 5, extraLinks: 1, flavour: "passive", unterminated: true, nf: 5, portZ0: [25, 50, 100] },
  ];

  for (const c of cases) {
    it(`equals one internalWaves call per excitation to 1e-14 and satisfies b = S a (seed ${c.seed})`, () => {
      const r = rng(c.seed);
      const sys = makeSystem(randomTopology(r, c));
      const sol = solveSystem(sys);
      const incs = randomIncidents(r, sys, 8);
      const many = internalWavesMany(sol, incs);
      expect(many.length).toBe(8);
      // the dense connection-scattering-matrix solve is the independent reference (Gupta, Garg and
      // Chadha, Computer-Aided Design of Microwave Circuits, 1981, "from memory")
      const dense = solveDense(sys);
      incs.forEach((inc, e) => {
        const one = internalWaves(sol, inc);
        expect(maxDiff(many[e].a, one.a) / scaleOf(one.a)).toBeLessThan(1e-14);
        expect(maxDiff(many[e].b, one.b) / scaleOf(one.b)).toBeLessThan(1e-14);
        const ref = internalWaves(dense, inc);
        expect(maxDiff(many[e].a, ref.a) / scaleOf(ref.a)).toBeLessThan(1e-9);
        expect(bMinusSa(sol, many[e].a, many[e].b)).toBeLessThan(1e-12);
      });
      // a linked port's incident wave is its partner's outgoing wave (common practice)
      const P = sys.blockPorts.length;
      for (const [p, q] of sys.links) {
        for (let k = 0; k < sys.frequencies.length; k++) {
          expect(Math.abs(many[0].a[2 * (k * P + p)] - many[0].b[2 * (k * P + q)])).toBeLessThan(1e-12 * scaleOf(many[0].b));
        }
      }
    });
  }

  it("writes into `out`, recomputes the maps of an older solution, and matches on a dense solution", () => {
    const r = rng(41);
    const def = randomTopology(r, { blocks: 7, maxPorts: 3, extraLinks: 2, flavour: "passive", unterminated: true, nf: 11, portZ0: [50, 75] });
    const sys = makeSystem(def);
    const first = solveSystem(sys);
    const incs = randomIncidents(r, sys, 3);
    const want = incs.map((inc) => internalWaves(solveDense(sys), inc));
    solveSystem(sys, { replace: { B1: randomS(r, def.blocks[1].s.n, 11, 0.5) } }); // reuses the shared map buffer
    const len = 2 * 11 * sys.blockPorts.length;
    const out = incs.map(() => ({ a: new Float64Array(len).fill(7), b: new Float64Array(len).fill(7) }));
    const got = internalWavesMany(first, incs, out);
    got.forEach((w, e) => {
      expect(w).toBe(out[e]);
      expect(maxDiff(w.a, want[e].a)).toBeLessThan(1e-12);
      expect(maxDiff(w.b, want[e].b)).toBeLessThan(1e-12);
    });
    const viaDense = internalWavesMany(solveDense(sys), incs);
    viaDense.forEach((w, e) => expect(maxDiff(w.a, want[e].a)).toBeLessThan(1e-14));
    expect(internalWavesMany(first, [])).toEqual([]);
  });

  it("rejects a solution without wave data, a wrong length and shared output arrays", () => {
    const r = rng(5);
    const sys = makeSystem({ blocks: [{ id: "A", s: randomS(r, 2, 3) }, { id: "B", s: randomS(r, 2, 3) }], links: [["A:2", "B:1"]], ports: [{ name: "X", at: "A:1" }, { name: "Y", at: "B:2" }] });
    const ok = new Float64Array(2 * 3 * 2);
    expect(() => internalWavesMany(solveSystem(sys, { waves: false }), [ok, ok])).toThrow(EngineInputError);
    const sol = solveSystem(sys);
    expect(() => internalWavesMany(sol, [ok, new Float64Array(4)])).toThrow(EngineInputError);
    const shared = new Float64Array(2 * 3 * 4);
    expect(() => internalWavesMany(sol, [ok, ok], [{ a: shared, b: new Float64Array(24) }, { a: shared, b: new Float64Array(24) }])).toThrow(EngineInputError);
  });
});

describe("powerLedgers (every driven port from one batched pass)", () => {
  it("equals powerLedger port by port, and a passive system's ledgers close (Kurokawa 1965: power waves)", () => {
    const r = rng(12);
    const sys = makeSystem(randomTopology(r, { blocks: 8, maxPorts: 4, extraLinks: 2, flavour: "passive", unterminated: true, nf: 9, portZ0: [50, 75] }));
    const sol = solveSystem(sys);
    const all = powerLedgers(sol);
    expect(all.map((l) => l.port)).toEqual(sol.ports);
    all.forEach((l) => {
      const one = powerLedger(sol, l.port);
      expect(l.closure).toEqual(one.closure);
      expect(l.blocks).toEqual(one.blocks);
      expect(l.terminations).toEqual(one.terminations);
      expect(l.verdict).toBe("pass");
      expect(Math.abs(l.worstClosure)).toBeLessThan(1e-9);
    });
    const band: [number, number] = [sol.frequencies[2], sol.frequencies[5]];
    const some = powerLedgers(sol, [sol.ports[1]], band);
    expect(some[0].closure).toEqual(powerLedger(sol, sol.ports[1], band).closure);
  });
});

describe("non-finite block S is still caught once scans are remembered", () => {
  it("a solve after a clean one still rejects a new replacement or a new data array holding NaN", () => {
    const r = rng(2);
    const sys = makeSystem({ blocks: [{ id: "A", s: randomS(r, 2, 4) }, { id: "B", s: randomS(r, 2, 4) }], links: [["A:2", "B:1"]], ports: [{ name: "X", at: "A:1" }, { name: "Y", at: "B:2" }] });
    solveSystem(sys);
    const good = randomS(r, 2, 4);
    solveSystem(sys, { replace: { B: good } });
    const bad = randomS(r, 2, 4);
    bad.data[9] = Infinity;
    expect(() => solveSystem(sys, { replace: { B: bad } })).toThrow(/non-finite/);
    const swapped = { ...good, data: good.data.slice() };
    swapped.data[3] = NaN;
    expect(() => solveSystem(sys, { replace: { B: swapped } })).toThrow(/non-finite/);
    expect(() => solveDense(sys, { replace: { B: bad } })).toThrow(EngineInputError);
  });
});
