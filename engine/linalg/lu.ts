// LU factorisation with partial pivoting (Golub and Van Loan, Matrix Computations, 4th ed., Algorithm 3.4.1,
// "from memory"), complex, in place; row interchanges recorded LAPACK-style (piv[k] = row swapped with k).

import { SingularSystemError } from "../types";

/**
 * Factor the n×n complex matrix `a` (row-major, interleaved re/im, starting at `offset`) in place as
 * P·A = L·U (L unit lower, U upper). Never throws: returns the first column whose pivot is exactly zero
 * or not finite, or −1 when every pivot is usable.
 *
 * @param a matrix storage, overwritten by L (below the diagonal) and U
 * @param n order
 * @param piv length ≥ n; piv[k] = the row exchanged with row k at step k
 * @param offset index in `a` of the real part of element (0, 0)
 * @returns −1 on success, else the failing column
 * @example const piv = new Int32Array(1); luFactorUnchecked(Float64Array.of(2, 0), 1, piv) // −1
 */
export function luFactorUnchecked(a: Float64Array, n: number, piv: Int32Array, offset = 0): number {
  let bad = -1;
  const o = offset;
  for (let k = 0; k < n; k++) {
    // pivot search: largest |re| + |im| (LAPACK's cabs1) in column k
    let p = k;
    let best = -1;
    for (let i = k; i < n; i++) {
      const idx = o + 2 * (i * n + k);
      const v = Math.abs(a[idx]) + Math.abs(a[idx + 1]);
      if (v > best) {
        best = v;
        p = i;
      }
    }
    piv[k] = p;
    if (!(best > 0) || !Number.isFinite(best)) {
      if (bad < 0) bad = k;
      continue;
    }
    if (p !== k) {
      const rk = o + 2 * k * n;
      const rp = o + 2 * p * n;
      for (let j = 0; j < 2 * n; j++) {
        const t = a[rk + j];
        a[rk + j] = a[rp + j];
        a[rp + j] = t;
      }
    }
    const dk = o + 2 * (k * n + k);
    const pr = a[dk];
    const pi = a[dk + 1];
    // 1 / pivot by Smith's algorithm
    let ir: number, ii: number;
    if (Math.abs(pr) >= Math.abs(pi)) {
      const r = pi / pr;
      const d = pr + pi * r;
      ir = 1 / d;
      ii = -r / d;
    } else {
      const r = pr / pi;
      const d = pi + pr * r;
      ir = r / d;
      ii = -1 / d;
    }
    for (let i = k + 1; i < n; i++) {
      const ik = o + 2 * (i * n + k);
      const xr = a[ik];
      const xi = a[ik + 1];
      const lr = xr * ir - xi * ii;
      const li = xr * ii + xi * ir;
      a[ik] = lr;
      a[ik + 1] = li;
      if (lr === 0 && li === 0) continue;
      const ri = o + 2 * i * n;
      const rk = o + 2 * k * n;
      for (let j = k + 1; j < n; j++) {
        const ur = a[rk + 2 * j];
        const ui = a[rk + 2 * j + 1];
        a[ri + 2 * j] -= lr * ur - li * ui;
        a[ri + 2 * j + 1] -= lr * ui + li * ur;
      }
    }
  }
  return bad;
}

/**
 * Factor in place like {@link luFactorUnchecked}, but throw SingularSystemError on an exactly zero pivot.
 *
 * @throws SingularSystemError when a pivot is zero or not finite
 * @example const piv = new Int32Array(2); luFactor(Float64Array.of(0, 0, 1, 0, 1, 0, 0, 0), 2, piv); // swaps rows
 */
export function luFactor(a: Float64Array, n: number, piv: Int32Array, offset = 0): Float64Array {
  const bad = luFactorUnchecked(a, n, piv, offset);
  if (bad >= 0) throw new SingularSystemError(`singular matrix: zero pivot in column ${bad + 1} of ${n}`);
  return a;
}

/**
 * Solve A·X = B in place over `b` (n×nrhs, row-major interleaved) using the factors from luFactor.
 *
 * @param lu factors from luFactor (storage at `luOffset`)
 * @param n order
 * @param piv pivots from luFactor
 * @param b right-hand sides, overwritten by the solution (storage at `bOffset`)
 * @param nrhs number of right-hand sides (columns of b)
 * @returns b
 * @example
 * const a = Float64Array.of(2, 0), piv = new Int32Array(1);
 * luFactor(a, 1, piv); luSolve(a, 1, piv, Float64Array.of(4, 2), 1) // [2, 1]
 */
