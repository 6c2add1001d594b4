// Noise of the assembled system: the composite noise-wave correlation matrix through the same interconnection
// as S (Hillbrand and Russer, 1976; Wedge and Rutledge, 1992 — from memory), and noise figures between
// system ports.
//
// With every block port's outgoing noise c (b = S·a + c, S block-diagonal), links a = Γ·b and the system
// ports' incident waves injected, the outgoing system waves are b_e = S_ext·a_e + T·c with
// T = Eᵀ(I − S·Γ)⁻¹. The internal-wave machinery gives, for an excitation a_e, the incident waves at every
// block port A·a_e with A = (I − Γ·S)⁻¹·E. Solving the same chart with every block's S transposed gives
// A' = (I − Γ·Sᵀ)⁻¹·E = Tᵀ (Γ is symmetric; the Z0 steps at system ports are reciprocal), so one solve of
// the transposed chart and one internal-wave pass with the output port excited give row j of T, and the
// composite correlation C_ext = T·C_blocks·Tᴴ block by block — no dense solve, no excitation per noise source.
// The transposed chart's composite is S_extᵀ, so S comes with it.

import { internalWavesMany, solveSystem } from "../network";
import { EngineInputError, type PreparedSystem, type SData } from "../types";
import { blockNoiseTerms, type BlockNoiseModel } from "./block-noise";
import { BOLTZMANN, T0 } from "./noise-parameters";

export type NoiseOptions = {
  /** block id → S used instead of the block's own (a switch state); the noise follows the S used */
  replace?: Record<string, SData>;
  /** the system ports (indices) whose rows of C are wanted (default all); NF to port j needs row j only */
  outputs?: number[];
};

export type SystemNoise = {
  frequencies: Float64Array;
  /** system port names */
  ports: string[];
  /** composite S, each port referenced to its own Z0 */
  s: SData;
  /**
   * composite noise-wave correlation matrix, W/Hz, between the system ports of `outputs` (in that order;
   * all system ports in their order by default), per frequency
   */
  c: SData;
  /** the system ports whose rows and columns of `c` were computed */
  outputs: number[];
  /** each block's noise model and temperature (K), and notes such as amplifiers counted noiseless */
  blocks: { models: BlockNoiseModel[]; temperatures: number[]; notes: string[] };
  warnings: string[];
};

const workFor = new WeakMap<PreparedSystem, { key: string; nf: number; incidents: Float64Array[]; waves: { a: Float64Array; b: Float64Array }[] }>();

// Transposed block S, kept per block data array (block data is not modified once handed to the engine).
const transposed = new WeakMap<SData, { data: Float64Array; t: SData }>();
function transposeOf(s: SData): SData {
  const hit = transposed.get(s);
  if (hit && hit.data === s.data) return hit.t;
  const n = s.n;
  const d = s.data;
  const out = new Float64Array(d.length);
  const nn = 2 * n * n;
  for (let k = 0; k < s.nf; k++) {
    const o = k * nn;
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        out[o + 2 * (j * n + i)] = d[o + 2 * (i * n + j)];
        out[o + 2 * (j * n + i) + 1] = d[o + 2 * (i * n + j) + 1];
      }
    }
  }
  const t = { n, nf: s.nf, data: out };
  transposed.set(s, { data: d, t });
  return t;
}

/**
 * Composite S and noise-wave correlation matrix of a prepared system (see the file comment for the method).
 *
 * @param sys the prepared system
 * @param opts replace (a state's block S), outputs (system port indices whose rows are wanted)
 * @returns S, C (W/Hz), the block noise models and notes
 * @throws SingularSystemError as solveSystem
 * @example
 * const noise = systemNoise(sys, { outputs: [1] });
 * noiseFigure(noise, 0, 1); // F from system port 0 to 1, per frequency
 */
