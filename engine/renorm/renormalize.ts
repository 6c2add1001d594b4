// Change of reference impedance by the direct S-to-S map S' = L (S − Γb)(I − Γa S)⁻¹ R with diagonal Γa, Γb, L, R,
// derived from the wave definitions of Kurokawa, "Power waves and the scattering matrix", IEEE T-MTT 13(2), 1965,
// eqs. (1)–(2), and of Marks and Williams, "A general waveguide circuit theory", J. Res. NIST 97(5), 1992 (pseudo-waves).
import { EngineInputError, SingularSystemError, type SData, type WaveKind, type Z0Vector } from "../types";
import { solveComplexInPlace } from "../linalg/solve";
import { checkZ0 } from "./z0-vector";

/*
 * Derivation (per port, V and I the port voltage and current into the network, z1 the old and z2 the new
 * reference, Rk = Re zk):
 *
 * Power waves (Kurokawa eq. 1): a = (V + z I) / (2√R), b = (V − z* I) / (2√R). Eliminating V and I between
 * the two references gives
 *   a2 = α a1 − β b1,   b2 = ᾱ b1 − β̄ a1,   α = (z2 + z1*) / (2√(R1 R2)),  β = (z2 − z1) / (2√(R1 R2)).
 * With b1 = S a1:  S' = (ᾱ S − β̄)(α − β S)⁻¹ = ᾱ (S − Γ̄)(I − Γ S)⁻¹ α⁻¹,  Γ = β/α = (z2 − z1)/(z2 + z1*).
 * |Γ| < 1 whenever R1, R2 > 0 (|z2 + z1*|² − |z2 − z1|² = 4 R1 R2), so I − ΓS is well conditioned for
 * passive S, and no Z or Y matrix is needed: series elements, ideal throughs and opens are fine.
 *
 * Pseudo-waves (Marks and Williams, with the normalisation u = √R / |z| used by the reference library
 * scikit-rf 0.15.4, s2z/z2s 'pseudo'): a = u (V + z I) / 2, b = u (V − z I) / 2. Then
 *   a2 = α a1 − β b1,  b2 = α b1 − β a1,  α = u2 (z1 + z2) / (2 u1 z1),  β = u2 (z2 − z1) / (2 u1 z1),
 *   S' = α (S − Γ)(I − Γ S)⁻¹ α⁻¹,  Γ = (z2 − z1)/(z2 + z1).
 * For real references both reduce to the same map (α real, Γ real).
 */

/**
 * Renormalises S-parameters from one set of per-port reference impedances to another.
 *
 * Shapes: `s` is an SData (n ports, nf frequencies); `from` and `to` are Z0Vectors of length 2n (Ω, complex
 * allowed, real part > 0). `kind` picks the wave definition: "power" (Kurokawa 1965, the default) or
 * "pseudo" (Marks and Williams 1992); they agree for real references. The result is written to `out`
 * (allocated when null) and returned; `out` may be `s` itself.
 *
 * Throws EngineInputError for mismatched shapes or bad impedances, and SingularSystemError when
 * I − Γ S is singular at some frequency (only possible for active S, or for pseudo-waves with strongly
 * reactive references).
 *
 * @example
 * // A matched 50 Ω load seen from a 75 Ω reference: Γ = (50 − 75)/(50 + 75) = −0.2.
 * const s = { n: 1, nf: 1, data: new Float64Array([0, 0]) };
 * renormalize(null, s, z0Vector(50, 1), z0Vector(75, 1)).data; // [-0.2, 0]
 */
