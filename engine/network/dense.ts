// The plain connection-scattering-matrix method (Monaco and Tiberio, 1970s; Gupta, Garg and Chadha,
// Computer-Aided Design of Microwave Circuits, 1981 — "from memory"): one dense solve per frequency,
//   S_ext = S_ee + S_ei (Γ − S_ii)⁻¹ S_ie,
// then each system port moved to its own Z0 by S' = ρ + t (I + S ρ)⁻¹ S t (ρ, t diagonal: the lossless
// Z0 step of each port joined in closed form). Kept as the reference for the faster solveSystem.

import { conditionEstimate1, luFactorUnchecked, luSolve, norm1 } from "../linalg";
import { SingularSystemError, type PreparedSystem, type Solution } from "../types";
import { resolveBlockS } from "./blocks";
import { SINGULAR_JOIN } from "./join";
import { formatHz, linkName } from "./names";
import { buildPlan } from "./plan";
import { ILL_CONDITIONED, type SolveOptions } from "./solve-system";
import { waveStates } from "./wave-store";

/**
 * Solve the interconnection densely (cubic in the number of linked ports at every frequency).
 * Same contract as solveSystem; meant as the reference in tests and for small systems.
 *
 * @param sys prepared system
 * @param opts replace: block id → S used instead; waves: keep data for internalWaves (default true)
 * @returns the composite referenced to each system port's own Z0
 * @throws SingularSystemError naming every link and the frequency when (Γ − S_ii) is singular
 * @example const ref = solveDense(sys); ref.s.n === sys.systemPorts.length
 */
export function solveDense(sys: PreparedSystem, opts: SolveOptions = {}): Solution {
  const t0 = performance.now();
  const plan = buildPlan(sys); // validates links and ports; only rho/t are used here
  const blockS = resolveBlockS(sys, opts.replace);
  const nf = sys.frequencies.length;
  const P = sys.blockPorts.length;
  const blockOf = new Int32Array(P);
  const local = new Int32Array(P);
  sys.blocks.forEach((_, i) => {
    const end = i + 1 < sys.blocks.length ? sys.blockOffset[i + 1] : P;
    for (let p = sys.blockOffset[i]; p < end; p++) {
      blockOf[p] = i;
      local[p] = p - sys.blockOffset[i];
    }
  });
  const inner: number[] = [];
  for (const [p, q] of sys.links) inner.push(p, q);
  const ni = inner.length;
  const ext = Int32Array.from(sys.systemPorts, (sp) => sp.at);
  const E = ext.length;
  const pos = new Int32Array(P).fill(-1);
  inner.forEach((p, i) => (pos[p] = i));
  const elem = (f: number, p: number, q: number, im: number): number => {
    if (blockOf[p] !== blockOf[q]) return 0;
    const s = blockS[blockOf[p]];
    return s.data[2 * ((f * s.n + local[p]) * s.n + local[q]) + im];
  };
  const names = sys.links.map(([p, q]) => linkName(sys, p, q));
  const g = new Float64Array(2 * ni * ni);
  const piv = new Int32Array(Math.max(ni, E));
  const work = new Float64Array(4 * Math.max(ni, E));
  const w = new Float64Array(2 * nf * ni * E);
  const s0 = new Float64Array(2 * nf * E * E);
  const data = new Float64Array(2 * nf * E * E);
  const k = new Float64Array(2 * E * E);
  const x = new Float64Array(2 * E * E);
  let worst = 0;
  let worstAt = 0;
  const singular = (f: number): never => {
    throw new SingularSystemError(`the interconnection is singular at ${formatHz(sys.frequencies[f])}`, names, sys.frequencies[f]);
  };
  for (let f = 0; f < nf; f++) {
    const wo = 2 * f * ni * E;
    for (let i = 0; i < ni; i++) {
      for (let j = 0; j < ni; j++) {
        const partner = (j ^ 1) === i ? 1 : 0; // links are stored as consecutive pairs
        g[2 * (i * ni + j)] = partner - elem(f, inner[i], inner[j], 0);
        g[2 * (i * ni + j) + 1] = -elem(f, inner[i], inner[j], 1);
      }
      for (let j = 0; j < E; j++) {
        w[wo + 2 * (i * E + j)] = elem(f, inner[i], ext[j], 0);
        w[wo + 2 * (i * E + j) + 1] = elem(f, inner[i], ext[j], 1);
      }
    }
    if (ni > 0) {
      const anorm = norm1(g, ni);
      if (luFactorUnchecked(g, ni, piv) >= 0) singular(f);
      const kappa = conditionEstimate1(anorm, g, ni, piv, work);
      if (!(kappa < SINGULAR_JOIN)) singular(f);
      if (kappa > worst) {
        worst = kappa;
        worstAt = f;
      }
      luSolve(g, ni, piv, w, E, 0, wo);
    }
    const so = 2 * f * E * E;
    for (let i = 0; i < E; i++) {
      for (let j = 0; j < E; j++) {
        let sr = elem(f, ext[i], ext[j], 0);
        let si = elem(f, ext[i], ext[j], 1);
        for (let r = 0; r < ni; r++) {
          const cr = elem(f, ext[i], inner[r], 0);
          const ci = elem(f, ext[i], inner[r], 1);
          const wr = w[wo + 2 * (r * E + j)];
          const wi = w[wo + 2 * (r * E + j) + 1];
          sr += cr * wr - ci * wi;
          si += cr * wi + ci * wr;
        }
        s0[so + 2 * (i * E + j)] = sr;
        s0[so + 2 * (i * E + j) + 1] = si;
      }
    }
    // Z0 steps: K = I + S0·diag(ρ), K X = S0·diag(t), S' = diag(ρ) + diag(t)·X
    if (E > 0) {
      for (let i = 0; i < E; i++) {
        for (let j = 0; j < E; j++) {
          const sr = s0[so + 2 * (i * E + j)];
          const si = s0[so + 2 * (i * E + j) + 1];
          k[2 * (i * E + j)] = (i === j ? 1 : 0) + sr * plan.rho[j];
          k[2 * (i * E + j) + 1] = si * plan.rho[j];
          x[2 * (i * E + j)] = sr * plan.t[j];
          x[2 * (i * E + j) + 1] = si * plan.t[j];
        }
      }
      const anorm = norm1(k, E);
      if (luFactorUnchecked(k, E, piv) >= 0) singular(f);
      if (!(conditionEstimate1(anorm, k, E, piv, work) < SINGULAR_JOIN)) singular(f);
      luSolve(k, E, piv, x, E);
      for (let i = 0; i < E; i++) {
        for (let j = 0; j < E; j++) {
          data[so + 2 * (i * E + j)] = (i === j ? plan.rho[i] : 0) + plan.t[i] * x[2 * (i * E + j)];
          data[so + 2 * (i * E + j) + 1] = plan.t[i] * x[2 * (i * E + j) + 1];
        }
      }
    }
  }
  const warnings = [...sys.warnings];
  if (worst > ILL_CONDITIONED) warnings.push(`ill-conditioned interconnection: condition estimate ${worst.toExponential(1)} at ${formatHz(sys.frequencies[worstAt])}`);
  const sol: Solution = {
    system: sys,
    frequencies: sys.frequencies,
    ports: sys.systemPorts.map((p) => p.name),
    portZ0: sys.systemPorts.map((p) => p.z0),
    s: { n: E, nf, data },
    warnings,
    solveMs: performance.now() - t0,
  };
  if (opts.waves !== false) waveStates.set(sol, { kind: "dense", inner: Int32Array.from(inner), ext, w, s0, rho: plan.rho, t: plan.t, blockS });
  return sol;
}