export function systemNoise(sys: PreparedSystem, opts: NoiseOptions = {}): SystemNoise {
  const E = sys.systemPorts.length;
  const nf = sys.frequencies.length;
  const outputs = opts.outputs ?? sys.systemPorts.map((_, j) => j);
  for (const j of outputs) if (!(Number.isInteger(j) && j >= 0 && j < E)) throw new EngineInputError("outputs", `no system port ${j}`);
  const blockS = sys.blocks.map((b) => opts.replace?.[b.id] ?? b.s);
  const replace: Record<string, SData> = {};
  sys.blocks.forEach((b, i) => (replace[b.id] = transposeOf(blockS[i])));
  const solT = solveSystem(sys, { replace });
  const P = sys.blockPorts.length;
  // the excitations and wave arrays are kept per system and reused: fresh megabyte arrays on every call
  // cost more (page faults, collection) than the arithmetic on them
  const key = outputs.join(",");
  let work = workFor.get(sys);
  if (!work || work.key !== key || work.nf !== nf) {
    const incidents = outputs.map((j) => {
      const x = new Float64Array(2 * nf * E);
      for (let k = 0; k < nf; k++) x[2 * (k * E + j)] = 1;
      return x;
    });
    work = { key, nf, incidents, waves: incidents.map(() => ({ a: new Float64Array(2 * nf * P), b: new Float64Array(2 * nf * P) })) };
    workFor.set(sys, work);
  }
  const rows = internalWavesMany(solT, work.incidents, work.waves).map((w) => w.a); // rows[o][k][p] = T[outputs[o], p]
  const noise = blockNoiseTerms(sys, blockS);
  const M = outputs.length;
  const c = new Float64Array(2 * nf * M * M);
  let nMax = 1;
  for (const b of blockS) nMax = Math.max(nMax, b.n);
  const u = new Float64Array(2 * M * nMax); // u[o] = t_o·S of the block at one frequency

  // block by block, every frequency in a row: each block's S and rows of T are read in order
  for (let b = 0; b < blockS.length; b++) {
    const terms = noise.blocks[b];
    const nCols = terms.columns.length;
    if (terms.thermal === 0 && nCols === 0 && !terms.explicit) continue;
    const colPort = Int32Array.from(terms.columns, (x) => x.port);
    const colPower = Float64Array.from(terms.columns, (x) => x.power);
    const sd = blockS[b].data;
    const n = blockS[b].n;
    const off = sys.blockOffset[b];
    const needU = terms.thermal > 0 || nCols > 0;
    if (M === 1 && !terms.explicit) {
      const powerAt = new Float64Array(n);
      for (let x = 0; x < nCols; x++) powerAt[colPort[x]] += colPower[x];
      addOneOutput(c, rows[0], sd, n, nf, P, off, terms.thermal, terms.thermalAt, powerAt);
      continue;
    }
    for (let k = 0; k < nf; k++) {
      const thermal = terms.thermal > 0 && (!terms.thermalAt || terms.thermalAt[k] === 1) ? terms.thermal : 0;
      const so = 2 * k * n * n;
      const rowBase = 2 * (k * P + off);
      if (needU) {
        for (let o = 0; o < M; o++) {
          const t = rows[o];
          for (let col = 0; col < n; col++) {
            let re = 0;
            let im = 0;
            for (let p = 0; p < n; p++) {
              const tr = t[rowBase + 2 * p];
              const ti = t[rowBase + 2 * p + 1];
              const sr = sd[so + 2 * (p * n + col)];
              const si = sd[so + 2 * (p * n + col) + 1];
              re += tr * sr - ti * si;
              im += tr * si + ti * sr;
            }
            u[2 * (o * n + col)] = re;
            u[2 * (o * n + col) + 1] = im;
          }
        }
      }
      const cBase = 2 * k * M * M;
      for (let o = 0; o < M; o++) {
        const t = rows[o];
        for (let o2 = 0; o2 < M; o2++) {
          const t2 = rows[o2];
          let re = 0;
          let im = 0;
          if (thermal !== 0) {
            // kT·(t·t2ᴴ − u·u2ᴴ)
            let xr = 0;
            let xi = 0;
            for (let p = 0; p < n; p++) {
              const ar = t[rowBase + 2 * p];
              const ai = t[rowBase + 2 * p + 1];
              const br = t2[rowBase + 2 * p];
              const bi = t2[rowBase + 2 * p + 1];
              const cr = u[2 * (o * n + p)];
              const ci = u[2 * (o * n + p) + 1];
              const dr = u[2 * (o2 * n + p)];
              const di = u[2 * (o2 * n + p) + 1];
              xr += ar * br + ai * bi - (cr * dr + ci * di);
              xi += ai * br - ar * bi - (ci * dr - cr * di);
            }
            re += thermal * xr;
            im += thermal * xi;
          }
          for (let x = 0; x < nCols; x++) {
            const q = colPort[x];
            const cr = u[2 * (o * n + q)];
            const ci = u[2 * (o * n + q) + 1];
            const dr = u[2 * (o2 * n + q)];
            const di = u[2 * (o2 * n + q) + 1];
            re += colPower[x] * (cr * dr + ci * di);
            im += colPower[x] * (ci * dr - cr * di);
          }
          if (terms.explicit) {
            const cd = terms.explicit;
            for (let p = 0; p < n; p++) {
              const ar = t[rowBase + 2 * p];
              const ai = t[rowBase + 2 * p + 1];
              for (let q = 0; q < n; q++) {
                const cr = cd[so + 2 * (p * n + q)];
                const ci = cd[so + 2 * (p * n + q) + 1];
                const br = t2[rowBase + 2 * q];
                const bi = -t2[rowBase + 2 * q + 1];
                // t_p·C_pq·conj(t2_q)
                const xr = ar * cr - ai * ci;
                const xi = ar * ci + ai * cr;
                re += xr * br - xi * bi;
                im += xr * bi + xi * br;
              }
            }
          }
          const d = cBase + 2 * (o * M + o2);
          c[d] += re;
          c[d + 1] += im;
        }
      }
    }
  }
  // the transposed chart's composite is S_extᵀ
  const st = solT.s.data;
  const s = new Float64Array(st.length);
  for (let k = 0; k < nf; k++) {
    for (let i = 0; i < E; i++) {
      for (let j = 0; j < E; j++) {
        s[2 * ((k * E + i) * E + j)] = st[2 * ((k * E + j) * E + i)];
        s[2 * ((k * E + i) * E + j) + 1] = st[2 * ((k * E + j) * E + i) + 1];
      }
    }
  }
  return {
    frequencies: sys.frequencies,
    ports: sys.systemPorts.map((p) => p.name),
    s: { n: E, nf, data: s },
    c: { n: M, nf, data: c },
    outputs,
    blocks: { models: noise.models, temperatures: noise.temperatures, notes: noise.notes },
    warnings: [...solT.warnings, ...noise.notes],
  };
}