export function luSolve(lu: Float64Array, n: number, piv: Int32Array, b: Float64Array, nrhs: number, luOffset = 0, bOffset = 0): Float64Array {
  const o = luOffset;
  const w = 2 * nrhs;
  for (let k = 0; k < n; k++) {
    const p = piv[k];
    if (p !== k) {
      const rk = bOffset + k * w;
      const rp = bOffset + p * w;
      for (let j = 0; j < w; j++) {
        const t = b[rk + j];
        b[rk + j] = b[rp + j];
        b[rp + j] = t;
      }
    }
  }
  // forward substitution with unit L
  for (let i = 1; i < n; i++) {
    const ri = bOffset + i * w;
    for (let k = 0; k < i; k++) {
      const lr = lu[o + 2 * (i * n + k)];
      const li = lu[o + 2 * (i * n + k) + 1];
      if (lr === 0 && li === 0) continue;
      const rk = bOffset + k * w;
      for (let j = 0; j < w; j += 2) {
        const xr = b[rk + j];
        const xi = b[rk + j + 1];
        b[ri + j] -= lr * xr - li * xi;
        b[ri + j + 1] -= lr * xi + li * xr;
      }
    }
  }
  // back substitution with U
  for (let i = n - 1; i >= 0; i--) {
    const ri = bOffset + i * w;
    for (let k = i + 1; k < n; k++) {
      const ur = lu[o + 2 * (i * n + k)];
      const ui = lu[o + 2 * (i * n + k) + 1];
      if (ur === 0 && ui === 0) continue;
      const rk = bOffset + k * w;
      for (let j = 0; j < w; j += 2) {
        const xr = b[rk + j];
        const xi = b[rk + j + 1];
        b[ri + j] -= ur * xr - ui * xi;
        b[ri + j + 1] -= ur * xi + ui * xr;
      }
    }
    const pr = lu[o + 2 * (i * n + i)];
    const pi = lu[o + 2 * (i * n + i) + 1];
    let ir: number, ii: number;
    if (Math.abs(pr) >= Math.abs(pi)) {
      const r = pi / pr;
      const d = pr + pi * r;
      ir = 1 / d;
      ii = -r / d;
    } else {
      const r = pr / pi;
      const d = pi + pr * r;
      ir = r / d;
      ii = -1 / d;
    }
    for (let j = 0; j < w; j += 2) {
      const xr = b[ri + j];
      const xi = b[ri + j + 1];
      b[ri + j] = xr * ir - xi * ii;
      b[ri + j + 1] = xr * ii + xi * ir;
    }
  }
  return b;
}

/**
 * Solve Aᴴ·x = b in place over the vector `b` (length n, interleaved) using the factors of A.
 *
 * @returns b
 * @example
 * const a = Float64Array.of(0, 2), piv = new Int32Array(1);
 * luFactor(a, 1, piv); luSolveConjTranspose(a, 1, piv, Float64Array.of(2, 0)) // (−2j)·x = 2 → x = j
 */
export function luSolveConjTranspose(lu: Float64Array, n: number, piv: Int32Array, b: Float64Array, luOffset = 0): Float64Array {
  const o = luOffset;
  // Aᴴ = Uᴴ Lᴴ P: solve Uᴴ w = b (forward), Lᴴ v = w (backward), x = Pᵀ v
  for (let i = 0; i < n; i++) {
    let sr = b[2 * i];
    let si = b[2 * i + 1];
    for (let k = 0; k < i; k++) {
      const ur = lu[o + 2 * (k * n + i)];
      const ui = -lu[o + 2 * (k * n + i) + 1];
      const xr = b[2 * k];
      const xi = b[2 * k + 1];
      sr -= ur * xr - ui * xi;
      si -= ur * xi + ui * xr;
    }
    const pr = lu[o + 2 * (i * n + i)];
    const pi = -lu[o + 2 * (i * n + i) + 1];
    if (Math.abs(pr) >= Math.abs(pi)) {
      const r = pi / pr;
      const d = pr + pi * r;
      b[2 * i] = (sr + si * r) / d;
      b[2 * i + 1] = (si - sr * r) / d;
    } else {
      const r = pr / pi;
      const d = pi + pr * r;
      b[2 * i] = (sr * r + si) / d;
      b[2 * i + 1] = (si * r - sr) / d;
    }
  }
  for (let i = n - 1; i >= 0; i--) {
    let sr = b[2 * i];
    let si = b[2 * i + 1];
    for (let k = i + 1; k < n; k++) {
      const lr = lu[o + 2 * (k * n + i)];
      const li = -lu[o + 2 * (k * n + i) + 1];
      const xr = b[2 * k];
      const xi = b[2 * k + 1];
      sr -= lr * xr - li * xi;
      si -= lr * xi + li * xr;
    }
    b[2 * i] = sr;
    b[2 * i + 1] = si;
  }
  for (let k = n - 1; k >= 0; k--) {
    const p = piv[k];
    if (p !== k) {
      const tr = b[2 * k];
      const ti = b[2 * k + 1];
      b[2 * k] = b[2 * p];
      b[2 * k + 1] = b[2 * p + 1];
      b[2 * p] = tr;
      b[2 * p + 1] = ti;
    }
  }
  return b;
}
