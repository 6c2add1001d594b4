// Largest singular value as the square root of the largest eigenvalue of SᴴS (Golub and Van Loan,
// Matrix Computations, 4th ed., §2.4 and §8.6, "from memory"), eigenvalues by tridiagonal reduction and
// bisection.

import type { SData } from "../types";
import { hermitianEigenvalues, largestHermitianEigenvalue } from "./hermitian-eigen";
import { complexMatmulConjA } from "./matmul";

/**
 * Copy the n×n matrix of frequency index k out of an S stack.
 *
 * @returns a new Float64Array of length 2·n·n
 * @example sliceFrequency({ n: 1, nf: 2, data: Float64Array.of(1, 0, 2, 0) }, 1) // [2, 0]
 */
export function sliceFrequency(s: SData, k: number): Float64Array {
  const nn = 2 * s.n * s.n;
  return s.data.slice(k * nn, (k + 1) * nn);
}

/**
 * Singular values of an n×n complex matrix, descending (from the eigenvalues of MᴴM; relative accuracy
 * of the small ones is limited to about ε·σ_max²/σ).
 *
 * @param m matrix, row-major interleaved, length 2·n·n
 * @returns n singular values, descending
 * @example singularValues(Float64Array.of(0, 0, 2, 0, 1, 0, 0, 0), 2) // [2, 1]
 */
export function singularValues(m: Float64Array, n: number): Float64Array {
  const g = complexMatmulConjA(new Float64Array(2 * n * n), m, m, n, n, n);
  const ev = hermitianEigenvalues(new Float64Array(n), g, n);
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = Math.sqrt(Math.max(0, ev[n - 1 - i]));
  return out;
}

/**
 * Largest singular value of S at frequency index k (≤ 1 for a passive network).
 *
 * @param s S stack
 * @param k frequency index, 0 ≤ k < s.nf
 * @returns σ_max (dimensionless)
 * @example maxSingularValue({ n: 1, nf: 1, data: Float64Array.of(0.6, 0.8) }, 0) // 1
 */
export function maxSingularValue(s: SData, k: number): number {
  const n = s.n;
  if (n === 0) return 0;
  const m = s.data.subarray(2 * k * n * n, 2 * (k + 1) * n * n);
  const g = complexMatmulConjA(new Float64Array(2 * n * n), m, m, n, n, n);
  return Math.sqrt(Math.max(0, largestHermitianEigenvalue(g, n)));
}