/**
 * One output's C_jj, block by block (a kernel of its own so that it is optimised apart from systemNoise):
 * c[k] += kT·(|t|² − |t·S|²) + Σ_ports power·|(t·S)_port|², all real.
 */
function addOneOutput(
  c: Float64Array,
  t: Float64Array,
  sd: Float64Array,
  n: number,
  nf: number,
  P: number,
  off: number,
  kT: number,
  thermalAt: Uint8Array | null,
  powerAt: Float64Array,
): void {
  for (let k = 0; k < nf; k++) {
    const thermal = kT > 0 && (!thermalAt || thermalAt[k] === 1) ? kT : 0;
    const so = 2 * k * n * n;
    const rowBase = 2 * (k * P + off);
    let sum = 0;
    if (thermal !== 0) for (let p = 0; p < n; p++) sum += thermal * (t[rowBase + 2 * p] ** 2 + t[rowBase + 2 * p + 1] ** 2);
    for (let col = 0; col < n; col++) {
      const weight = powerAt[col] - thermal;
      if (weight === 0) continue;
      let re = 0;
      let im = 0;
      for (let p = 0; p < n; p++) {
        const tr = t[rowBase + 2 * p];
        const ti = t[rowBase + 2 * p + 1];
        const sr = sd[so + 2 * (p * n + col)];
        const si = sd[so + 2 * (p * n + col) + 1];
        re += tr * sr - ti * si;
        im += tr * si + ti * sr;
      }
      sum += weight * (re * re + im * im);
    }
    c[2 * k] += sum;
  }
}

/**
 * Noise figure (ratio) from system port i to system port j at every frequency: the source at i a Z0_i
 * termination at 290 K, every other system port except j terminated in its Z0 at 290 K,
 * F = (Σ_{m≠j} kT0·|S_jm|² + C_jj) / (kT0·|S_ji|²) — the noise power available at j over the part of it
 * that comes from the source. Infinite where S_ji = 0.
 *
 * @param noise from systemNoise with j among its outputs
 * @example 10 * Math.log10(noiseFigure(noise, 0, 1)[k]) // NF in dB
 */
export function noiseFigure(noise: SystemNoise, i: number, j: number): Float64Array {
  const o = noise.outputs.indexOf(j);
  if (o < 0) throw new EngineInputError("to", `system port ${noise.ports[j] ?? j} was not among the noise outputs`);
  const M = noise.c.n;
  const E = noise.s.n;
  if (!(i >= 0 && i < E) || i === j) throw new EngineInputError("from", `expected a system port other than the output`);
  const nf = noise.frequencies.length;
  const kT0 = BOLTZMANN * T0;
  const f = new Float64Array(nf);
  const s = noise.s.data;
  for (let k = 0; k < nf; k++) {
    let total = noise.c.data[2 * ((k * M + o) * M + o)];
    let fromSource = 0;
    for (let m = 0; m < E; m++) {
      if (m === j) continue;
      const re = s[2 * ((k * E + j) * E + m)];
      const im = s[2 * ((k * E + j) * E + m) + 1];
      const p = kT0 * (re * re + im * im);
      total += p;
      if (m === i) fromSource = p;
    }
    f[k] = fromSource > 0 ? total / fromSource : Infinity;
  }
  return f;
}
