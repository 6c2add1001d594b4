// Waves at every block port for one excitation (or several at once, sharing every read of the maps), by
// substituting back through the wave maps kept by the solver (each join's closed ports as a linear function
// of its open ports); then b = a of the partner on a link, and b = S·a at unlinked and system ports.
// The single-excitation kernels stay beside the batched ones: run with one excitation, the batched ones
// took 10–35% more CPU time on the bench front end and the 64-element array (measured 2026-12-04).

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
  const b = out ? out.b : new Float64Array(len);
  const rows = state.kind === "growth" ? state.entry.plan.totalPorts : P;
  let partner: Int32Array;
  if (state.kind === "growth") {
    partner = state.entry.plan.partner;
    if (state.generation >= 0 && state.generation !== state.entry.generation) {
      // a later solve of the same system reused the shared map buffer: rebuild this solution's own maps
      const maps = new Float64Array(state.entry.mapTotal);
      runGrowth(sys, state.entry, state.blockS, maps);
      state.maps = maps;
      state.generation = -1;
    }
  } else {
    partner = new Int32Array(P).fill(-1);
    for (const [p, q] of sys.links) {
      partner[p] = q;
      partner[q] = p;
    }
    if (out) a.fill(0);
    fillDense(a, state, incident, nf, E, P, sol);
  }
  // Frequencies are independent, so everything runs over one tile of frequencies at a time in a
  // port-major work area ([p][k] within the tile: the innermost loops run over frequencies): the rows
  // of a, then rows of b for the unlinked and system ports (S·a); a linked port's b is its partner's a.
  const tStride = 2 * TILE;
  const at = new Int32Array(P);
  let next = rows * tStride;
  for (let p = 0; p < P; p++) {
    if (partner[p] >= 0) at[p] = partner[p] * tStride;
    else {
      at[p] = next;
      next += tStride;
    }
  }
  const w = workOf(next);
  for (let f0 = 0; f0 < nf; f0 += TILE) {
    const nft = Math.min(TILE, nf - f0);
    if (state.kind === "growth") {
      fillGrowth(w, tStride, state, incident, E, f0, nft);
      toFrequencyMajor(a, w, null, tStride, f0, nft, P);
    } else {
      toPortMajor(w, tStride, a, f0, nft, P);
    }
    fillOutgoing(w, tStride, at, partner, state.blockS, sys.blockOffset, f0, nft);
    toFrequencyMajor(b, w, at, tStride, f0, nft, P);
  }
  return { a, b };
}

/**
 * internalWaves for several excitations of one solution in one pass: every wave map and block S entry is
 * read once per frequency and applied to all the excitations (several right-hand sides), so E excitations
 * cost far less than E calls. Each result equals internalWaves(sol, incidents[e]) (same arithmetic, same
 * order of operations per excitation).
 *
 * @param sol a solution from solveSystem or solveDense (solved with waves kept, the default)
 * @param incidents one array per excitation, each [k][systemPort] interleaved re/im, length 2·nf·(system ports), √W
 * @param out optional results to write into (one { a, b } per excitation, each array 2·nf·(block ports))
 * @returns one { a, b } per excitation, each [k][p] interleaved, length 2·nf·(block ports)
 * @throws EngineInputError when the solution kept no wave data or an array has the wrong length
 * @example
 * const inc = sol.ports.map((_, m) => { const x = new Float64Array(2 * nf * E); for (let k = 0; k < nf; k++) x[2 * (k * E + m)] = 1; return x; });
 * const waves = internalWavesMany(sol, inc); // waves[m].a: incident waves with 1 W into system port m
 */
