/**
 * Transmission-line section of characteristic impedance Zc between real Z0 terminations: the ABCD
 * matrix of a line (cosh γl, Zc sinh γl; sinh γl / Zc, cosh γl) converted to S (Pozar, Microwave
 * Engineering, 4th ed., sec. 4.4, ABCD of a line and the ABCD-to-S conversion table; numbering from
 * memory), with γ = α + jβ, α from loss_db_per_m (constant over frequency), β = 2πf/(v·c0).
 * Passive for every legal value; lossless when the loss is zero.
 */
import type { SData } from "../types";
import type { ParamReader } from "./params";
import type { ModelOutput } from "./model";

/** Speed of light in vacuum, m/s (SI, exact). */
export const C0 = 299792458;

/** Line section parameters in SI units. */
export type LineSection = {
  /** physical length, m */
  lengthM: number;
  /** phase velocity / c0, in (0, 1] */
  velocityFactor: number;
  /** matched loss, dB/m (constant over frequency) */
  lossDbPerM: number;
  /** characteristic impedance Zc, Ω (real, > 0) */
  zc: number;
};

/**
 * S of a line section over the frequencies `freqs` (Hz), referenced to the real Z0 (Ω) at both ports.
 * Written in terms of q = e^(−2γl) so that long lossy lines never overflow:
 * D = 2(1 + q) + (r + 1/r)(1 − q), S11 = S22 = (r − 1/r)(1 − q)/D, S21 = S12 = 4e^(−γl)/D, r = Zc/Z0.
 * For Zc = Z0 this is S21 = e^(−αl)·e^(−jθ), θ = 2πf·length/(v·c0) (docs/blocks.md, "line").
 *
 * @example
 * lineSParameters({ lengthM: 0.25, velocityFactor: 1, lossDbPerM: 0, zc: 50 }, new Float64Array([C0]), 50);
 * // quarter wave: S21 = −j
 */
export function lineSParameters(line: LineSection, freqs: Float64Array, z0: number): SData {
  const nf = freqs.length;
  const data = new Float64Array(8 * nf);
  const r = line.zc / z0;
  const sum = r + 1 / r;
  const dif = r - 1 / r;
  const alphaL = (line.lossDbPerM * line.lengthM * Math.LN10) / 20; // Np
  const att = Math.exp(-alphaL);
  const att2 = att * att;
  const k = (2 * Math.PI * line.lengthM) / (line.velocityFactor * C0);
  for (let f = 0; f < nf; f++) {
    const theta = k * freqs[f];
    const c = Math.cos(theta);
    const s = Math.sin(theta);
    // e^(−γl) = att·(c − js); q = att²·(cos 2θ − j sin 2θ)
    const qr = att2 * (c * c - s * s);
    const qi = -att2 * 2 * s * c;
    const dr = 2 * (1 + qr) + sum * (1 - qr);
    const di = 2 * qi - sum * qi;
    const den = dr * dr + di * di;
    // S11 = dif·(1 − q)/D
    const nr = dif * (1 - qr);
    const ni = -dif * qi;
    const s11r = (nr * dr + ni * di) / den;
    const s11i = (ni * dr - nr * di) / den;
    // S21 = 4·att·(c − js)/D
    const tr = 4 * att * c;
    const ti = -4 * att * s;
    const s21r = (tr * dr + ti * di) / den;
    const s21i = (ti * dr - tr * di) / den;
    const p = 8 * f;
    data[p] = s11r;
    data[p + 1] = s11i;
    data[p + 2] = s21r;
    data[p + 3] = s21i;
    data[p + 4] = s21r;
    data[p + 5] = s21i;
    data[p + 6] = s11r;
    data[p + 7] = s11i;
  }
  return { n: 2, nf, data };
}

/**
 * Line block: `length_m`, `velocity_factor` [1], `loss_db_per_m` [0], `impedance` [system Z0].
 *
 * @example
 * evaluateLine(reader, freqs, 50); // matched line: S21 = e^(−jθ)
 */
export function evaluateLine(r: ParamReader, freqs: Float64Array, z0: number): ModelOutput {
  const section: LineSection = {
    lengthM: r.number("length_m"),
    velocityFactor: r.number("velocity_factor"),
    lossDbPerM: r.number("loss_db_per_m"),
    zc: r.numberOrUndefined("impedance") ?? z0,
  };
  return { s: lineSParameters(section, freqs, z0), warnings: [] };
}
