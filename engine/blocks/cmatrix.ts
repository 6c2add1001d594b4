/**
 * Small dense complex matrices for frequency-independent block models: one n×n matrix,
 * row-major, interleaved re/im (length 2n²), copied to every frequency of the plan.
 */
import type { SData } from "../types";

/**
 * A zero n×n complex matrix.
 *
 * @example
 * const m = zeroMatrix(2); // Float64Array(8)
 */
export function zeroMatrix(n: number): Float64Array {
  return new Float64Array(2 * n * n);
}

/**
 * Sets entry (i, j), 0-based, of an n×n complex matrix and returns the matrix.
 *
 * @example
 * setEntry(m, 2, 1, 0, 0.5, 0); // S21 = 0.5
 */
export function setEntry(m: Float64Array, n: number, i: number, j: number, re: number, im: number): Float64Array {
  const p = 2 * (i * n + j);
  m[p] = re;
  m[p + 1] = im;
  return m;
}

/**
 * Sets entries (i, j) and (j, i) to the same value (a reciprocal pair).
 *
 * @example
 * setPair(m, 2, 0, 1, 0.5, 0); // S12 = S21 = 0.5
 */
export function setPair(m: Float64Array, n: number, i: number, j: number, re: number, im: number): Float64Array {
  setEntry(m, n, i, j, re, im);
  return setEntry(m, n, j, i, re, im);
}

/**
 * Copies one n×n matrix to each of `nf` frequencies (SData layout [k][i][j], interleaved).
 *
 * @example
 * const s = broadcastMatrix(m, 2, 201); // s.data.length === 2 * 201 * 4
 */
export function broadcastMatrix(m: Float64Array, n: number, nf: number): SData {
  const block = 2 * n * n;
  const data = new Float64Array(block * nf);
  if (nf === 0) return { n, nf, data };
  // one copy of m, then doubling copies within the array: O(log nf) calls at memory speed instead of
  // nf small set() calls
  data.set(m.subarray(0, block), 0);
  for (let filled = block; filled < data.length; filled *= 2) data.copyWithin(filled, 0, Math.min(filled, data.length - filled));
  return { n, nf, data };
}
