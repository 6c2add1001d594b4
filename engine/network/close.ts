// Closing links between ports of one sub-network, all frequencies in lockstep: the connection-scattering
// -matrix formula restricted to one sub-network (Gupta, Garg and Chadha, Computer-Aided Design of
// Microwave Circuits, 1981, "from memory"): with ι the linked ports and Γ their pairing permutation,
//   (Γ − S_ιι) a_ι = S_ιε a_ε,   S' = S_εε + S_ει (Γ − S_ιι)⁻¹ S_ιε.

import { conditionEstimate1, luFactorUnchecked, luSolve, norm1 } from "../linalg";
import { SINGULAR_JOIN, scratchOf, type ConditionTrack, type StackOffsets } from "./join";
import type { CloseStep } from "./plan";

/**
 * Close the planned links of one sub-network over every frequency. Writes the result S (ne×ne per
 * frequency) and, when `map` is given, the wave map W = (Γ − S_ιι)⁻¹ S_ιε (2m×ne per frequency).
 *
 * @param out result stack, length 2·nf·ne² (must not alias a)
 * @param map wave-map stack or null
 * @param a stack of the sub-network (nA×nA per frequency)
 * @param step the planned close step
 * @param nf frequency count
 * @param cond receives the worst condition estimate and its frequency index (within the range)
 * @param off start of each stack in its array (b unused)
 * @returns −1 on success, else the first frequency index where the system is singular
 * @example closeStack(out, null, a, 3, step, nf, new Float64Array(2)) // −1
 */
export function closeStack(out: Float64Array, map: Float64Array | null, a: Float64Array, nA: number, step: CloseStep, nf: number, cond: ConditionTrack, off: StackOffsets = { out: 0, map: 0, a: 0, b: 0 }): number {
  const { keep, linked, partner } = step;
  const ni = linked.length;
  const ne = keep.length;
  const sc = scratchOf(2 * ni * ni + 2 * ni * ne + 4 * ni);
  const g = sc.subarray(0, 2 * ni * ni);
  const w = sc.subarray(2 * ni * ni, 2 * ni * ni + 2 * ni * ne);
  const work = sc.subarray(2 * ni * ni + 2 * ni * ne, 2 * ni * ni + 2 * ni * ne + 4 * ni);
  const piv = new Int32Array(ni);
  const sA = 2 * nA * nA;
  const sC = 2 * ne * ne;
  for (let f = 0; f < nf; f++) {
    const ao = off.a + f * sA;
    const co = off.out + f * sC;
    for (let i = 0; i < ni; i++) {
      for (let j = 0; j < ni; j++) {
        const idx = ao + 2 * (linked[i] * nA + linked[j]);
        g[2 * (i * ni + j)] = (partner[i] === j ? 1 : 0) - a[idx];
        g[2 * (i * ni + j) + 1] = -a[idx + 1];
      }
      for (let j = 0; j < ne; j++) {
        const idx = ao + 2 * (linked[i] * nA + keep[j]);
        w[2 * (i * ne + j)] = a[idx];
        w[2 * (i * ne + j) + 1] = a[idx + 1];
      }
    }
    const anorm = norm1(g, ni);
    if (luFactorUnchecked(g, ni, piv) >= 0) return f;
    const kappa = conditionEstimate1(anorm, g, ni, piv, work);
    if (!(kappa < SINGULAR_JOIN)) return f;
    if (kappa > cond[0]) {
      cond[0] = kappa;
      cond[1] = f;
    }
    luSolve(g, ni, piv, w, ne);
    for (let i = 0; i < ne; i++) {
      const ri = ao + 2 * keep[i] * nA;
      const oi = co + 2 * i * ne;
      for (let j = 0; j < ne; j++) {
        let sr = a[ri + 2 * keep[j]];
        let si = a[ri + 2 * keep[j] + 1];
        for (let r = 0; r < ni; r++) {
          const cr = a[ri + 2 * linked[r]];
          const ci = a[ri + 2 * linked[r] + 1];
          const wr = w[2 * (r * ne + j)];
          const wi = w[2 * (r * ne + j) + 1];
          sr += cr * wr - ci * wi;
          si += cr * wi + ci * wr;
        }
        out[oi + 2 * j] = sr;
        out[oi + 2 * j + 1] = si;
      }
    }
    if (map) {
      const mo = off.map + f * 2 * ni * ne;
      for (let j = 0; j < 2 * ni * ne; j++) map[mo + j] = w[j];
    }
  }
  return -1;
}
