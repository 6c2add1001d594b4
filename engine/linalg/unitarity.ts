// Unitarity defect ‖SᴴS − I‖ (max-abs entry): zero for a lossless network (Pozar, Microwave Engineering,
// 4th ed., §4.3, unitary property of a lossless network, "from memory").

import { cabs } from "../complex";
import type { SData } from "../types";

/**
 * Largest modulus of any entry of SᴴS − I at frequency index k (the max-abs norm, not Frobenius).
 *
 * @param s S stack
 * @param k frequency index
 * @returns max_ij |(SᴴS − I)_ij| (dimensionless)
 * @example unitarityError({ n: 1, nf: 1, data: Float64Array.of(0.6, 0.8) }, 0) // ≈ 0
 */
export function unitarityError(s: SData, k: number): number {
  const n = s.n;
  const d = s.data;
  const base = 2 * k * n * n;
  let worst = 0;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      let re = i === j ? -1 : 0;
      let im = 0;
      for (let r = 0; r < n; r++) {
        const ar = d[base + 2 * (r * n + i)];
        const ai = -d[base + 2 * (r * n + i) + 1];
        const br = d[base + 2 * (r * n + j)];
        const bi = d[base + 2 * (r * n + j) + 1];
        re += ar * br - ai * bi;
        im += ar * bi + ai * br;
      }
      const m = cabs(re, im);
      if (m > worst || Number.isNaN(m)) worst = m;
    }
  }
  return worst;
}
