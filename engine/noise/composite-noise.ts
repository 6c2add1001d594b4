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
import { blockNoise, type BlockNoise } from "./block-noise";
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
  /** composite noise-wave correlation matrix, W/Hz, E×E per frequency; rows/columns outside `outputs` are 0 */
  c: SData;
  /** the system ports whose rows and columns of `c` were computed */
  outputs: number[];
  blocks: BlockNoise;
  warnings: string[];
};

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
  const incidents = outputs.map((j) => {
    const x = new Float64Array(2 * nf * E);
    for (let k = 0; k < nf; k++) x[2 * (k * E + j)] = 1;
    return x;
  });
  const rows = internalWavesMany(solT, incidents).map((w) => w.a); // rows[o][k][p] = T[outputs[o], p]
  const noise = blockNoise(sys, blockS);
  const c = new Float64Array(2 * nf * E * E);
  const M = outputs.length;
  const acc = new Float64Array(2 * M * M);
  const tc = new Float64Array(2 * M * 64);
  for (let k = 0; k < nf; k++) {
    acc.fill(0);
    sys.blocks.forEach((_, b) => {
      const cb = noise.c[b];
      const n = cb.n;
      const off = sys.blockOffset[b];
      const co = 2 * k * n * n;
      const rowBase = 2 * (k * P + off);
      const work = n <= 64 ? tc : new Float64Array(2 * M * n);
      // work[o][q] = Σ_p T[o][p]·C[p][q]
      for (let o = 0; o < M; o++) {
        const t = rows[o];
        for (let q = 0; q < n; q++) {
          let re = 0;
          let im = 0;
          for (let p = 0; p < n; p++) {
            const tr = t[rowBase + 2 * p];
            const ti = t[rowBase + 2 * p + 1];
            if (tr === 0 && ti === 0) continue;
            const cr = cb.data[co + 2 * (p * n + q)];
            const ci = cb.data[co + 2 * (p * n + q) + 1];
            re += tr * cr - ti * ci;
            im += tr * ci + ti * cr;
          }
          work[2 * (o * n + q)] = re;
          work[2 * (o * n + q) + 1] = im;
        }
      }
      // acc[o][o2] += Σ_q work[o][q]·conj(T[o2][q])
      for (let o = 0; o < M; o++) {
        for (let o2 = 0; o2 < M; o2++) {
          const t = rows[o2];
          let re = 0;
          let im = 0;
          for (let q = 0; q < n; q++) {
            const wr = work[2 * (o * n + q)];
            const wi = work[2 * (o * n + q) + 1];
            const tr = t[rowBase + 2 * q];
            const ti = -t[rowBase + 2 * q + 1];
            re += wr * tr - wi * ti;
            im += wr * ti + wi * tr;
          }
          acc[2 * (o * M + o2)] += re;
          acc[2 * (o * M + o2) + 1] += im;
        }
      }
    });
    for (let o = 0; o < M; o++) {
      for (let o2 = 0; o2 < M; o2++) {
        const dst = 2 * ((k * E + outputs[o]) * E + outputs[o2]);
        c[dst] = acc[2 * (o * M + o2)];
        c[dst + 1] = acc[2 * (o * M + o2) + 1];
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
    c: { n: E, nf, data: c },
    outputs,
    blocks: noise,
    warnings: [...solT.warnings, ...noise.notes],
  };
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
  if (!noise.outputs.includes(j)) throw new EngineInputError("to", `system port ${noise.ports[j] ?? j} was not among the noise outputs`);
  const E = noise.s.n;
  if (!(i >= 0 && i < E) || i === j) throw new EngineInputError("from", `expected a system port other than the output`);
  const nf = noise.frequencies.length;
  const kT0 = BOLTZMANN * T0;
  const f = new Float64Array(nf);
  const s = noise.s.data;
  for (let k = 0; k < nf; k++) {
    let total = noise.c.data[2 * ((k * E + j) * E + j)];
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
