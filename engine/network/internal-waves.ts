// Waves at every block port for one excitation, by substituting back through the wave maps kept by the
// solver (each join's closed ports as a linear function of its open ports), then b = S·a per block.

import { luFactorUnchecked, luSolve } from "../linalg";
import { EngineInputError, SingularSystemError, type InternalWaves, type SData, type Solution } from "../types";
import { formatHz } from "./names";
import { runGrowth } from "./solve-system";
import { waveStates, type DenseWaveState, type GrowthWaveState } from "./wave-store";

/**
 * Incident (a, into the block) and outgoing (b, out of the block) waves at every block port, referenced
 * to the system Z0, for incident power waves at the system ports (each referenced to its own Z0, √W).
 * On a link p–q, a_p = b_q; at a system port a includes the reflection of the Z0 step; at matched
 * (unlinked) ports a = 0. |a|² and |b|² are in watts.
 *
 * @param sol a solution from solveSystem or solveDense (solved with waves kept, the default)
 * @param incident [k][systemPort] interleaved re/im, length 2·nf·(system ports), √W
 * @param out optional arrays to write into (each of length 2·nf·(block ports)); new arrays when omitted
 * @returns { a, b } each [k][p] interleaved, length 2·nf·(block ports)
 * @throws EngineInputError when the solution kept no wave data or `incident` has the wrong length
 * @example
 * const inc = new Float64Array(2 * nf * E); inc[0] = 1; // 1 W into system port 0 at k = 0
 * const { a, b } = internalWaves(sol, inc);
 */
export function internalWaves(sol: Solution, incident: Float64Array, out?: InternalWaves): InternalWaves {
  const state = waveStates.get(sol);
  if (!state) throw new EngineInputError("solution", "internal waves need a solution solved with waves kept (solveSystem or solveDense, waves not false)");
  const sys = sol.system;
  const nf = sol.frequencies.length;
  const E = sys.systemPorts.length;
  if (incident.length !== 2 * nf * E) throw new EngineInputError("incident", `expected ${2 * nf * E} numbers (nf × system ports × re/im), got ${incident.length}`);
  const P = sys.blockPorts.length;
  const len = 2 * nf * P;
  if (out && (out.a.length !== len || out.b.length !== len || out.a === out.b)) throw new EngineInputError("out", `expected two distinct arrays of ${len} numbers`);
  const a = out ? out.a : new Float64Array(len);
  if (state.kind === "growth") {
    if (state.generation >= 0 && state.generation !== state.entry.generation) {
      // a later solve of the same system reused the shared map buffer: rebuild this solution's own maps
      const maps = new Float64Array(state.entry.mapTotal);
      runGrowth(sys, state.entry, state.blockS, maps);
      state.maps = maps;
      state.generation = -1;
    }
    fillGrowth(a, state, incident, nf, E, P);
  }
  else {
    if (out) a.fill(0);
    fillDense(a, state, incident, nf, E, P, sol);
  }
  const b = out ? out.b : new Float64Array(len);
  applyBlocks(b, a, state.blockS, sys.blockOffset, nf, P);
  return { a, b };
}

function fillGrowth(a: Float64Array, st: GrowthWaveState, incident: Float64Array, nf: number, E: number, P: number): void {
  const plan = st.entry.plan;
  const mapOffset = st.entry.mapOffset;
  const agl = new Float64Array(2 * plan.totalPorts);
  const steps = plan.steps;
  for (let f = 0; f < nf; f++) {
    agl.fill(0);
    for (let m = 0; m < E; m++) {
      agl[2 * plan.outer[m]] = incident[2 * (f * E + m)];
      agl[2 * plan.outer[m] + 1] = incident[2 * (f * E + m) + 1];
    }
    for (let s = steps.length - 1; s >= 0; s--) {
      const step = steps[s];
      const map = st.maps;
      const inner = step.inner;
      const ports = step.ports;
      const nC = ports.length;
      const R = inner.length;
      const mo = mapOffset[s] + 2 * f * R * nC;
      for (let r = 0; r < R; r++) {
        let sr = 0;
        let si = 0;
        const ro = mo + 2 * r * nC;
        for (let j = 0; j < nC; j++) {
          const xr = agl[2 * ports[j]];
          const xi = agl[2 * ports[j] + 1];
          if (xr === 0 && xi === 0) continue;
          const mr = map[ro + 2 * j];
          const mi = map[ro + 2 * j + 1];
          sr += mr * xr - mi * xi;
          si += mr * xi + mi * xr;
        }
        agl[2 * inner[r]] = sr;
        agl[2 * inner[r] + 1] = si;
      }
    }
    const fo = 2 * f * P;
    for (let i = 0; i < 2 * P; i++) a[fo + i] = agl[i];
  }
}

