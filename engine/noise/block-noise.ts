// The noise of every block as a noise-wave correlation matrix: C = <c cᴴ> of the waves c the block sends
// out of its ports when every port is matched (b = S·a + c), in W/Hz, referenced to the system Z0.

import { largestSingularValue } from "../blocks/passivity";
import type { BlockSpec, PreparedSystem, SData } from "../types";
import { BOLTZMANN, T0, waveFromChain } from "./noise-parameters";

/** Default physical temperature of passive blocks and terminations, K. */
export const DEFAULT_TEMPERATURE_K = 290;

/** How each block's noise was modelled (shown in the line-up and docs). */
export type BlockNoiseModel = "thermal" | "amplifier" | "antenna" | "noise-data" | "noiseless";

export type BlockNoise = {
  /** one per block, n×n per frequency (SData layout), W/Hz; unlinked ports' matched loads included */
  c: SData[];
  models: BlockNoiseModel[];
  /** block temperatures used, K */
  temperatures: number[];
  notes: string[];
};

/**
 * Every block's noise-wave correlation matrix:
 * - passive blocks at their temperature T (block `temperature_k`, else the scenario's, else 290 K):
 *   C = kT(I − S·Sᴴ) (Bosma's theorem);
 * - amplifiers with `noise_figure_db` F: one noise wave of power kT0(F − 1) entering port 1, so
 *   C = kT0(F − 1)·S·e1·e1ᴴ·Sᴴ and the figure from a Z0 source is F whatever the return losses;
 *   without it the amplifier is noiseless (noted);
 * - antennas: a passive one-port at `noise_temperature_k` (default 290 K);
 * - touchstone parts with a noise section: its noise parameters (interpolated on the plan) as noise
 *   waves with the part's S; without one, thermal at T where the data is passive (σmax(S) ≤ 1 + 1e-9)
 *   and noiseless where it is not (noted).
 * Each block port that is neither linked nor a system port ends in a matched load at the block's
 * temperature, whose wave kT enters the port: C += kT·S·e_u·e_uᴴ·Sᴴ.
 *
 * @param sys the prepared system
 * @param blockS each block's S (sys.blocks[i].s, or a state's replacement)
 * @example const { c } = blockNoise(sys, sys.blocks.map((b) => b.s));
 */
export function blockNoise(sys: PreparedSystem, blockS: SData[]): BlockNoise {
  const terms = blockNoiseTerms(sys, blockS);
  const nf = sys.frequencies.length;
  const c = terms.blocks.map((t, i) => {
    const s = blockS[i];
    const n = s.n;
    const out = t.explicit ? t.explicit.slice() : new Float64Array(2 * nf * n * n);
    if (t.thermal > 0) addThermal(out, s.data, n, nf, t.thermal, t.thermalAt);
    for (const col of t.columns) addColumnOuter(out, s.data, n, nf, col.port, col.power);
    return { n, nf, data: out };
  });
  return { c, models: terms.models, temperatures: terms.temperatures, notes: terms.notes };
}

/**
 * A block's noise as the terms its correlation matrix is the sum of, so that the system's noise can be
 * formed from t·S products without building every block's matrix:
 * C = thermal·(I − S·Sᴴ) (at the frequencies of `thermalAt`, all when null) + Σ power·S·e_port·e_portᴴ·Sᴴ
 * over `columns` + `explicit` (W/Hz).
 */
export type BlockNoiseTerms = {
  thermal: number;
  thermalAt: Uint8Array | null;
  columns: { port: number; power: number }[];
  explicit: Float64Array | null;
};

/**
 * The terms of every block's noise-wave correlation matrix (see blockNoise for the models).
 *
 * @example blockNoiseTerms(sys, sys.blocks.map((b) => b.s)).blocks[0].thermal // kT of the first block
 */
