// Join of two sub-networks through m port pairs, all frequencies in lockstep: the multi-port form of the
// connect formula of sub-network growth (Compton and Rutledge, "Perspectives in microwave circuit
// analysis", 1989, "from memory"). With κ ports of A linked to λ ports of B:
//   (I − A_κκ B_λλ) x = A_κα a_α + A_κκ B_λβ a_β,   y = B_λλ x + B_λβ a_β,
//   b_α = A_αα a_α + A_ακ y,   b_β = B_ββ a_β + B_βλ x,
// where x = waves entering B at λ and y = waves entering A at κ.

import { conditionEstimate1, luFactorUnchecked, luSolve, norm1 } from "../linalg";
import type { JoinStep } from "./plan";

/** Worst condition seen by a kernel: [estimate, frequency index]. */
export type ConditionTrack = Float64Array;

/** Where each stack starts (element index of frequency 0 of the range): out, map, a, b. */
export type StackOffsets = { out: number; map: number; a: number; b: number };
const NO_OFFSETS: StackOffsets = { out: 0, map: 0, a: 0, b: 0 };

let scratch = new Float64Array(1024);
/** A module-level scratch area (kernels never nest), grown on demand. */
export function scratchOf(length: number): Float64Array {
  if (scratch.length < length) scratch = new Float64Array(Math.max(length, 2 * scratch.length));
  return scratch;
}

/** Above this estimate a join is reported as singular. */
export const SINGULAR_JOIN = 2 ** 52 / 64;

/**
 * Join A and B over every frequency. Writes the result S (nC×nC per frequency) to `out` and, when `map`
 * is given, the wave map [y; x] (2m×nC per frequency): incident waves on the closed ports as a function
 * of the incident waves on the result's ports.
 *
 * @param out result stack, length 2·nf·nC² (must not alias a or b)
 * @param map wave-map stack, length 2·nf·2m·nC, or null
 * @param a stack of A (nA×nA per frequency)
 * @param b stack of B (nB×nB per frequency)
 * @param step the planned join (positions of kept and linked ports)
 * @param nf frequency count
 * @param cond receives the worst condition estimate and its frequency index (within the range)
 * @param offsets start of each stack in its array (to run a range of frequencies in place)
 * @returns −1 on success, else the first frequency index (within the range) where the join is singular
 * @example joinStack(out, null, a, 2, b, 2, step, nf, new Float64Array(2)) // −1
 */
export function joinStack(
  out: Float64Array,
  map: Float64Array | null,
  a: Float64Array,
  nA: number,
  b: Float64Array,
  nB: number,
  step: JoinStep,
  nf: number,
  cond: ConditionTrack,
  offsets: StackOffsets = NO_OFFSETS,
): number {
  const m = step.aLink.length;
  if (m === 1) return joinOne(out, map, a, nA, b, nB, step, nf, cond, offsets);
  return joinMany(out, map, a, nA, b, nB, step, nf, cond, offsets);
}

