// 1-norm condition estimate by Hager's method as refined by Higham (N. J. Higham, "FORTRAN codes for
// estimating the one-norm of a real or complex matrix", ACM TOMS 14(4), 1988 — the LAPACK xLACON scheme).

import { cabs } from "../complex";
import { luSolve, luSolveConjTranspose } from "./lu";

/**
 * 1-norm of an n×n complex matrix (largest column sum of moduli).
 *
 * @example norm1(Float64Array.of(3, 4), 1) // 5
 */
export function norm1(a: Float64Array, n: number, offset = 0): number {
  let best = 0;
  for (let j = 0; j < n; j++) {
    let s = 0;
    for (let i = 0; i < n; i++) s += cabs(a[offset + 2 * (i * n + j)], a[offset + 2 * (i * n + j) + 1]);
    if (s > best || Number.isNaN(s)) best = s;
  }
  return best;
}

/**
 * Estimate κ₁(A) = ‖A‖₁·‖A⁻¹‖₁ from the LU factors of A (never smaller than the true value by more than a
 * small factor in practice; exact for n = 1 and usually exact for small n).
 *
 * @param anorm ‖A‖₁ of the original matrix (compute with norm1 before factoring)
 * @param lu factors from luFactor
 * @param n order
 * @param piv pivots from luFactor
 * @param work scratch of length ≥ 4n (allocated when omitted)
 * @returns the estimate (dimensionless, ≥ 1 for a non-singular matrix)
 * @example
 * const a = Float64Array.of(1, 0, 0, 0, 0, 0, 1e-8, 0), piv = new Int32Array(2);
 * const an = norm1(a, 2); luFactor(a, 2, piv); conditionEstimate1(an, a, 2, piv) // ≈ 1e8
 */
export function conditionEstimate1(anorm: number, lu: Float64Array, n: number, piv: Int32Array, work?: Float64Array, luOffset = 0): number {
  const w = work && work.length >= 4 * n ? work : new Float64Array(4 * n);
  const x = w.subarray(0, 2 * n);
  const z = w.subarray(2 * n, 4 * n);
  const sum1 = (v: Float64Array) => {
    let s = 0;
    for (let i = 0; i < n; i++) s += cabs(v[2 * i], v[2 * i + 1]);
    return s;
  };
  for (let i = 0; i < n; i++) {
    x[2 * i] = 1 / n;
    x[2 * i + 1] = 0;
  }
  luSolve(lu, n, piv, x, 1, luOffset);
  let est = sum1(x);
  if (n > 1) {
    let jPrev = -1;
    for (let iter = 0; iter < 5; iter++) {
      for (let i = 0; i < n; i++) {
        const m = cabs(x[2 * i], x[2 * i + 1]);
        z[2 * i] = m > 0 ? x[2 * i] / m : 1;
        z[2 * i + 1] = m > 0 ? x[2 * i + 1] / m : 0;
      }
      luSolveConjTranspose(lu, n, piv, z, luOffset);
      let j = 0;
      let zmax = -1;
      for (let i = 0; i < n; i++) {
        const m = cabs(z[2 * i], z[2 * i + 1]);
        if (m > zmax) {
          zmax = m;
          j = i;
        }
      }
      if (j === jPrev) break;
      jPrev = j;
      for (let i = 0; i < 2 * n; i++) x[i] = 0;
      x[2 * j] = 1;
      luSolve(lu, n, piv, x, 1, luOffset);
      const next = sum1(x);
      if (next <= est) break;
      est = next;
    }
    // Higham's extra test vector guards against the cases where the iteration stalls
    for (let i = 0; i < n; i++) {
      x[2 * i] = (i % 2 === 0 ? 1 : -1) * (1 + i / (n - 1));
      x[2 * i + 1] = 0;
    }
    luSolve(lu, n, piv, x, 1, luOffset);
    const alt = (2 * sum1(x)) / (3 * n);
    if (alt > est) est = alt;
  }
  return anorm * est;
}