export function blockNoiseTerms(sys: PreparedSystem, blockS: SData[]): { blocks: BlockNoiseTerms[]; models: BlockNoiseModel[]; temperatures: number[]; notes: string[] } {
  const scenarioT = sys.scenario.temperature_k ?? DEFAULT_TEMPERATURE_K;
  const nf = sys.frequencies.length;
  const unterminated = new Set(sys.unterminated);
  const notes: string[] = [];
  const models: BlockNoiseModel[] = [];
  const temperatures: number[] = [];
  const blocks = sys.blocks.map((blk, i): BlockNoiseTerms => {
    // blocks are in scenario order; a system built without a scenario's blocks has none of their fields
    const spec: Partial<BlockSpec> = sys.scenario.blocks[i]?.id === blk.id ? sys.scenario.blocks[i] : {};
    const s = blockS[i];
    const n = s.n;
    const d = s.data;
    const T = spec.temperature_k ?? scenarioT;
    temperatures.push(T);
    const params = (spec.params ?? {}) as Record<string, unknown>;
    const t: BlockNoiseTerms = { thermal: 0, thermalAt: null, columns: [], explicit: null };
    let model: BlockNoiseModel;
    if (blk.kind === "amplifier") {
      const nfDb = params.noise_figure_db;
      if (typeof nfDb === "number") {
        model = "amplifier";
        t.columns.push({ port: 0, power: BOLTZMANN * T0 * (10 ** (nfDb / 10) - 1) });
      } else {
        model = "noiseless";
        notes.push(`block ${blk.id}: amplifier without noise_figure_db, counted noiseless`);
      }
    } else if (blk.kind === "antenna") {
      model = "antenna";
      const Ta = typeof params.noise_temperature_k === "number" ? params.noise_temperature_k : DEFAULT_TEMPERATURE_K;
      t.thermal = BOLTZMANN * Ta;
    } else if (blk.kind === "touchstone") {
      if (blk.noiseChain && n === 2) {
        model = "noise-data";
        const out = new Float64Array(8 * nf);
        for (let k = 0; k < nf; k++) out.set(waveFromChain(blk.noiseChain.subarray(8 * k, 8 * k + 8), d.subarray(8 * k, 8 * k + 8), sys.z0), 8 * k);
        t.explicit = out;
      } else {
        model = "thermal";
        const passive = new Uint8Array(nf);
        let active = 0;
        for (let k = 0; k < nf; k++) {
          passive[k] = largestSingularValue(d.subarray(2 * n * n * k, 2 * n * n * (k + 1)), n) <= 1 + 1e-9 ? 1 : 0;
          if (!passive[k]) active++;
        }
        if (active > 0) notes.push(`block ${blk.id}: part data with gain and no noise section: noiseless at ${active} of ${nf} frequencies`);
        t.thermal = BOLTZMANN * T;
        t.thermalAt = active > 0 ? passive : null;
      }
    } else if (blk.traits.passive) {
      model = "thermal";
      t.thermal = BOLTZMANN * T;
    } else {
      model = "noiseless";
    }
    models.push(model);
    // matched loads on the block's unlinked ports: C = kT(I − SSᴴ) is the noise of the block alone, the
    // loads' noise enters from outside
    const off = sys.blockOffset[i];
    for (let r = 0; r < n; r++) if (unterminated.has(off + r)) t.columns.push({ port: r, power: BOLTZMANN * T });
    return t;
  });
  return { blocks, models, temperatures, notes };
}

/** out += kT·(I − S·Sᴴ) at the frequencies where `only` is 1 (all when null). */
function addThermal(out: Float64Array, d: Float64Array, n: number, nf: number, kT: number, only: Uint8Array | null): void {
  const nn = 2 * n * n;
  for (let k = 0; k < nf; k++) {
    if (only && !only[k]) continue;
    const o = k * nn;
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        let re = i === j ? 1 : 0;
        let im = 0;
        for (let m = 0; m < n; m++) {
          const ar = d[o + 2 * (i * n + m)];
          const ai = d[o + 2 * (i * n + m) + 1];
          const br = d[o + 2 * (j * n + m)];
          const bi = d[o + 2 * (j * n + m) + 1];
          // S_im · conj(S_jm)
          re -= ar * br + ai * bi;
          im -= ai * br - ar * bi;
        }
        out[o + 2 * (i * n + j)] += kT * re;
        out[o + 2 * (i * n + j) + 1] += kT * im;
      }
    }
  }
}

/** out += p·(S·e_col)(S·e_col)ᴴ: a wave of power p entering port `col`, seen at the outputs. */
function addColumnOuter(out: Float64Array, d: Float64Array, n: number, nf: number, col: number, p: number): void {
  const nn = 2 * n * n;
  for (let k = 0; k < nf; k++) {
    const o = k * nn;
    for (let i = 0; i < n; i++) {
      const ar = d[o + 2 * (i * n + col)];
      const ai = d[o + 2 * (i * n + col) + 1];
      for (let j = 0; j < n; j++) {
        const br = d[o + 2 * (j * n + col)];
        const bi = d[o + 2 * (j * n + col) + 1];
        out[o + 2 * (i * n + j)] += p * (ar * br + ai * bi);
        out[o + 2 * (i * n + j) + 1] += p * (ai * br - ar * bi);
      }
    }
  }
}
