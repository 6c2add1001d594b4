/**
 * Filter block: insertion-loss synthesis — the low-pass prototype ladder under the low-pass,
 * high-pass, band-pass and band-stop frequency transformations (Pozar, Microwave Engineering, 4th ed.,
 * sec. 8.3–8.4, section numbers from memory), evaluated at each frequency as a cascade of ABCD
 * matrices of series and shunt reactances and converted to S.
 *
 * Each transformation maps the real frequency ω to the prototype frequency Ω, and every element of
 * the transformed ladder has exactly the prototype's reactance at Ω (a series inductor g becomes
 * jΩg, a shunt capacitor jΩg), so S_filter(ω) = S_prototype(Ω(ω)) with
 * - lowpass  Ω = f/fc
 * - highpass Ω = −fc/f
 * - bandpass Ω = (f/f0 − f0/f)/Δ, Δ = BW/f0, f0 = √(f1·f2) the geometric centre, BW = f2 − f1
 * - bandstop Ω = −Δ/(f/f0 − f0/f)
 * The band edges (|Ω| = 1) are where the loss equals 3.01 dB (Butterworth) or ripple_db (Chebyshev).
 *
 * Ladder: port 1, series g1, shunt g2, series g3, …, port 2. Even-order Chebyshev prototypes end in
 * the load resistance g_{N+1}·Z0 ≠ Z0; this model brings it to Z0 with an ideal lossless transformer
 * (turns ratio √g_{N+1}), so the power reaching port 2 is the prototype's and the equal-ripple
 * response holds with both ports at Z0. Lossless (SᴴS = I) and reciprocal for every legal value.
 * At |Ω| = ∞ (f = 0 for high-pass/band-pass, f = f0 for band-stop) the limit is used: S21 = 0,
 * S11 = +1 (series element open), S22 = +1 for odd N, −1 for even N.
 */
import type { SData } from "../types";
import type { ParamReader } from "./params";
import type { ModelOutput } from "./model";
import { lowpassPrototype, type FilterFamily } from "./filter-prototype";

/** Filter response type. */
export type FilterResponse = "lowpass" | "highpass" | "bandpass" | "bandstop";

/** A fully specified filter. */
export type FilterDesign = {
  response: FilterResponse;
  family: FilterFamily;
  order: number;
  /** Chebyshev ripple, dB */
  rippleDb: number;
  /** lowpass/highpass band edge, Hz */
  cutoffHz?: number;
  /** bandpass/bandstop geometric centre, Hz */
  centerHz?: number;
  /** bandpass/bandstop f2 − f1, Hz */
  bandwidthHz?: number;
};

/** Beyond this |Ω| the response is its limit at Ω = ∞; |S21| ≤ 2/(|Ω|^N·Πg) is negligible there. */
const OMEGA_LIMIT = 1e15;

/**
 * Prototype frequency Ω for each frequency (Hz) of `freqs`, written into `out` (may alias nothing else).
 *
 * @example
 * prototypeFrequency(new Float64Array(1), new Float64Array([2e9]), { response: "lowpass", family: "butterworth", order: 3, rippleDb: 0.5, cutoffHz: 1e9 }); // [2]
 */
export function prototypeFrequency(out: Float64Array, freqs: Float64Array, d: FilterDesign): Float64Array {
  const nf = freqs.length;
  if (d.response === "lowpass" || d.response === "highpass") {
    const fc = d.cutoffHz as number;
    for (let k = 0; k < nf; k++) out[k] = d.response === "lowpass" ? freqs[k] / fc : -fc / freqs[k];
    return out;
  }
  const f0 = d.centerHz as number;
  const delta = (d.bandwidthHz as number) / f0;
  for (let k = 0; k < nf; k++) {
    const x = freqs[k] / f0 - f0 / freqs[k];
    out[k] = d.response === "bandpass" ? x / delta : -delta / x;
  }
  return out;
}

/**
 * S of the filter over `freqs` (Hz), both ports referenced to the (real) system Z0; the synthesis is
 * normalised to Z0, so the result does not depend on its value.
 *
 * @example
 * filterSParameters({ response: "lowpass", family: "butterworth", order: 5, rippleDb: 0.5, cutoffHz: 1e9 }, new Float64Array([1e9]));
 * // |S21|² = 1/2 at the cutoff
 */
