// Identities of the interconnection as properties over random topologies (chains, trees, loops, self
// links, matched ports, system ports with their own Z0). Seeds are fixed so that a failure replays.

import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { maxSingularValue, reciprocityError, unitarityError } from "../../engine/linalg";
import { internalWaves, solveDense, solveSystem, z0Step } from "../../engine/network";
import type { PreparedSystem, Solution } from "../../engine/types";
import { constantS, makeSystem, maxDiff, randomTopology, rng, type BlockFlavour, type SystemDef } from "./network-helpers";

const topology = (flavour: BlockFlavour, unterminated = true) =>
  fc.record({
    seed: fc.integer({ min: 0, max: 2 ** 31 - 1 }),
    blocks: fc.integer({ min: 1, max: 9 }),
    maxPorts: fc.integer({ min: 2, max: 5 }),
    extraLinks: fc.integer({ min: 0, max: 4 }),
    steps: fc.boolean(),
  }).map(({ seed, blocks, maxPorts, extraLinks, steps }) => {
    const r = rng(seed);
    const def = randomTopology(r, { blocks, maxPorts, extraLinks, flavour, unterminated, nf: 3, portZ0: steps ? [50, 75, 25, 100] : undefined });
    return { def, r };
  });

const RUNS = { numRuns: 60, seed: 20261201 };
const scaleOf = (sol: Solution) => Math.max(1, ...Array.from(sol.s.data, Math.abs));

function shuffled<T>(r: () => number, xs: T[]): T[] {
  const out = xs.slice();
  for (let i = out.length - 1; i > 0; i--) {
    const j = Math.floor(r() * (i + 1));
    [out[i], out[j]] = [out[j], out[i]];
  }
  return out;
}

describe("interconnection properties (fast-check 4.10)", () => {
  it("solveSystem() agrees with the dense connection-scattering-matrix solve on random topologies with loops", () => {
    fc.assert(
      fc.property(topology("passive"), ({ def }) => {
        const sys = makeSystem(def);
        const g = solveSystem(sys);
        const d = solveDense(sys);
        expect(maxDiff(g.s.data, d.s.data)).toBeLessThan(1e-12 * scaleOf(d));
      }),
      RUNS,
    );
  });

  it("passive blocks give a passive composite: σ_max(S) ≤ 1 + 1e−12 (common practice)", () => {
    fc.assert(
      fc.property(topology("passive"), ({ def }) => {
        const sol = solveSystem(makeSystem(def));
        for (let k = 0; k < sol.s.nf; k++) expect(maxSingularValue(sol.s, k)).toBeLessThanOrEqual(1 + 1e-12);
      }),
      RUNS,
    );
  });

  it("reciprocal blocks give a reciprocal composite: S = Sᵀ to 1e−12 (Pozar, 4th ed., §4.3, from memory)", () => {
    fc.assert(
      fc.property(topology("reciprocal"), ({ def }) => {
        const sol = solveSystem(makeSystem(def));
        for (let k = 0; k < sol.s.nf; k++) expect(reciprocityError(sol.s, k)).toBeLessThan(1e-12);
      }),
      RUNS,
    );
  });

  it("lossless blocks with every port linked or exposed give SᴴS = I to 1e−9 (Pozar, 4th ed., §4.3, from memory)", () => {
    fc.assert(
      fc.property(topology("lossless", false), ({ def }) => {
        const sol = solveSystem(makeSystem(def));
        for (let k = 0; k < sol.s.nf; k++) expect(unitarityError(sol.s, k)).toBeLessThan(1e-9);
      }),
      { ...RUNS, numRuns: 40 },
    );
  });

  it("inserting an ideal through S = [[0, 1], [1, 0]] into any link changes nothing", () => {
    fc.assert(
      fc.property(topology("passive"), fc.nat(), ({ def }, which) => {
        if (def.links.length === 0) return;
        const i = which % def.links.length;
        const [p, q] = def.links[i];
        const thru = constantS([[[0, 0], [1, 0]], [[1, 0], [0, 0]]], 3);
        const withThru: SystemDef = {
          ...def,
          blocks: [...def.blocks, { id: "THRU", s: thru }],
          links: [...def.links.filter((_, j) => j !== i), [p, "THRU:1"], ["THRU:2", q]],
        };
        const a = solveSystem(makeSystem(def));
        const b = solveSystem(makeSystem(withThru));
        expect(maxDiff(a.s.data, b.s.data)).toBeLessThan(1e-13 * scaleOf(a));
      }),
      RUNS,
    );
  });

  it("permuting the block order, the link order and the ends of each link gives the same composite to rounding", () => {
    fc.assert(
      fc.property(topology("general"), ({ def, r }) => {
        const permuted: SystemDef = {
          ...def,
          blocks: shuffled(r, def.blocks),
          links: shuffled(r, def.links).map(([p, q]) => (r() < 0.5 ? [q, p] : [p, q]) as [string, string]),
        };
        const a = solveSystem(makeSystem(def));
        const b = solveSystem(makeSystem(permuted));
        expect(maxDiff(a.s.data, b.s.data)).toBeLessThan(1e-12 * scaleOf(a));
      }),
      RUNS,
    );
  });
});

