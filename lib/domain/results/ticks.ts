/**
 * Axis ticks at round values: steps of 1, 2 or 5 times a power of ten, the usual "nice numbers" method
 * (Heckbert, "Nice numbers for graph labels", Graphics Gems, 1990; common practice). The trace plot and
 * the part page's plots place their grid lines and labels with these.
 */

/** The 1-2-5 mantissas a step may have. */
const MANTISSAS = [1, 2, 5] as const;

export type Ticks = {
  /** the axis range the ticks belong to (for `niceScale`, widened to the outer ticks) */
  min: number;
  max: number;
  /** distance between neighbouring ticks, 1, 2 or 5 × 10^n */
  step: number;
  /** tick values, increasing, each a whole multiple of `step` */
  ticks: number[];
};

/** Decimals that write a multiple of `step` exactly (0 for steps of 1 and above). */
export function stepDecimals(step: number): number {
  return Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
}

/** k·step, rounded to the step's decimals so that 0.1 + 0.2 reads 0.3. */
function multiple(k: number, step: number): number {
  const v = Number((k * step).toFixed(stepDecimals(step)));
  return Object.is(v, -0) ? 0 : v;
}

/** The 1-2-5 steps from the smallest that could fit `maxCount` ticks over `span`, increasing. */
function candidateSteps(span: number, maxCount: number, minStep: number): number[] {
  const rough = Math.max(span / Math.max(1, maxCount - 1), minStep, Number.MIN_VALUE);
  const base = 10 ** Math.floor(Math.log10(rough));
  const out: number[] = [];
  for (const p of [base / 10, base, base * 10, base * 100]) for (const m of MANTISSAS) if (m * p >= minStep) out.push(m * p);
  return out.sort((a, b) => a - b);
}

/** A usable range when the data is one value (or nothing): one unit either side, or 10 % of it. */
function widen(lo: number, hi: number): [number, number] {
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return [0, 1];
  if (hi > lo) return [lo, hi];
  const d = lo === 0 ? 1 : Math.abs(lo) * 0.1;
  return [lo - d, hi + d];
}

/**
 * Ticks that cover [lo, hi] ("loose" labelling): the range widens to the multiples of the step just
 * outside it, with the smallest 1-2-5 step that keeps the count at most `maxCount` (and at least 2).
 * @param minStep - the smallest step allowed, e.g. 1 so that dB ticks fall on whole dB
 * @example niceScale(-43.2, -3.1, 6) // { min: -50, max: 0, step: 10, ticks: [-50, -40, -30, -20, -10, 0] }
 */
export function niceScale(lo: number, hi: number, maxCount = 7, minStep = 0): Ticks {
  const [a, b] = widen(Math.min(lo, hi), Math.max(lo, hi));
  const count = Math.max(2, Math.floor(maxCount));
  for (const step of candidateSteps(b - a, count, minStep)) {
    const first = Math.floor(a / step + 1e-9);
    const last = Math.ceil(b / step - 1e-9);
    if (last - first + 1 <= count) {
      const ticks = Array.from({ length: last - first + 1 }, (_, k) => multiple(first + k, step));
      return { min: ticks[0], max: ticks[ticks.length - 1], step, ticks };
    }
  }
  // not reached: the largest candidate is 1000× the rough step
  return { min: a, max: b, step: b - a, ticks: [a, b] };
}

/**
 * Ticks inside [lo, hi], which stays as it is (a frequency axis spans the plan exactly): the smallest
 * 1-2-5 step that gives at most `maxCount` ticks in the range; at least 2 ticks when the range is not
 * a single value.
 * @example ticksWithin(2.3e9, 2.6e9, 6) // step 5e7: 2.3, 2.35 … 2.6 GHz
 */
export function ticksWithin(lo: number, hi: number, maxCount = 7, minStep = 0): Ticks {
  const [a, b] = widen(Math.min(lo, hi), Math.max(lo, hi));
  const count = Math.max(2, Math.floor(maxCount));
  const steps = candidateSteps(b - a, count, minStep);
  for (const step of steps) {
    const first = Math.ceil(a / step - 1e-9);
    const last = Math.floor(b / step + 1e-9);
    const n = last - first + 1;
    if (n <= count) {
      // a step so large that fewer than two ticks fit is no use: keep the previous, finer one
      if (n < 2) break;
      return { min: a, max: b, step, ticks: Array.from({ length: n }, (_, k) => multiple(first + k, step)) };
    }
  }
  // a range narrower than any step that gives two ticks inside: its ends are the ticks
  return { min: a, max: b, step: b - a, ticks: [a, b] };
}
