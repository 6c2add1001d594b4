// Complex matrix product C = A·B by the textbook triple loop (i-k-j order for contiguous inner access).

/**
 * Complex matrix product out = a · b for row-major interleaved re/im matrices.
 *
 * @param out destination, m×n (length ≥ 2·m·n); may alias `a` or `b` (a temporary is used then)
 * @param a m×k matrix
 * @param b k×n matrix
 * @param m rows of a
 * @param k columns of a = rows of b
 * @param n columns of b
 * @returns out
 * @example
 * // [[1, j]] · [[1], [j]] = [[0]]
 * complexMatmul(new Float64Array(2), Float64Array.of(1, 0, 0, 1), Float64Array.of(1, 0, 0, 1), 1, 2, 1);
 */
export function complexMatmul(out: Float64Array, a: Float64Array, b: Float64Array, m: number, k: number, n: number): Float64Array {
  const dst = out === a || out === b ? new Float64Array(2 * m * n) : out;
  for (let i = 0; i < 2 * m * n; i++) dst[i] = 0;
  for (let i = 0; i < m; i++) {
    const ci = 2 * i * n;
    for (let p = 0; p < k; p++) {
      const ar = a[2 * (i * k + p)];
      const ai = a[2 * (i * k + p) + 1];
      if (ar === 0 && ai === 0) continue;
      const bp = 2 * p * n;
      for (let j = 0; j < n; j++) {
        const br = b[bp + 2 * j];
        const bi = b[bp + 2 * j + 1];
        dst[ci + 2 * j] += ar * br - ai * bi;
        dst[ci + 2 * j + 1] += ar * bi + ai * br;
      }
    }
  }
  if (dst !== out) out.set(dst.subarray(0, 2 * m * n));
  return out;
}

/**
 * Conjugate-transpose product out = aᴴ · b (a is k×m, b is k×n, out is m×n), row-major interleaved.
 *
 * @param out destination m×n; may alias `a` or `b`
 * @returns out
 * @example complexMatmulConjA(new Float64Array(2), Float64Array.of(0, 1), Float64Array.of(0, 1), 1, 1, 1) // [1, 0]
 */
export function complexMatmulConjA(out: Float64Array, a: Float64Array, b: Float64Array, k: number, m: number, n: number): Float64Array {
  const dst = out === a || out === b ? new Float64Array(2 * m * n) : out;
  for (let i = 0; i < 2 * m * n; i++) dst[i] = 0;
  for (let p = 0; p < k; p++) {
    const bp = 2 * p * n;
    for (let i = 0; i < m; i++) {
      const ar = a[2 * (p * m + i)];
      const ai = -a[2 * (p * m + i) + 1];
      if (ar === 0 && ai === 0) continue;
      const ci = 2 * i * n;
      for (let j = 0; j < n; j++) {
        const br = b[bp + 2 * j];
        const bi = b[bp + 2 * j + 1];
        dst[ci + 2 * j] += ar * br - ai * bi;
        dst[ci + 2 * j + 1] += ar * bi + ai * br;
      }
    }
  }
  if (dst !== out) out.set(dst.subarray(0, 2 * m * n));
  return out;
}
