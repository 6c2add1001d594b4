// Reciprocity defect max |Sij − Sji|: zero for a reciprocal network, S = Sᵀ (Pozar, Microwave Engineering,
// 4th ed., §4.3, "from memory").

import { cabs } from "../complex";
import type { SData } from "../types";

/**
 * Largest |S_ij − S_ji| at frequency index k.
 *
 * @param s S stack
 * @param k frequency index
 * @returns the defect (dimensionless)
 * @example reciprocityError({ n: 2, nf: 1, data: Float64Array.of(0, 0, 1, 0, 0.5, 0, 0, 0) }, 0) // 0.5
 */
export function reciprocityError(s: SData, k: number): number {
  const n = s.n;
  const d = s.data;
  const base = 2 * k * n * n;
  let worst = 0;
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const m = cabs(d[base + 2 * (i * n + j)] - d[base + 2 * (j * n + i)], d[base + 2 * (i * n + j) + 1] - d[base + 2 * (j * n + i) + 1]);
      if (m > worst || Number.isNaN(m)) worst = m;
    }
  }
  return worst;
}
