/**
 * Helpers for the block-model tests: complex arithmetic on [re, im] pairs, entry access in SData, and
 * an independent largest-singular-value routine (cyclic Jacobi eigenvalues of the real symmetric
 * embedding of SᴴS; Golub and Van Loan, Matrix Computations, 4th ed., sec. 8.5 — from memory), so the
 * passivity tests do not rely on the engine's own Cholesky test.
 */
import type { SData } from "@/engine/types";

export type C = [number, number];

export const c = (re: number, im = 0): C => [re, im];
export const add = (a: C, b: C): C => [a[0] + b[0], a[1] + b[1]];
export const sub = (a: C, b: C): C => [a[0] - b[0], a[1] - b[1]];
export const mul = (a: C, b: C): C => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
export const div = (a: C, b: C): C => {
  const d = b[0] * b[0] + b[1] * b[1];
  return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d];
};
export const abs = (a: C): number => Math.hypot(a[0], a[1]);
export const polar = (mag: number, deg: number): C => [mag * Math.cos((deg * Math.PI) / 180), mag * Math.sin((deg * Math.PI) / 180)];
export const argDeg = (a: C): number => (Math.atan2(a[1], a[0]) * 180) / Math.PI;
export const cexp = (a: C): C => polar(Math.exp(a[0]), (a[1] * 180) / Math.PI);
export const tan = (x: number): C => [Math.tan(x), 0];
/** tanh of a complex number: sinh z / cosh z */
export const ctanh = (z: C): C => {
  const e = cexp(z);
  const em = cexp([-z[0], -z[1]]);
  return div(sub(e, em), add(e, em));
};
export const db20 = (x: number): number => 20 * Math.log10(x);

/** S_ij (1-based ports, as in docs/blocks.md) at frequency index k */
export function entry(s: SData, k: number, i: number, j: number): C {
  const p = 2 * ((k * s.n + (i - 1)) * s.n + (j - 1));
  return [s.data[p], s.data[p + 1]];
}

/** the n×n matrix at frequency k, interleaved, row-major */
export function matrixAt(s: SData, k: number): Float64Array {
  const m = 2 * s.n * s.n;
  return s.data.slice(k * m, (k + 1) * m);
}

/** eigenvalues of a real symmetric matrix (row-major, size n) by cyclic Jacobi rotations */
export function symmetricEigenvalues(a0: Float64Array, n: number): number[] {
  const a = Float64Array.from(a0);
  for (let sweep = 0; sweep < 100; sweep++) {
    let off = 0;
    let diag = 0;
    for (let i = 0; i < n; i++) {
      diag += a[i * n + i] ** 2;
      for (let j = i + 1; j < n; j++) off += a[i * n + j] ** 2;
    }
    if (off <= 1e-34 * Math.max(diag, 1e-300)) break;
    for (let p = 0; p < n; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = a[p * n + q];
        if (apq === 0) continue;
        const theta = (a[q * n + q] - a[p * n + p]) / (2 * apq);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const cs = 1 / Math.sqrt(t * t + 1);
        const sn = t * cs;
        for (let k = 0; k < n; k++) {
          const akp = a[k * n + p];
          const akq = a[k * n + q];
          a[k * n + p] = cs * akp - sn * akq;
          a[k * n + q] = sn * akp + cs * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = a[p * n + k];
          const aqk = a[q * n + k];
          a[p * n + k] = cs * apk - sn * aqk;
          a[q * n + k] = sn * apk + cs * aqk;
        }
      }
    }
  }
  return Array.from({ length: n }, (_, i) => a[i * n + i]);
}

/** SᴴS of an n×n complex matrix (interleaved), as interleaved complex */
export function gram(m: Float64Array, n: number): Float64Array {
  const g = new Float64Array(2 * n * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) {
      let re = 0;
      let im = 0;
      for (let k = 0; k < n; k++) {
        const ar = m[2 * (k * n + i)];
        const ai = -m[2 * (k * n + i) + 1];
        const br = m[2 * (k * n + j)];
        const bi = m[2 * (k * n + j) + 1];
        re += ar * br - ai * bi;
        im += ar * bi + ai * br;
      }
      g[2 * (i * n + j)] = re;
      g[2 * (i * n + j) + 1] = im;
    }
  return g;
}

/** largest singular value of an n×n complex matrix: √ of the largest eigenvalue of SᴴS via the real embedding [[A, −B], [B, A]] */
export function sigmaMax(m: Float64Array, n: number): number {
  const g = gram(m, n);
  const N = 2 * n;
  const r = new Float64Array(N * N);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) {
      const re = g[2 * (i * n + j)];
      const im = g[2 * (i * n + j) + 1];
      r[i * N + j] = re;
      r[(i + n) * N + (j + n)] = re;
      r[i * N + (j + n)] = -im;
      r[(i + n) * N + j] = im;
    }
  return Math.sqrt(Math.max(0, ...symmetricEigenvalues(r, N)));
}

/** largest σ_max over every frequency of an SData */
export function sigmaMaxOver(s: SData): number {
  let worst = 0;
  for (let k = 0; k < s.nf; k++) worst = Math.max(worst, sigmaMax(matrixAt(s, k), s.n));
  return worst;
}

/** max |(SᴴS − I)_ij| over every frequency */
export function unitarityError(s: SData): number {
  let worst = 0;
  for (let k = 0; k < s.nf; k++) {
    const g = gram(matrixAt(s, k), s.n);
    for (let i = 0; i < s.n; i++)
      for (let j = 0; j < s.n; j++) {
        const re = g[2 * (i * s.n + j)] - (i === j ? 1 : 0);
        const im = g[2 * (i * s.n + j) + 1];
        worst = Math.max(worst, Math.hypot(re, im));
      }
  }
  return worst;
}

/** max |S_ij − S_ji| over every frequency */
export function reciprocityError(s: SData): number {
  let worst = 0;
  for (let k = 0; k < s.nf; k++)
    for (let i = 1; i <= s.n; i++)
      for (let j = i + 1; j <= s.n; j++) worst = Math.max(worst, abs(sub(entry(s, k, i, j), entry(s, k, j, i))));
  return worst;
}

/** expect-style closeness of two complex numbers */
export function near(a: C, b: C, tol: number): boolean {
  return abs(sub(a, b)) <= tol;
}
