/**
 * The one relative tolerance by which the engine decides that two frequencies are the same point: whether part
 * data covers the plan (interpolation and extrapolation), whether a plan point lies on a data point, and whether
 * a plan point lies inside a rule's band.
 *
 * 1e-12 is about 4 500 units in the last place of a double: far above the rounding that separates the same
 * decimal frequency reached by different routes (a plan step, a unit conversion, a value written and read back,
 * all within a few ulps), and far below the spacing of any real frequency grid (a 100 001-point plan over an
 * octave still steps by 1e-5 relative). Frequencies within it are one point; nothing is interpolated across it.
 */
export const FREQUENCY_TOLERANCE = 1e-12;

/**
 * Whether two frequencies (Hz) are the same point within FREQUENCY_TOLERANCE (relative to the larger).
 * @example sameFrequency(4.1e9, 4.1 * 1e9) // true (the product lands one ulp above 4.1e9)
 */
export function sameFrequency(a: number, b: number): boolean {
  return Math.abs(a - b) <= FREQUENCY_TOLERANCE * Math.max(Math.abs(a), Math.abs(b));
}

/**
 * Whether `f` lies in [lo, hi] (Hz), each edge widened by FREQUENCY_TOLERANCE relative to itself.
 * @example withinRange(2.4e9 * (1 - 1e-15), 2.4e9, 2.48e9) // true
 */
export function withinRange(f: number, lo: number, hi: number): boolean {
  return f >= lo - Math.abs(lo) * FREQUENCY_TOLERANCE && f <= hi + Math.abs(hi) * FREQUENCY_TOLERANCE;
}