export function internalWavesMany(sol: Solution, incidents: Float64Array[], out?: InternalWaves[]): InternalWaves[] {
  const state = waveStates.get(sol);
  if (!state) throw new EngineInputError("solution", "internal waves need a solution solved with waves kept (solveSystem or solveDense, waves not false)");
  const sys = sol.system;
  const nf = sol.frequencies.length;
  const E = sys.systemPorts.length;
  const P = sys.blockPorts.length;
  const len = 2 * nf * P;
  const M = incidents.length;
  incidents.forEach((inc, e) => {
    if (inc.length !== 2 * nf * E) throw new EngineInputError(`incidents[${e}]`, `expected ${2 * nf * E} numbers (nf × system ports × re/im), got ${inc.length}`);
  });
  if (out) {
    if (out.length !== M) throw new EngineInputError("out", `expected ${M} results, got ${out.length}`);
    const seen = new Set<Float64Array>();
    for (const o of out) {
      if (o.a.length !== len || o.b.length !== len || seen.has(o.a) || seen.has(o.b) || o.a === o.b) throw new EngineInputError("out", `expected distinct arrays of ${len} numbers`);
      seen.add(o.a);
      seen.add(o.b);
    }
  }
  if (state.kind === "dense" || M === 1) return incidents.map((inc, e) => internalWaves(sol, inc, out?.[e]));
  const results = out ?? incidents.map(() => ({ a: new Float64Array(len), b: new Float64Array(len) }));
  if (M === 0) return results;
  // an incident array that is also an output would be overwritten before it is read: copy it first
  const outs = new Set<Float64Array>();
  for (const r of results) {
    outs.add(r.a);
    outs.add(r.b);
  }
  const inc = incidents.map((x) => (outs.has(x) ? x.slice() : x));
  if (state.generation >= 0 && state.generation !== state.entry.generation) {
    const maps = new Float64Array(state.entry.mapTotal);
    runGrowth(sys, state.entry, state.blockS, maps);
    state.maps = maps;
    state.generation = -1;
  }
  const plan = state.entry.plan;
  const partner = plan.partner;
  const rows = plan.totalPorts;
  // Work area per tile of frequencies: row p holds [f][e] (the excitations innermost, so that each map
  // entry loaded once updates every excitation from contiguous memory).
  const tile = Math.max(4, Math.floor(MANY_TILE_VALUES / M));
  const rStride = 2 * tile * M + 8; // padded: rows a power of two apart share cache sets
  const at = new Int32Array(P);
  const own = new Int32Array(P);
  let next = rows * rStride;
  for (let p = 0; p < P; p++) {
    own[p] = p * rStride;
    if (partner[p] >= 0) at[p] = partner[p] * rStride;
    else {
      at[p] = next;
      next += rStride;
    }
  }
  const w = workOf(next);
  const as = results.map((r) => r.a);
  const bs = results.map((r) => r.b);
  for (let f0 = 0; f0 < nf; f0 += tile) {
    const nft = Math.min(tile, nf - f0);
    fillGrowthMany(w, rStride, state, inc, E, f0, nft, M);
    toFrequencyMajorMany(as, w, own, f0, nft, P, M);
    fillOutgoingMany(w, rStride, at, partner, state.blockS, sys.blockOffset, f0, nft, M);
    toFrequencyMajorMany(bs, w, at, f0, nft, P, M);
  }
  return results;
}

/** Complex values (frequencies × excitations) per row of the batched tile. */
const MANY_TILE_VALUES = 128;

/** out[e][f0 + k][p] = row p of the batched tile (row p starts at at[p]), k < nft. */
function toFrequencyMajorMany(out: Float64Array[], w: Float64Array, at: Int32Array, f0: number, nft: number, P: number, M: number): void {
  const fw = 2 * M;
  for (let f = 0; f < nft; f++) {
    const dst = 2 * (f0 + f) * P;
    for (let p = 0; p < P; p++) {
      const src = at[p] + f * fw;
      const d = dst + 2 * p;
      for (let e = 0; e < M; e++) {
        const o = out[e];
        o[d] = w[src + 2 * e];
        o[d + 1] = w[src + 2 * e + 1];
      }
    }
  }
}

/** fillGrowth for M excitations at once: rows [f][e]. */
function fillGrowthMany(w: Float64Array, rStride: number, st: GrowthWaveState, incidents: Float64Array[], E: number, f0: number, nft: number, M: number): void {
  const plan = st.entry.plan;
  const mapOffset = st.entry.mapOffset;
  w.fill(0, 0, plan.totalPorts * rStride);
  const fw = 2 * M;
  for (let e = 0; e < M; e++) {
    const inc = incidents[e];
    for (let m = 0; m < E; m++) {
      const row = plan.outer[m] * rStride + 2 * e;
      for (let f = 0; f < nft; f++) {
        w[row + f * fw] = inc[2 * ((f0 + f) * E + m)];
        w[row + f * fw + 1] = inc[2 * ((f0 + f) * E + m) + 1];
      }
    }
  }
  const map = st.maps;
  const steps = plan.steps;
  for (let s = steps.length - 1; s >= 0; s--) {
    const step = steps[s];
    const inner = step.inner;
    const ports = step.ports;
    const nC = ports.length;
    const R = inner.length;
    const fStride = 2 * R * nC;
    const base = mapOffset[s] + f0 * fStride;
    for (let r = 0; r < R; r++) {
      const dst = inner[r] * rStride;
      for (let j = 0; j < nC; j++) {
        const src = ports[j] * rStride;
        let mo = base + 2 * (r * nC + j);
        for (let f = 0; f < nft; f++, mo += fStride) {
          const mr = map[mo];
          const mi = map[mo + 1];
          const d0 = dst + f * fw;
          const s0 = src + f * fw;
          for (let e = 0; e < fw; e += 2) {
            const xr = w[s0 + e];
            const xi = w[s0 + e + 1];
            w[d0 + e] += mr * xr - mi * xi;
            w[d0 + e + 1] += mr * xi + mi * xr;
          }
        }
      }
    }
  }
}