export function renormalize(out: SData | null, s: SData, from: Z0Vector, to: Z0Vector, kind: WaveKind = "power"): SData {
  const n = s.n;
  const nf = s.nf;
  if (s.data.length !== 2 * nf * n * n) {
    throw new EngineInputError("renormalize", `S data has length ${s.data.length}, expected 2·${nf}·${n}·${n}`);
  }
  checkZ0(from, n, "renormalize: from");
  checkZ0(to, n, "renormalize: to");
  if (kind !== "power" && kind !== "pseudo") throw new EngineInputError("renormalize", `unknown wave kind "${String(kind)}"`);
  const target: SData = out ?? { n, nf, data: new Float64Array(2 * nf * n * n) };
  if (target.n !== n || target.nf !== nf || target.data.length !== s.data.length) {
    throw new EngineInputError("renormalize", "out has a different shape from s");
  }

  // Per-port coefficients: Γa (in I − Γa S), Γb (in S − Γb), left factor L and right factor R = 1/α.
  const ga = new Float64Array(2 * n);
  const gb = new Float64Array(2 * n);
  const left = new Float64Array(2 * n);
  const right = new Float64Array(2 * n);
  let identity = true;
  for (let p = 0; p < n; p++) {
    const r1 = from[2 * p];
    const x1 = from[2 * p + 1];
    const r2 = to[2 * p];
    const x2 = to[2 * p + 1];
    if (r1 !== r2 || x1 !== x2) identity = false;
    let ar: number;
    let ai: number;
    let gr: number;
    let gi: number;
    if (kind === "power") {
      const k = 1 / (2 * Math.sqrt(r1 * r2));
      ar = (r2 + r1) * k; // α = (z2 + z1*) k
      ai = (x2 - x1) * k;
      [gr, gi] = cdiv(r2 - r1, x2 - x1, r2 + r1, x2 - x1); // Γ = (z2 − z1)/(z2 + z1*)
      gb[2 * p] = gr;
      gb[2 * p + 1] = -gi;
      left[2 * p] = ar;
      left[2 * p + 1] = -ai;
    } else {
      const u1 = Math.sqrt(r1) / Math.hypot(r1, x1);
      const u2 = Math.sqrt(r2) / Math.hypot(r2, x2);
      // α = u2 (z1 + z2) / (2 u1 z1)
      [ar, ai] = cdiv(r1 + r2, x1 + x2, r1, x1);
      const c = u2 / (2 * u1);
      ar *= c;
      ai *= c;
      [gr, gi] = cdiv(r2 - r1, x2 - x1, r2 + r1, x2 + x1);
      gb[2 * p] = gr;
      gb[2 * p + 1] = gi;
      left[2 * p] = ar;
      left[2 * p + 1] = ai;
    }
    ga[2 * p] = gr;
    ga[2 * p + 1] = gi;
    [right[2 * p], right[2 * p + 1]] = cdiv(1, 0, ar, ai);
  }

  const src = s.data;
  const dst = target.data;
  if (identity) {
    if (dst !== src) dst.set(src);
    return target;
  }
  const nn2 = 2 * n * n;
  const mt = new Float64Array(nn2);
  const bt = new Float64Array(nn2);
  for (let k = 0; k < nf; k++) {
    const o = k * nn2;
    // X (I − Γa S) = S − Γb  ⇔  (I − Γa S)ᵀ Xᵀ = (S − Γb)ᵀ. Build both transposes from S[k].
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        const sji = o + 2 * (j * n + i);
        const sr = src[sji];
        const si = src[sji + 1];
        const q = 2 * (i * n + j);
        // Mᵀ[i][j] = δij − Γa_j S[j][i]
        const gar = ga[2 * j];
        const gai = ga[2 * j + 1];
        mt[q] = (i === j ? 1 : 0) - (gar * sr - gai * si);
        mt[q + 1] = -(gar * si + gai * sr);
        // Bᵀ[i][j] = S[j][i] − δij Γb_j
        bt[q] = sr - (i === j ? gb[2 * j] : 0);
        bt[q + 1] = si - (i === j ? gb[2 * j + 1] : 0);
      }
    }
    if (!solveComplexInPlace(mt, bt, n, n)) {
      throw new SingularSystemError(`renormalisation: I − ΓS is singular at frequency index ${k}; the S data cannot be referred to the new impedances`);
    }
    // bt now holds Xᵀ; S'[i][j] = L_i X[i][j] R_j = L_i Xᵀ[j][i] R_j.
    for (let i = 0; i < n; i++) {
      const lr = left[2 * i];
      const li = left[2 * i + 1];
      for (let j = 0; j < n; j++) {
        const q = 2 * (j * n + i);
        const xr = bt[q];
        const xi = bt[q + 1];
        const tr = lr * xr - li * xi;
        const ti = lr * xi + li * xr;
        const rr = right[2 * j];
        const ri = right[2 * j + 1];
        const d = o + 2 * (i * n + j);
        dst[d] = tr * rr - ti * ri;
        dst[d + 1] = tr * ri + ti * rr;
      }
    }
  }
  return target;
}

/** (ar + j ai) / (br + j bi), scaled so that it neither overflows nor underflows needlessly (Smith 1962). */
function cdiv(ar: number, ai: number, br: number, bi: number): [number, number] {
  if (Math.abs(br) >= Math.abs(bi)) {
    const r = bi / br;
    const d = br + bi * r;
    return [(ar + ai * r) / d, (ai - ar * r) / d];
  }
  const r = br / bi;
  const d = br * r + bi;
  return [(ar * r + ai) / d, (ai * r - ar) / d];
}
