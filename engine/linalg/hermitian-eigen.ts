// Eigenvalues of a Hermitian matrix by the cyclic Jacobi method with a complex phase step (Jacobi 1846;
// rotation formulas as in Press et al., Numerical Recipes, 3rd ed., §11.1, "from memory", preceded by a
// diagonal unitary scaling that makes the pivot element real).

import { cabs } from "../complex";
/**
 * Eigenvalues of the n×n Hermitian matrix `h` (row-major, interleaved re/im), ascending.
 * Only the upper triangle and the diagonal are read; `h` is not modified.
 *
 * @param out destination, length ≥ n (real eigenvalues, ascending)
 * @param h Hermitian matrix, length 2·n·n
 * @param n order
 * @returns out
 * @example hermitianEigenvalues(new Float64Array(2), Float64Array.of(2, 0, 0, 1, 0, -1, 2, 0), 2) // [1, 3]
 */
export function hermitianEigenvalues(out: Float64Array, h: Float64Array, n: number): Float64Array {
  const a = h.slice(0, 2 * n * n);
  let total = 0;
  for (let i = 0; i < 2 * n * n; i++) total += a[i] * a[i];
  const tol = total * 1e-32;
  for (let sweep = 0; sweep < 60; sweep++) {
    let off = 0;
    for (let p = 0; p < n; p++)
      for (let q = p + 1; q < n; q++) off += a[2 * (p * n + q)] ** 2 + a[2 * (p * n + q) + 1] ** 2;
    if (!(off > tol)) break;
    for (let p = 0; p < n - 1; p++) {
      for (let q = p + 1; q < n; q++) {
        const hr = a[2 * (p * n + q)];
        const hi = a[2 * (p * n + q) + 1];
        const r = cabs(hr, hi);
        if (r === 0) continue;
        // phase e^{−jφ} applied to column q (and its conjugate to row q) makes the pivot real and equal to r
        const er = hr / r;
        const ei = -hi / r;
        const app = a[2 * (p * n + p)];
        const aqq = a[2 * (q * n + q)];
        const theta = (aqq - app) / (2 * r);
        const t = (theta >= 0 ? 1 : -1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < n; k++) {
          if (k === p || k === q) continue;
          // column entries A[k][p], A[k][q] (k-th row), then mirror to rows p, q
          const kpr = a[2 * (k * n + p)];
          const kpi = a[2 * (k * n + p) + 1];
          const kq0r = a[2 * (k * n + q)];
          const kq0i = a[2 * (k * n + q) + 1];
          const kqr = kq0r * er - kq0i * ei;
          const kqi = kq0r * ei + kq0i * er;
          const npr = c * kpr - s * kqr;
          const npi = c * kpi - s * kqi;
          const nqr = s * kpr + c * kqr;
          const nqi = s * kpi + c * kqi;
          a[2 * (k * n + p)] = npr;
          a[2 * (k * n + p) + 1] = npi;
          a[2 * (k * n + q)] = nqr;
          a[2 * (k * n + q) + 1] = nqi;
          a[2 * (p * n + k)] = npr;
          a[2 * (p * n + k) + 1] = -npi;
          a[2 * (q * n + k)] = nqr;
          a[2 * (q * n + k) + 1] = -nqi;
        }
        a[2 * (p * n + p)] = app - t * r;
        a[2 * (q * n + q)] = aqq + t * r;
        a[2 * (p * n + p) + 1] = 0;
        a[2 * (q * n + q) + 1] = 0;
        a[2 * (p * n + q)] = 0;
        a[2 * (p * n + q) + 1] = 0;
        a[2 * (q * n + p)] = 0;
        a[2 * (q * n + p) + 1] = 0;
      }
    }
  }
  for (let i = 0; i < n; i++) out[i] = a[2 * (i * n + i)];
  const v = Array.from(out.subarray(0, n)).sort((x, y) => x - y);
  for (let i = 0; i < n; i++) out[i] = v[i];
  return out;
}