export function filterSParameters(d: FilterDesign, freqs: Float64Array): SData {
  const g = lowpassPrototype(d.family, d.order, d.rippleDb);
  const n = d.order;
  // load resistance seen by the ladder: g_{N+1} if g_N is a shunt element (N even), 1/g_{N+1} if series
  const rLoad = n % 2 === 0 ? g[n + 1] : 1 / g[n + 1];
  const turns = Math.sqrt(rLoad);
  const nf = freqs.length;
  const omega = prototypeFrequency(new Float64Array(nf), freqs, d);
  const data = new Float64Array(8 * nf);
  for (let k = 0; k < nf; k++) {
    const w = omega[k];
    const p = 8 * k;
    if (!(Math.abs(w) < OMEGA_LIMIT)) {
      data[p] = 1;
      data[p + 6] = n % 2 === 1 ? 1 : -1;
      continue;
    }
    // ABCD of a lossless reciprocal ladder: A, D real; B, C imaginary. Track (A, Bi, Ci, D).
    let a = 1;
    let bi = 0;
    let ci = 0;
    let dd = 1;
    for (let e = 1; e <= n; e++) {
      const x = w * g[e];
      if (e % 2 === 1) {
        // × [[1, jx], [0, 1]]: B' = A·jx + B, D' = C·jx + D
        bi += a * x;
        dd -= ci * x;
      } else {
        // × [[1, 0], [jx, 1]]: A' = A + B·jx, C' = C + D·jx
        a -= bi * x;
        ci += dd * x;
      }
    }
    // × [[m, 0], [0, 1/m]] (ideal transformer, m² = rLoad)
    a *= turns;
    ci *= turns;
    bi /= turns;
    dd /= turns;
    // Normalised ABCD → S (Z0 = 1): Δ = A + B + C + D; S11 = (A + B − C − D)/Δ, S22 = (−A + B − C + D)/Δ,
    // S21 = S12 = 2/Δ since AD − BC = 1 for every factor.
    // scaled by the larger part of Δ so that |Δ|² cannot overflow deep in the stop band
    const sc = Math.max(Math.abs(a + dd), Math.abs(bi + ci));
    const dr = (a + dd) / sc;
    const di = (bi + ci) / sc;
    const den = dr * dr + di * di;
    const n11r = (a - dd) / sc;
    const n11i = (bi - ci) / sc;
    const n22r = -n11r;
    const n22i = n11i;
    const two = 2 / sc;
    data[p] = (n11r * dr + n11i * di) / den;
    data[p + 1] = (n11i * dr - n11r * di) / den;
    data[p + 2] = (two * dr) / den;
    data[p + 3] = (-two * di) / den;
    data[p + 4] = data[p + 2];
    data[p + 5] = data[p + 3];
    data[p + 6] = (n22r * dr + n22i * di) / den;
    data[p + 7] = (n22i * dr - n22r * di) / den;
  }
  return { n: 2, nf, data };
}

/**
 * Reads and checks a filter block's parameters (which band parameters are needed depends on
 * `response`; parameters that do not apply give a warning, not an error).
 *
 * @example
 * readFilterDesign(reader, warnings); // { response: "bandpass", family: "chebyshev", order: 5, … }
 */
export function readFilterDesign(r: ParamReader, warnings: string[]): FilterDesign {
  const response = r.choice<FilterResponse>("response");
  const family = r.choice<FilterFamily>("family");
  const order = r.number("order");
  const rippleDb = r.number("ripple_db");
  if (family === "butterworth" && r.has("ripple_db")) {
    warnings.push(`block ${r.blockId}: parameter ripple_db is ignored for family butterworth`);
  }
  const design: FilterDesign = { response, family, order, rippleDb };
  const needed = response === "lowpass" || response === "highpass" ? ["cutoff_hz"] : ["center_hz", "bandwidth_hz"];
  for (const name of ["cutoff_hz", "center_hz", "bandwidth_hz"]) {
    if (needed.includes(name)) {
      const v = r.numberOrUndefined(name);
      if (v === undefined) throw r.error(name, `required for response ${response}; expected a frequency in Hz > 0`);
    } else if (r.has(name)) {
      warnings.push(`block ${r.blockId}: parameter ${name} is ignored for response ${response}`);
    }
  }
  if (needed[0] === "cutoff_hz") design.cutoffHz = r.number("cutoff_hz");
  else {
    design.centerHz = r.number("center_hz");
    design.bandwidthHz = r.number("bandwidth_hz");
  }
  return design;
}

/**
 * Filter block over `freqs` (Hz).
 *
 * @example
 * evaluateFilter(reader, freqs); // lossless two-port, |S21|² = 1/(1 + Ω^(2N)) for Butterworth
 */
export function evaluateFilter(r: ParamReader, freqs: Float64Array): ModelOutput {
  const warnings: string[] = [];
  const design = readFilterDesign(r, warnings);
  return { s: filterSParameters(design, freqs), warnings };
}