function joinOne(out: Float64Array, map: Float64Array | null, A: Float64Array, nA: number, B: Float64Array, nB: number, step: JoinStep, nf: number, cond: ConditionTrack, off: StackOffsets): number {
  const aKeep = step.aKeep;
  const bKeep = step.bKeep;
  const na = aKeep.length;
  const nb = bKeep.length;
  const nC = na + nb;
  const k = step.aLink[0];
  const l = step.bLink[0];
  const sc = scratchOf(4 * nC);
  const xs = sc.subarray(0, 2 * nC);
  const ys = sc.subarray(2 * nC, 4 * nC);
  const sA = 2 * nA * nA;
  const sB = 2 * nB * nB;
  const sC = 2 * nC * nC;
  for (let f = 0; f < nf; f++) {
    const ao = off.a + f * sA;
    const bo = off.b + f * sB;
    const co = off.out + f * sC;
    const akr = A[ao + 2 * (k * nA + k)];
    const aki = A[ao + 2 * (k * nA + k) + 1];
    const blr = B[bo + 2 * (l * nB + l)];
    const bli = B[bo + 2 * (l * nB + l) + 1];
    const pr = akr * blr - aki * bli;
    const pi = akr * bli + aki * blr;
    const dr = 1 - pr;
    const di = -pi;
    // plain square roots: the terms are bounded S-parameter products, and Math.hypot is slow in V8
    const dm = Math.sqrt(dr * dr + di * di);
    const kappa = (1 + Math.sqrt(pr * pr + pi * pi)) / dm;
    if (!(kappa < SINGULAR_JOIN)) return f;
    if (kappa > cond[0]) {
      cond[0] = kappa;
      cond[1] = f;
    }
    // 1/d by Smith's algorithm
    let ir: number, ii: number;
    if (Math.abs(dr) >= Math.abs(di)) {
      const r = di / dr;
      const d = dr + di * r;
      ir = 1 / d;
      ii = -r / d;
    } else {
      const r = dr / di;
      const d = di + dr * r;
      ir = r / d;
      ii = -1 / d;
    }
    // x_j: wave entering B at l; y_j: wave entering A at k (per unit incident wave at result port j)
    const rowK = ao + 2 * k * nA;
    for (let j = 0; j < na; j++) {
      const sr = A[rowK + 2 * aKeep[j]];
      const si = A[rowK + 2 * aKeep[j] + 1];
      const xr = sr * ir - si * ii;
      const xi = sr * ii + si * ir;
      xs[2 * j] = xr;
      xs[2 * j + 1] = xi;
      ys[2 * j] = blr * xr - bli * xi;
      ys[2 * j + 1] = blr * xi + bli * xr;
    }
    const rowL = bo + 2 * l * nB;
    // akk / d
    const qr = akr * ir - aki * ii;
    const qi = akr * ii + aki * ir;
    for (let j = 0; j < nb; j++) {
      const sr = B[rowL + 2 * bKeep[j]];
      const si = B[rowL + 2 * bKeep[j] + 1];
      const xr = sr * qr - si * qi;
      const xi = sr * qi + si * qr;
      xs[2 * (na + j)] = xr;
      xs[2 * (na + j) + 1] = xi;
      ys[2 * (na + j)] = sr + blr * xr - bli * xi;
      ys[2 * (na + j) + 1] = si + blr * xi + bli * xr;
    }
    for (let i = 0; i < na; i++) {
      const ri = ao + 2 * aKeep[i] * nA;
      const cr = A[ri + 2 * k];
      const ci = A[ri + 2 * k + 1];
      const oi = co + 2 * i * nC;
      for (let j = 0; j < na; j++) {
        const yr = ys[2 * j];
        const yi = ys[2 * j + 1];
        out[oi + 2 * j] = A[ri + 2 * aKeep[j]] + cr * yr - ci * yi;
        out[oi + 2 * j + 1] = A[ri + 2 * aKeep[j] + 1] + cr * yi + ci * yr;
      }
      for (let j = na; j < nC; j++) {
        const yr = ys[2 * j];
        const yi = ys[2 * j + 1];
        out[oi + 2 * j] = cr * yr - ci * yi;
        out[oi + 2 * j + 1] = cr * yi + ci * yr;
      }
    }
    for (let i = 0; i < nb; i++) {
      const ri = bo + 2 * bKeep[i] * nB;
      const cr = B[ri + 2 * l];
      const ci = B[ri + 2 * l + 1];
      const oi = co + 2 * (na + i) * nC;
      for (let j = 0; j < na; j++) {
        const xr = xs[2 * j];
        const xi = xs[2 * j + 1];
        out[oi + 2 * j] = cr * xr - ci * xi;
        out[oi + 2 * j + 1] = cr * xi + ci * xr;
      }
      for (let j = 0; j < nb; j++) {
        const xr = xs[2 * (na + j)];
        const xi = xs[2 * (na + j) + 1];
        out[oi + 2 * (na + j)] = B[ri + 2 * bKeep[j]] + cr * xr - ci * xi;
        out[oi + 2 * (na + j) + 1] = B[ri + 2 * bKeep[j] + 1] + cr * xi + ci * xr;
      }
    }
    if (map) {
      // element-wise copy: TypedArray.set on tiny views costs more than the arithmetic here
      const mo = off.map + f * 4 * nC;
      const n2 = 2 * nC;
      for (let j = 0; j < n2; j++) {
        map[mo + j] = ys[j];
        map[mo + n2 + j] = xs[j];
      }
    }
  }
  return -1;
}

