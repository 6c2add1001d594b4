// Piecewise-linear interpolation of real and imaginary parts between neighbouring data points (the default
// of the reference library scikit-rf 0.15.4, Network.interpolate with coords='cart' and scipy's linear interp1d).
import { formatHz } from "../format";
import { FREQUENCY_TOLERANCE, sameFrequency } from "../scenario/frequency-tolerance";
import { EngineInputError, type SData } from "../types";

export type InterpolateOptions = {
  /** part name, used in messages */
  name: string;
  /** what to do with plan points outside the data range: refuse (default) or hold the nearest edge value */
  extrapolate?: "error" | "hold";
};

export type InterpolateResult = {
  s: SData;
  /** how many plan points lay below the first / above the last data frequency and were held */
  extrapolated: { below: number; above: number };
  /** how many plan points lay strictly between two data frequencies (not on one within the tolerance) */
  interpolated: number;
};

/**
 * Interpolates a part's S-parameters onto a frequency plan.
 *
 * Method: for a plan frequency f between data frequencies f0 < f1, every S entry is
 * (1 − w)·S(f0) + w·S(f1) with w = (f − f0)/(f1 − f0), applied to real and imaginary parts separately.
 * Plan points equal to a data frequency get that data point's values exactly; "equal" and "outside the data" are
 * decided with the engine's one relative tolerance FREQUENCY_TOLERANCE (1e-12), so that 4.1e9 from a plan and
 * 4.1 GHz from a file are the same point whichever route rounded them.
 *
 * Shapes: `s` has `from.length` frequencies (Hz, strictly increasing); `to` is the plan (Hz, any order,
 * O(nf + m) when increasing). Plan points outside [from[0], from[last]] raise EngineInputError naming the part,
 * the plan range and the data range, unless `extrapolate` is "hold": then the nearest edge value is held
 * and the counts are returned so that the caller can warn.
 *
 * @example
 * const s = { n: 1, nf: 2, data: new Float64Array([0, 0, 1, 1]) };
 * interpolateS(s, new Float64Array([1e9, 2e9]), new Float64Array([1.5e9]), { name: "ANT" }).s.data;
 * // Float64Array [0.5, 0.5]
 */
export function interpolateS(s: SData, from: Float64Array, to: Float64Array, opts: InterpolateOptions): InterpolateResult {
  const name = opts.name;
  const n = s.n;
  const nf = from.length;
  const stride = 2 * n * n;
  if (nf === 0) throw new EngineInputError(name, "the part has no frequency points");
  if (s.nf !== nf || s.data.length !== nf * stride) {
    throw new EngineInputError(name, `S data has ${s.nf} frequencies but ${nf} frequency values were given`);
  }
  for (let k = 0; k < nf; k++) {
    if (!Number.isFinite(from[k]) || (k > 0 && !(from[k] > from[k - 1]))) {
      throw new EngineInputError(name, `data frequencies must be finite and strictly increasing (point ${k + 1}: ${from[k]} Hz)`);
    }
  }
  const m = to.length;
  for (let i = 0; i < m; i++) {
    if (!Number.isFinite(to[i])) throw new EngineInputError(name, `plan frequency ${i + 1} is not finite (${to[i]})`);
  }
  const lo = from[0];
  const hi = from[nf - 1];
  // coverage edges widened by the tolerance: a plan point this close to an edge takes the edge's values
  const loT = lo - Math.abs(lo) * FREQUENCY_TOLERANCE;
  const hiT = hi + Math.abs(hi) * FREQUENCY_TOLERANCE;
  let below = 0;
  let above = 0;
  let planMin = Infinity;
  let planMax = -Infinity;
  for (let i = 0; i < m; i++) {
    const f = to[i];
    if (f < loT) below++;
    if (f > hiT) above++;
    if (f < planMin) planMin = f;
    if (f > planMax) planMax = f;
  }
  if ((below > 0 || above > 0) && opts.extrapolate !== "hold") {
    throw new EngineInputError(
      name,
      `the frequency plan spans ${formatHz(planMin, 10)} to ${formatHz(planMax, 10)} but part "${name}" has data only from ` +
        `${formatHz(lo, 10)} to ${formatHz(hi, 10)} (plan points: ${below} below, ${above} above); ` +
        `extend the data, narrow the plan, or allow holding the edge values (extrapolate: "hold")`,
    );
  }

  const src = s.data;
  const out = new Float64Array(m * stride);
  let seg = 0; // data interval [from[seg], from[seg + 1]] of the previous plan point
  let interpolated = 0;
  for (let i = 0; i < m; i++) {
    const f = to[i];
    const o = i * stride;
    if (f <= lo || sameFrequency(f, lo)) {
      copyPoint(out, o, src, 0, stride);
      continue;
    }
    if (f >= hi || sameFrequency(f, hi)) {
      copyPoint(out, o, src, (nf - 1) * stride, stride);
      continue;
    }
    // Moving pointer for increasing plans; binary search when the plan steps back.
    if (f < from[seg]) seg = searchInterval(from, f);
    while (from[seg + 1] < f) seg++;
    const f0 = from[seg];
    const f1 = from[seg + 1];
    if (sameFrequency(f, f1)) {
      copyPoint(out, o, src, (seg + 1) * stride, stride);
      continue;
    }
    if (sameFrequency(f, f0)) {
      copyPoint(out, o, src, seg * stride, stride);
      continue;
    }
    interpolated++;
    const w = (f - f0) / (f1 - f0);
    const v = 1 - w;
    const a = seg * stride;
    const b = a + stride;
    for (let q = 0; q < stride; q++) out[o + q] = v * src[a + q] + w * src[b + q];
  }
  return { s: { n, nf: m, data: out }, extrapolated: { below, above }, interpolated };
}

function copyPoint(out: Float64Array, o: number, src: Float64Array, a: number, stride: number): void {
  for (let q = 0; q < stride; q++) out[o + q] = src[a + q];
}

/** Largest k with from[k] ≤ f, for from[0] < f < from[last]. */
function searchInterval(from: Float64Array, f: number): number {
  let lo = 0;
  let hi = from.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >>> 1;
    if (from[mid] <= f) lo = mid;
    else hi = mid;
  }
  return lo;
}
