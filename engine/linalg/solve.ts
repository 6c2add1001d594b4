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
