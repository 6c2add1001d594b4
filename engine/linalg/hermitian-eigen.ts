// Eigenvalues of a Hermitian matrix: Householder reduction to tridiagonal form, then bisection with Sturm
// sequence counts (Golub and Van Loan, Matrix Computations, 4th ed., Algorithm 8.3.1 and §8.4.1,
// "from memory"). O(n³) with a small constant, deterministic, accurate to about ε·‖H‖.

import { cabs } from "../complex";

let work = new Float64Array(0);

/**
 * Reduce the Hermitian `h` to a real symmetric tridiagonal matrix with the same eigenvalues.
 *
 * @param d out: diagonal, length n
 * @param e2 out: squared moduli of the off-diagonal, length n (e2[i] couples i and i + 1; e2[n − 1] = 0)
 * @param h Hermitian n×n (row-major, interleaved); not modified
 * @example hermitianTridiagonal(d, e2, h, n); // then count eigenvalues with Sturm sequences
 */
export function hermitianTridiagonal(d: Float64Array, e2: Float64Array, h: Float64Array, n: number): void {
  const nn = 2 * n * n;
  if (work.length < nn + 4 * n) work = new Float64Array(nn + 4 * n);
  const a = work.subarray(0, nn);
  a.set(h.subarray(0, nn));
  const u = work.subarray(nn, nn + 2 * n);
  const p = work.subarray(nn + 2 * n, nn + 4 * n);
  for (let k = 0; k < n - 2; k++) {
    // x = A[k+1.., k]; reflect it onto −e^{j·arg x0}·‖x‖·e1
    let norm = 0;
    let scale = 0;
    for (let i = k + 1; i < n; i++) scale = Math.max(scale, Math.abs(a[2 * (i * n + k)]), Math.abs(a[2 * (i * n + k) + 1]));
    if (scale === 0) {
      e2[k] = 0;
      continue;
    }
    for (let i = k + 1; i < n; i++) {
      const xr = a[2 * (i * n + k)] / scale;
      const xi = a[2 * (i * n + k) + 1] / scale;
      norm += xr * xr + xi * xi;
    }
    norm = Math.sqrt(norm) * scale;
    const x0r = a[2 * ((k + 1) * n + k)];
    const x0i = a[2 * ((k + 1) * n + k) + 1];
    const x0m = cabs(x0r, x0i);
    const pr = x0m > 0 ? x0r / x0m : 1;
    const pi = x0m > 0 ? x0i / x0m : 0;
    // u = (x − α e1)·√2/‖x − α e1‖ with α = −phase·‖x‖, so that I − u uᴴ is the reflector
    for (let i = k + 1; i < n; i++) {
      u[2 * i] = a[2 * (i * n + k)];
      u[2 * i + 1] = a[2 * (i * n + k) + 1];
    }
    u[2 * (k + 1)] += pr * norm;
    u[2 * (k + 1) + 1] += pi * norm;
    let vn = 0;
    for (let i = k + 1; i < n; i++) vn += u[2 * i] * u[2 * i] + u[2 * i + 1] * u[2 * i + 1];
    e2[k] = norm * norm;
    if (vn === 0) continue;
    const f = Math.SQRT2 / Math.sqrt(vn);
    for (let i = k + 1; i < n; i++) {
      u[2 * i] *= f;
      u[2 * i + 1] *= f;
    }
    // p = A22·u, K = (uᴴ p)/2, q = p − K·u, A22 ← A22 − u qᴴ − q uᴴ
    let kk = 0;
    for (let i = k + 1; i < n; i++) {
      let sr = 0;
      let si = 0;
      for (let j = k + 1; j < n; j++) {
        const ar = a[2 * (i * n + j)];
        const ai = a[2 * (i * n + j) + 1];
        sr += ar * u[2 * j] - ai * u[2 * j + 1];
        si += ar * u[2 * j + 1] + ai * u[2 * j];
      }
      p[2 * i] = sr;
      p[2 * i + 1] = si;
      kk += u[2 * i] * sr + u[2 * i + 1] * si; // Re(conj(u_i)·p_i)
    }
    kk /= 2;
    for (let i = k + 1; i < n; i++) {
      p[2 * i] -= kk * u[2 * i];
      p[2 * i + 1] -= kk * u[2 * i + 1];
    }
    for (let i = k + 1; i < n; i++) {
      const uir = u[2 * i];
      const uii = u[2 * i + 1];
      const qir = p[2 * i];
      const qii = p[2 * i + 1];
      for (let j = k + 1; j < n; j++) {
        // u_i·conj(q_j) + q_i·conj(u_j)
        const ujr = u[2 * j];
        const uji = u[2 * j + 1];
        const qjr = p[2 * j];
        const qji = p[2 * j + 1];
        a[2 * (i * n + j)] -= uir * qjr + uii * qji + qir * ujr + qii * uji;
        a[2 * (i * n + j) + 1] -= uii * qjr - uir * qji + qii * ujr - qir * uji;
      }
    }
  }
  for (let i = 0; i < n; i++) d[i] = a[2 * (i * n + i)];
  if (n >= 2) {
    const r = a[2 * ((n - 1) * n + n - 2)];
    const im = a[2 * ((n - 1) * n + n - 2) + 1];
    e2[n - 2] = r * r + im * im;
  }
  if (n >= 1) e2[n - 1] = 0;
}

