/**
 * Passivity of a scattering matrix: S is passive when I − SᴴS is positive semidefinite, i.e. its
 * largest singular value is at most 1 (Pozar, Microwave Engineering, 4th ed., sec. 4.3: the power
 * leaving a passive network cannot exceed the power entering it). Tested here by a Cholesky
 * factorisation of b·I − SᴴS, which succeeds exactly when σ_max(S)² < b.
 */

/**
 * Whether σ_max(S)² < bound for an n×n complex matrix S (row-major, interleaved re/im, length 2n²),
 * decided by attempting the Cholesky factorisation of bound·I − SᴴS.
 *
 * @example
 * powerGainBelow(new Float64Array([0.5, 0]), 1, 1); // true: |S11|² = 0.25 < 1
 */
export function powerGainBelow(s: Float64Array, n: number, bound: number): boolean {
  // M = bound·I − SᴴS, Hermitian; only the lower triangle is formed and factorised.
  // Accumulated row by row of S (contiguous reads): (SᴴS)_ij = Σ_k conj(S_ki) S_kj.
  const m = new Float64Array(2 * n * n);
  for (let k = 0; k < n; k++) {
    const row = 2 * k * n;
    for (let i = 0; i < n; i++) {
      const ar = s[row + 2 * i];
      const ai = -s[row + 2 * i + 1];
      if (ar === 0 && ai === 0) continue;
      const out = 2 * i * n;
      for (let j = 0; j <= i; j++) {
        const br = s[row + 2 * j];
        const bi = s[row + 2 * j + 1];
        m[out + 2 * j] -= ar * br - ai * bi;
        m[out + 2 * j + 1] -= ar * bi + ai * br;
      }
    }
  }
  for (let i = 0; i < n; i++) m[2 * (i * n + i)] += bound;
  // Cholesky M = L Lᴴ in place (lower triangle).
  for (let j = 0; j < n; j++) {
    let d = m[2 * (j * n + j)];
    for (let k = 0; k < j; k++) {
      const p = 2 * (j * n + k);
      d -= m[p] * m[p] + m[p + 1] * m[p + 1];
    }
    if (!(d > 0)) return false;
    const ljj = Math.sqrt(d);
    m[2 * (j * n + j)] = ljj;
    m[2 * (j * n + j) + 1] = 0;
    for (let i = j + 1; i < n; i++) {
      const p = 2 * (i * n + j);
      let re = m[p];
      let im = m[p + 1];
      for (let k = 0; k < j; k++) {
        // − L_ik · conj(L_jk)
        const a = 2 * (i * n + k);
        const b = 2 * (j * n + k);
        re -= m[a] * m[b] + m[a + 1] * m[b + 1];
        im -= m[a + 1] * m[b] - m[a] * m[b + 1];
      }
      m[p] = re / ljj;
      m[p + 1] = im / ljj;
    }
  }
  return true;
}

/**
 * The largest singular value of an n×n complex matrix (row-major, interleaved), found by bisection
 * on the Cholesky test above to the relative precision `relTol` of σ² (default 1e-14).
 *
 * @example
 * largestSingularValue(new Float64Array([0, 0, 2, 0, 0, 0, 0, 0]), 2); // 2
 */
export function largestSingularValue(s: Float64Array, n: number, relTol = 1e-14): number {
  let frob = 0;
  for (let p = 0; p < s.length; p++) frob += s[p] * s[p];
  if (frob === 0) return 0;
  // σ_max² ∈ [frob / n, frob]
  let lo = frob / n;
  let hi = frob * (1 + 1e-12);
  for (let it = 0; it < 200 && hi - lo > relTol * hi; it++) {
    const mid = 0.5 * (lo + hi);
    if (powerGainBelow(s, n, mid)) hi = mid;
    else lo = mid;
  }
  return Math.sqrt(hi);
}

/** Result of {@link passivate}. */
export type Passivated = {
  /** the passive matrix κ·T + μ·P */
  s: Float64Array;
  /** κ ∈ (0, 1]: factor applied to the transmission terms (1 when no change was needed) */
  transmissionScale: number;
  /** factor applied to the parasitic terms (1 unless they alone were active; then equal to transmissionScale) */
  parasiticScale: number;
};

/** Allowance for rounding when an ideal lossless matrix is tested: σ_max ≤ 1 + 5e-13. */
const LOSSLESS_SLACK = 1 + 1e-12;

/**
 * Makes S = T + P passive by reducing the transmission terms T (the wanted paths) and keeping the
 * parasitic terms P (reflections, leakage) exactly as entered, so that isolation and return loss are
 * never reported better than given. κ is the largest factor with σ_max(κT + P) ≤ 1, found by
 * bisection (σ_max is convex in κ, so the passive set is an interval). Only when P alone is active
 * (absurd entries such as 0 dB return loss with finite isolation) is the whole matrix scaled by
 * 1/σ_max(T + P) instead. Both matrices are n×n, row-major, interleaved re/im.
 *
 * @example
 * const { s, transmissionScale } = passivate(t, p, 3); // transmissionScale < 1 if T + P was active
 */
export function passivate(t: Float64Array, p: Float64Array, n: number): Passivated {
  const s = new Float64Array(t.length);
  for (let q = 0; q < s.length; q++) s[q] = t[q] + p[q];
  if (powerGainBelow(s, n, LOSSLESS_SLACK)) return { s, transmissionScale: 1, parasiticScale: 1 };

  if (!powerGainBelow(p, n, 1)) {
    // The parasitic terms alone are active: keep every ratio and scale the whole matrix instead.
    let scale = (1 - 1e-12) / largestSingularValue(s, n);
    for (let q = 0; q < s.length; q++) s[q] = scale * (t[q] + p[q]);
    while (!powerGainBelow(s, n, 1)) {
      scale *= 1 - 1e-12;
      for (let q = 0; q < s.length; q++) s[q] = scale * (t[q] + p[q]);
    }
    return { s, transmissionScale: scale, parasiticScale: scale };
  }
  const par = p;
  let lo = 0;
  let hi = 1;
  for (let it = 0; it < 60; it++) {
    const mid = 0.5 * (lo + hi);
    for (let q = 0; q < s.length; q++) s[q] = mid * t[q] + par[q];
    if (powerGainBelow(s, n, 1)) lo = mid;
    else hi = mid;
  }
  for (let q = 0; q < s.length; q++) s[q] = lo * t[q] + par[q];
  return { s, transmissionScale: lo, parasiticScale: 1 };
}