/** fillOutgoing for M excitations at once: rows [f][e]. */
function fillOutgoingMany(w: Float64Array, rStride: number, at: Int32Array, partner: Int32Array, blockS: SData[], offsets: number[], f0: number, nft: number, M: number): void {
  const fw = 2 * M;
  const hi = nft * fw;
  for (let i = 0; i < blockS.length; i++) {
    const s = blockS[i];
    const n = s.n;
    const off = offsets[i];
    const d = s.data;
    const fStride = 2 * n * n;
    for (let r = 0; r < n; r++) {
      const p = off + r;
      if (partner[p] >= 0) continue;
      const ro = at[p];
      w.fill(0, ro, ro + hi);
      for (let c = 0; c < n; c++) {
        const src = (off + c) * rStride;
        let so = f0 * fStride + 2 * (r * n + c);
        for (let f = 0; f < nft; f++, so += fStride) {
          const mr = d[so];
          const mi = d[so + 1];
          const d0 = ro + f * fw;
          const s0 = src + f * fw;
          for (let e = 0; e < fw; e += 2) {
            const xr = w[s0 + e];
            const xi = w[s0 + e + 1];
            w[d0 + e] += mr * xr - mi * xi;
            w[d0 + e + 1] += mr * xi + mi * xr;
          }
        }
      }
    }
  }
}

/** Frequencies per tile: the tile's work area and map entries stay in cache through every stage. */
const TILE = 32;

/** out[f0 + k][p] = row p of the tile (at `at[p]` when given, else at p·tStride), k < nft. */
function toFrequencyMajor(out: Float64Array, w: Float64Array, at: Int32Array | null, tStride: number, f0: number, nft: number, P: number): void {
  for (let p = 0; p < P; p++) {
    const ro = at ? at[p] : p * tStride;
    for (let f = 0; f < nft; f++) {
      out[2 * ((f0 + f) * P + p)] = w[ro + 2 * f];
      out[2 * ((f0 + f) * P + p) + 1] = w[ro + 2 * f + 1];
    }
  }
}

/** Row p of the tile = src[f0 + k][p], k < nft. */
function toPortMajor(w: Float64Array, tStride: number, src: Float64Array, f0: number, nft: number, P: number): void {
  for (let p = 0; p < P; p++) {
    const ro = p * tStride;
    for (let f = 0; f < nft; f++) {
      w[ro + 2 * f] = src[2 * ((f0 + f) * P + p)];
      w[ro + 2 * f + 1] = src[2 * ((f0 + f) * P + p) + 1];
    }
  }
}

// The work area, reused between calls (calls never nest).
let work = new Float64Array(0);
function workOf(length: number): Float64Array {
  if (work.length < length) work = new Float64Array(length);
  return work;
}

/** Incident waves of every port (rows of the tile) by substituting back through the stored wave maps. */
function fillGrowth(w: Float64Array, tStride: number, st: GrowthWaveState, incident: Float64Array, E: number, f0: number, nft: number): void {
  const plan = st.entry.plan;
  const mapOffset = st.entry.mapOffset;
  w.fill(0, 0, plan.totalPorts * tStride);
  for (let m = 0; m < E; m++) {
    const row = plan.outer[m] * tStride;
    for (let f = 0; f < nft; f++) {
      w[row + 2 * f] = incident[2 * ((f0 + f) * E + m)];
      w[row + 2 * f + 1] = incident[2 * ((f0 + f) * E + m) + 1];
    }
  }
  const map = st.maps;
  const steps = plan.steps;
  const hi = 2 * nft;
  for (let s = steps.length - 1; s >= 0; s--) {
    const step = steps[s];
    const inner = step.inner;
    const ports = step.ports;
    const nC = ports.length;
    const R = inner.length;
    const fStride = 2 * R * nC; // one frequency's map
    const base = mapOffset[s] + f0 * fStride;
    for (let r = 0; r < R; r++) {
      const dst = inner[r] * tStride;
      for (let j = 0; j < nC; j++) {
        const src = ports[j] * tStride;
        let mo = base + 2 * (r * nC + j);
        for (let f = 0; f < hi; f += 2, mo += fStride) {
          const mr = map[mo];
          const mi = map[mo + 1];
          const xr = w[src + f];
          const xi = w[src + f + 1];
          w[dst + f] += mr * xr - mi * xi;
          w[dst + f + 1] += mr * xi + mi * xr;
        }
      }
    }
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

/** b rows of the tile for the unlinked and system ports: S·a of their block (rows at `at[p]`). */
function fillOutgoing(w: Float64Array, tStride: number, at: Int32Array, partner: Int32Array, blockS: SData[], offsets: number[], f0: number, nft: number): void {
  const hi = 2 * nft;
  for (let i = 0; i < blockS.length; i++) {
    const s = blockS[i];
    const n = s.n;
    const off = offsets[i];
    const d = s.data;
    const fStride = 2 * n * n;
    for (let r = 0; r < n; r++) {
      const p = off + r;
      if (partner[p] >= 0) continue;
      const ro = at[p];
      w.fill(0, ro, ro + hi);
      for (let c = 0; c < n; c++) {
        const src = (off + c) * tStride;
        let so = f0 * fStride + 2 * (r * n + c);
        for (let f = 0; f < hi; f += 2, so += fStride) {
          const mr = d[so];
          const mi = d[so + 1];
          const xr = w[src + f];
          const xi = w[src + f + 1];
          w[ro + f] += mr * xr - mi * xi;
          w[ro + f + 1] += mr * xi + mi * xr;
        }
      }
    }
  }
}