describe("internal waves", () => {
  /** Every relation the waves must satisfy, checked from the outside. */
  function checkWaves(sys: PreparedSystem, sol: Solution, inc: Float64Array, a: Float64Array, b: Float64Array, balanceTol: number): void {
    const nf = sol.s.nf;
    const P = sys.blockPorts.length;
    const E = sys.systemPorts.length;
    const near = (x: number, y: number, tol = 1e-12) => expect(Math.abs(x - y)).toBeLessThan(tol);
    for (let k = 0; k < nf; k++) {
      const A = (p: number) => [a[2 * (k * P + p)], a[2 * (k * P + p) + 1]];
      const B = (p: number) => [b[2 * (k * P + p)], b[2 * (k * P + p) + 1]];
      // links: what leaves one end enters the other
      for (const [p, q] of sys.links) {
        near(A(p)[0], B(q)[0]);
        near(A(p)[1], B(q)[1]);
        near(A(q)[0], B(p)[0]);
        near(A(q)[1], B(p)[1]);
      }
      // matched ports receive nothing
      for (const p of sys.unterminated) expect(A(p)).toEqual([0, 0]);
      // per block: b = S·a
      sys.blocks.forEach((blk, i) => {
        const n = blk.s.n;
        const off = sys.blockOffset[i];
        for (let r = 0; r < n; r++) {
          let sr = 0;
          let si = 0;
          for (let col = 0; col < n; col++) {
            const mr = blk.s.data[2 * ((k * n + r) * n + col)];
            const mi = blk.s.data[2 * ((k * n + r) * n + col) + 1];
            sr += mr * A(off + col)[0] - mi * A(off + col)[1];
            si += mr * A(off + col)[1] + mi * A(off + col)[0];
          }
          near(B(off + r)[0], sr);
          near(B(off + r)[1], si);
        }
      });
      // system ports: through the lossless Z0 step, a = t·inc − ρ·b and outgoing = ρ·inc + t·b = (S·inc)
      let incident = 0;
      let outgoing = 0;
      sys.systemPorts.forEach((sp, m) => {
        const { rho, t } = z0Step(sp.z0, sys.z0);
        const ir = inc[2 * (k * E + m)];
        const ii = inc[2 * (k * E + m) + 1];
        near(A(sp.at)[0], t * ir - rho * B(sp.at)[0]);
        near(A(sp.at)[1], t * ii - rho * B(sp.at)[1]);
        const or = rho * ir + t * B(sp.at)[0];
        const oi = rho * ii + t * B(sp.at)[1];
        let sr = 0;
        let si = 0;
        for (let j = 0; j < E; j++) {
          const mr = sol.s.data[2 * ((k * E + m) * E + j)];
          const mi = sol.s.data[2 * ((k * E + m) * E + j) + 1];
          sr += mr * inc[2 * (k * E + j)] - mi * inc[2 * (k * E + j) + 1];
          si += mr * inc[2 * (k * E + j) + 1] + mi * inc[2 * (k * E + j)];
        }
        near(or, sr, 1e-11);
        near(oi, si, 1e-11);
        incident += ir * ir + ii * ii;
        outgoing += or * or + oi * oi;
      });
      // power ledger: absorbed in blocks + absorbed in the matched terminations of unlinked ports + leaving the
      // system ports = incident (energy conservation)
      let absorbed = 0;
      for (let p = 0; p < P; p++) absorbed += A(p)[0] ** 2 + A(p)[1] ** 2 - B(p)[0] ** 2 - B(p)[1] ** 2;
      let terminations = 0;
      for (const p of sys.unterminated) terminations += B(p)[0] ** 2 + B(p)[1] ** 2;
      expect(Math.abs(absorbed + terminations + outgoing - incident)).toBeLessThan(balanceTol * Math.max(1, incident));
    }
  }

  it("satisfy link, port and block relations and balance power, equal between growth and dense solves", () => {
    fc.assert(
      fc.property(topology("passive"), ({ def, r }) => {
        const sys = makeSystem(def);
        const E = sys.systemPorts.length;
        const inc = Float64Array.from({ length: 2 * 3 * E }, () => 2 * r() - 1);
        const g = solveSystem(sys);
        const d = solveDense(sys);
        const wg = internalWaves(g, inc);
        const wd = internalWaves(d, inc);
        checkWaves(sys, g, inc, wg.a, wg.b, 1e-12);
        expect(maxDiff(wg.a, wd.a)).toBeLessThan(1e-12);
        expect(maxDiff(wg.b, wd.b)).toBeLessThan(1e-12);
      }),
      RUNS,
    );
  });

  it("with lossless blocks nothing is absorbed: all incident power leaves the system ports", () => {
    const r = rng(5150);
    for (let trial = 0; trial < 10; trial++) {
      const def = randomTopology(r, { blocks: 2 + trial, maxPorts: 4, extraLinks: trial % 3, flavour: "lossless", unterminated: false, nf: 3, portZ0: [50, 75] });
      const sys = makeSystem(def);
      const E = sys.systemPorts.length;
      const inc = Float64Array.from({ length: 2 * 3 * E }, () => 2 * r() - 1);
      const sol = solveSystem(sys);
      const { a, b } = internalWaves(sol, inc);
      checkWaves(sys, sol, inc, a, b, 1e-9);
      let absorbed = 0;
      for (let i = 0; i < a.length; i++) absorbed += a[i] * a[i] - b[i] * b[i];
      expect(Math.abs(absorbed)).toBeLessThan(1e-9 * E * 3);
    }
  });
});
