// Dense linear solve by LU with partial pivoting plus a Hager–Higham 1-norm condition estimate.

import { SingularSystemError } from "../types";
import { conditionEstimate1, norm1 } from "./condition";
import { luFactorUnchecked, luSolve } from "./lu";

/** Above this 1-norm condition estimate a solve is treated as singular (about 1/ε of binary64). */
export const SINGULAR_CONDITION = 2 ** 52;

/**
 * Solve A·X = B for a dense complex n×n matrix and n×nrhs right-hand sides (row-major, interleaved).
 * `a` is not modified.
 *
 * @param out destination n×nrhs; may alias `b`
 * @returns the solution (`out`) and the 1-norm condition estimate of A
 * @throws SingularSystemError when a pivot is zero or the condition estimate reaches 2^52
 * @example solveLinear(new Float64Array(2), Float64Array.of(2, 0), 1, Float64Array.of(4, 0), 1).x // [2, 0]
 */
export function solveLinear(out: Float64Array, a: Float64Array, n: number, b: Float64Array, nrhs: number): { x: Float64Array; condition: number } {
  const lu = a.slice(0, 2 * n * n);
  const piv = new Int32Array(n);
  const anorm = norm1(lu, n);
  const bad = luFactorUnchecked(lu, n, piv);
  if (bad >= 0) throw new SingularSystemError(`singular matrix: zero pivot in column ${bad + 1} of ${n}`);
  const condition = conditionEstimate1(anorm, lu, n, piv);
  if (!(condition < SINGULAR_CONDITION)) throw new SingularSystemError(`singular matrix: condition estimate ${condition.toExponential(2)}`);
  if (out !== b) out.set(b.subarray(0, 2 * n * nrhs));
  luSolve(lu, n, piv, out, nrhs);
  return { x: out, condition };
}

// Pivot rows of the last solveComplexInPlace, kept between calls (callers solve once per frequency).
let pivots = new Int32Array(8);

/**
 * Solves A·X = B in place with the LU of {@link luFactorUnchecked} (Golub and Van Loan 3.4.1), for callers
 * that raise their own named error because only they know the frequency and the part involved (the
 * renormalisation, the Touchstone reader's Z/Y → S conversion).
 *
 * Shapes: `a` is n×n, `b` is n×m, both row-major with interleaved re/im. On return `a` holds the LU factors
 * and `b` holds X. Returns false, with `b` partly overwritten, when a pivot of U is not above
 * 64 · ε · max|A| (singular or numerically singular) or the solution is not finite.
 *
 * @example
 * const a = new Float64Array([2, 0]); const b = new Float64Array([4, 2]);
 * solveComplexInPlace(a, b, 1, 1); // true, b = [2, 1]: (4 + 2j) / 2
 */
export function solveComplexInPlace(a: Float64Array, b: Float64Array, n: number, m: number): boolean {
  let scale = 0;
  for (let p = 0; p < 2 * n * n; p += 2) {
    const mag = Math.hypot(a[p], a[p + 1]);
    if (mag > scale) scale = mag;
  }
  if (!(scale > 0) || !Number.isFinite(scale)) return false;
  if (pivots.length < n) pivots = new Int32Array(n);
  if (luFactorUnchecked(a, n, pivots) >= 0) return false;
  // relative threshold: a pivot lost in the rounding of the largest entry means a singular matrix
  const tiny = 64 * Number.EPSILON * scale;
  for (let k = 0; k < n; k++) if (!(Math.hypot(a[2 * (k * n + k)], a[2 * (k * n + k) + 1]) > tiny)) return false;
  luSolve(a, n, pivots, b, m);
  for (let p = 0; p < 2 * n * m; p++) if (!Number.isFinite(b[p])) return false;
  return true;
}