function fillDense(a: Float64Array, st: DenseWaveState, incident: Float64Array, nf: number, E: number, P: number, sol: Solution): void {
  const ni = st.inner.length;
  const k = new Float64Array(2 * E * E);
  const ae = new Float64Array(2 * E);
  const piv = new Int32Array(E);
  for (let f = 0; f < nf; f++) {
    // (I + diag(ρ)·S0) a_e = t ⊙ incident: the source wave through the step plus the step's reflection
    const so = 2 * f * E * E;
    for (let i = 0; i < E; i++) {
      for (let j = 0; j < E; j++) {
        k[2 * (i * E + j)] = (i === j ? 1 : 0) + st.rho[i] * st.s0[so + 2 * (i * E + j)];
        k[2 * (i * E + j) + 1] = st.rho[i] * st.s0[so + 2 * (i * E + j) + 1];
      }
      ae[2 * i] = st.t[i] * incident[2 * (f * E + i)];
      ae[2 * i + 1] = st.t[i] * incident[2 * (f * E + i) + 1];
    }
    if (E > 0) {
      if (luFactorUnchecked(k, E, piv) >= 0) throw new SingularSystemError(`Z0 steps singular at ${formatHz(sol.frequencies[f])}`, [], sol.frequencies[f]);
      luSolve(k, E, piv, ae, 1);
    }
    const fo = 2 * f * P;
    for (let m = 0; m < E; m++) {
      a[fo + 2 * st.ext[m]] = ae[2 * m];
      a[fo + 2 * st.ext[m] + 1] = ae[2 * m + 1];
    }
    const wo = 2 * f * ni * E;
    for (let r = 0; r < ni; r++) {
      let sr = 0;
      let si = 0;
      for (let j = 0; j < E; j++) {
        const mr = st.w[wo + 2 * (r * E + j)];
        const mi = st.w[wo + 2 * (r * E + j) + 1];
        sr += mr * ae[2 * j] - mi * ae[2 * j + 1];
        si += mr * ae[2 * j + 1] + mi * ae[2 * j];
      }
      a[fo + 2 * st.inner[r]] = sr;
      a[fo + 2 * st.inner[r] + 1] = si;
    }
  }
}

function applyBlocks(b: Float64Array, a: Float64Array, blockS: SData[], offsets: number[], nf: number, P: number): void {
  blockS.forEach((s, i) => {
    const n = s.n;
    const off = offsets[i];
    const d = s.data;
    for (let f = 0; f < nf; f++) {
      const so = 2 * f * n * n;
      const fo = 2 * f * P;
      for (let r = 0; r < n; r++) {
        let sr = 0;
        let si = 0;
        for (let c = 0; c < n; c++) {
          const mr = d[so + 2 * (r * n + c)];
          const mi = d[so + 2 * (r * n + c) + 1];
          const xr = a[fo + 2 * (off + c)];
          const xi = a[fo + 2 * (off + c) + 1];
          sr += mr * xr - mi * xi;
          si += mr * xi + mi * xr;
        }
        b[fo + 2 * (off + r)] = sr;
        b[fo + 2 * (off + r) + 1] = si;
      }
    }
  });
}