function joinMany(out: Float64Array, map: Float64Array | null, A: Float64Array, nA: number, B: Float64Array, nB: number, step: JoinStep, nf: number, cond: ConditionTrack, off: StackOffsets): number {
  const { aKeep, aLink, bKeep, bLink } = step;
  const m = aLink.length;
  const na = aKeep.length;
  const nb = bKeep.length;
  const nC = na + nb;
  const mm2 = 2 * m * m;
  const sc = scratchOf(3 * mm2 + 4 * m + 4 * m * nC);
  const akk = sc.subarray(0, mm2);
  const bll = sc.subarray(mm2, 2 * mm2);
  const mm = sc.subarray(2 * mm2, 3 * mm2);
  const work = sc.subarray(3 * mm2, 3 * mm2 + 4 * m);
  const x = sc.subarray(3 * mm2 + 4 * m, 3 * mm2 + 4 * m + 2 * m * nC);
  const y = sc.subarray(3 * mm2 + 4 * m + 2 * m * nC, 3 * mm2 + 4 * m + 4 * m * nC);
  const piv = new Int32Array(m);
  const sA = 2 * nA * nA;
  const sB = 2 * nB * nB;
  const sC = 2 * nC * nC;
  for (let f = 0; f < nf; f++) {
    const ao = off.a + f * sA;
    const bo = off.b + f * sB;
    const co = off.out + f * sC;
    for (let i = 0; i < m; i++) {
      for (let j = 0; j < m; j++) {
        akk[2 * (i * m + j)] = A[ao + 2 * (aLink[i] * nA + aLink[j])];
        akk[2 * (i * m + j) + 1] = A[ao + 2 * (aLink[i] * nA + aLink[j]) + 1];
        bll[2 * (i * m + j)] = B[bo + 2 * (bLink[i] * nB + bLink[j])];
        bll[2 * (i * m + j) + 1] = B[bo + 2 * (bLink[i] * nB + bLink[j]) + 1];
      }
    }
    // M = I − A_κκ B_λλ
    for (let i = 0; i < m; i++) {
      for (let j = 0; j < m; j++) {
        let sr = i === j ? 1 : 0;
        let si = 0;
        for (let r = 0; r < m; r++) {
          const ar = akk[2 * (i * m + r)];
          const ai = akk[2 * (i * m + r) + 1];
          const br = bll[2 * (r * m + j)];
          const bi = bll[2 * (r * m + j) + 1];
          sr -= ar * br - ai * bi;
          si -= ar * bi + ai * br;
        }
        mm[2 * (i * m + j)] = sr;
        mm[2 * (i * m + j) + 1] = si;
      }
    }
    const anorm = norm1(mm, m);
    if (luFactorUnchecked(mm, m, piv) >= 0) return f;
    const kappa = conditionEstimate1(anorm, mm, m, piv, work);
    if (!(kappa < SINGULAR_JOIN)) return f;
    if (kappa > cond[0]) {
      cond[0] = kappa;
      cond[1] = f;
    }
    // right-hand sides: [A_κα | A_κκ B_λβ]
    for (let i = 0; i < m; i++) {
      const ri = ao + 2 * aLink[i] * nA;
      for (let j = 0; j < na; j++) {
        x[2 * (i * nC + j)] = A[ri + 2 * aKeep[j]];
        x[2 * (i * nC + j) + 1] = A[ri + 2 * aKeep[j] + 1];
      }
      for (let j = 0; j < nb; j++) {
        let sr = 0;
        let si = 0;
        for (let r = 0; r < m; r++) {
          const ar = akk[2 * (i * m + r)];
          const ai = akk[2 * (i * m + r) + 1];
          const idx = bo + 2 * (bLink[r] * nB + bKeep[j]);
          const br = B[idx];
          const bi = B[idx + 1];
          sr += ar * br - ai * bi;
          si += ar * bi + ai * br;
        }
        x[2 * (i * nC + na + j)] = sr;
        x[2 * (i * nC + na + j) + 1] = si;
      }
    }
    luSolve(mm, m, piv, x, nC);
    // y = B_λλ x + [0 | B_λβ]
    for (let i = 0; i < m; i++) {
      for (let j = 0; j < nC; j++) {
        let sr = 0;
        let si = 0;
        if (j >= na) {
          const idx = bo + 2 * (bLink[i] * nB + bKeep[j - na]);
          sr = B[idx];
          si = B[idx + 1];
        }
        for (let r = 0; r < m; r++) {
          const br = bll[2 * (i * m + r)];
          const bi = bll[2 * (i * m + r) + 1];
          const xr = x[2 * (r * nC + j)];
          const xi = x[2 * (r * nC + j) + 1];
          sr += br * xr - bi * xi;
          si += br * xi + bi * xr;
        }
        y[2 * (i * nC + j)] = sr;
        y[2 * (i * nC + j) + 1] = si;
      }
    }
    // rows α: [A_αα 0] + A_ακ y
    for (let i = 0; i < na; i++) {
      const ri = ao + 2 * aKeep[i] * nA;
      const oi = co + 2 * i * nC;
      for (let j = 0; j < na; j++) {
        out[oi + 2 * j] = A[ri + 2 * aKeep[j]];
        out[oi + 2 * j + 1] = A[ri + 2 * aKeep[j] + 1];
      }
      for (let j = na; j < nC; j++) {
        out[oi + 2 * j] = 0;
        out[oi + 2 * j + 1] = 0;
      }
      for (let r = 0; r < m; r++) {
        const cr = A[ri + 2 * aLink[r]];
        const ci = A[ri + 2 * aLink[r] + 1];
        if (cr === 0 && ci === 0) continue;
        const yr0 = 2 * r * nC;
        for (let j = 0; j < nC; j++) {
          const yr = y[yr0 + 2 * j];
          const yi = y[yr0 + 2 * j + 1];
          out[oi + 2 * j] += cr * yr - ci * yi;
          out[oi + 2 * j + 1] += cr * yi + ci * yr;
        }
      }
    }
    // rows β: [0 B_ββ] + B_βλ x
    for (let i = 0; i < nb; i++) {
      const ri = bo + 2 * bKeep[i] * nB;
      const oi = co + 2 * (na + i) * nC;
      for (let j = 0; j < na; j++) {
        out[oi + 2 * j] = 0;
        out[oi + 2 * j + 1] = 0;
      }
      for (let j = 0; j < nb; j++) {
        out[oi + 2 * (na + j)] = B[ri + 2 * bKeep[j]];
        out[oi + 2 * (na + j) + 1] = B[ri + 2 * bKeep[j] + 1];
      }
      for (let r = 0; r < m; r++) {
        const cr = B[ri + 2 * bLink[r]];
        const ci = B[ri + 2 * bLink[r] + 1];
        if (cr === 0 && ci === 0) continue;
        const xr0 = 2 * r * nC;
        for (let j = 0; j < nC; j++) {
          const xr = x[xr0 + 2 * j];
          const xi = x[xr0 + 2 * j + 1];
          out[oi + 2 * j] += cr * xr - ci * xi;
          out[oi + 2 * j + 1] += cr * xi + ci * xr;
        }
      }
    }
    if (map) {
      const mo = off.map + f * 4 * m * nC;
      const n2 = 2 * m * nC;
      for (let j = 0; j < n2; j++) {
        map[mo + j] = y[j];
        map[mo + n2 + j] = x[j];
      }
    }
  }
  return -1;
}