/** Number of eigenvalues of the tridiagonal (d, e2) below x (Sturm sequence). */
function countBelow(d: Float64Array, e2: Float64Array, n: number, x: number, tiny: number): number {
  let count = 0;
  let q = 1;
  for (let i = 0; i < n; i++) {
    q = d[i] - x - (i > 0 ? e2[i - 1] / q : 0);
    if (q === 0) q = -tiny;
    if (q < 0) count++;
  }
  return count;
}

/** The i-th smallest eigenvalue (0-based) of the tridiagonal (d, e2) by bisection. */
function bisect(d: Float64Array, e2: Float64Array, n: number, i: number, lo0: number, hi0: number): number {
  let lo = lo0;
  let hi = hi0;
  const tiny = Number.MIN_VALUE * 1e10 + 1e-300;
  for (let it = 0; it < 200; it++) {
    const mid = 0.5 * (lo + hi);
    if (mid <= lo || mid >= hi) break;
    if (hi - lo <= 2 * Number.EPSILON * Math.max(Math.abs(lo), Math.abs(hi))) break;
    if (countBelow(d, e2, n, mid, tiny) > i) hi = mid;
    else lo = mid;
  }
  return 0.5 * (lo + hi);
}

function gershgorin(d: Float64Array, e2: Float64Array, n: number): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < n; i++) {
    const r = (i > 0 ? Math.sqrt(e2[i - 1]) : 0) + (i < n - 1 ? Math.sqrt(e2[i]) : 0);
    lo = Math.min(lo, d[i] - r);
    hi = Math.max(hi, d[i] + r);
  }
  const pad = 4 * Number.EPSILON * Math.max(Math.abs(lo), Math.abs(hi)) + 1e-300;
  return [lo - pad, hi + pad];
}

/**
 * Eigenvalues of the n×n Hermitian matrix `h` (row-major, interleaved re/im), ascending.
 * The matrix is assumed Hermitian: the lower triangle is read for the reduction; `h` is not modified.
 *
 * @param out destination, length ≥ n (real eigenvalues, ascending)
 * @param h Hermitian matrix, length 2·n·n
 * @param n order
 * @returns out
 * @example hermitianEigenvalues(new Float64Array(2), Float64Array.of(2, 0, 0, 1, 0, -1, 2, 0), 2) // [1, 3]
 */
export function hermitianEigenvalues(out: Float64Array, h: Float64Array, n: number): Float64Array {
  if (n === 0) return out;
  const d = new Float64Array(n);
  const e2 = new Float64Array(n);
  hermitianTridiagonal(d, e2, h, n);
  const [lo, hi] = gershgorin(d, e2, n);
  for (let i = 0; i < n; i++) out[i] = bisect(d, e2, n, i, lo, hi);
  return out;
}

/**
 * The largest eigenvalue of the n×n Hermitian matrix `h` (one bisection instead of n).
 *
 * @example largestHermitianEigenvalue(Float64Array.of(2, 0, 0, 1, 0, -1, 2, 0), 2) // 3
 */
export function largestHermitianEigenvalue(h: Float64Array, n: number): number {
  if (n === 0) return -Infinity;
  const d = new Float64Array(n);
  const e2 = new Float64Array(n);
  hermitianTridiagonal(d, e2, h, n);
  const [lo, hi] = gershgorin(d, e2, n);
  return bisect(d, e2, n, n - 1, lo, hi);
}
