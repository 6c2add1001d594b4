// Composite S of a system by sub-network growth in a planned order (Gupta, Garg and Chadha, Computer-Aided
// Design of Microwave Circuits, 1981; Compton and Rutledge, 1989 — both "from memory"), every arithmetic
// step run over all frequencies at once.

import { SingularSystemError, type PreparedSystem, type SData, type Solution } from "../types";
import { closeStack } from "./close";
import { joinStack } from "./join";
import { formatHz } from "./names";
import { buildPlan, type Plan } from "./plan";
import { resolveBlockS } from "./blocks";
import { waveStates } from "./wave-store";

/** Options of solveSystem / solveDense. */
export type SolveOptions = {
  /** block id → S to use instead of the block's own (same shape); the plan is reused */
  replace?: Record<string, SData>;
  /** keep what internalWaves needs (default true); false saves memory on very large systems */
  waves?: boolean;
};

/** Condition estimates above this add a warning to the solution. */
export const ILL_CONDITIONED = 1e8;

const plans = new WeakMap<PreparedSystem, Plan>();

/**
 * The join plan of a system, built on first use and cached on the PreparedSystem object (the plan depends
 * only on links, system ports and port counts, so it must not be reused after those are edited).
 *
 * @example planFor(sys).steps.length
 */
export function planFor(sys: PreparedSystem): Plan {
  let plan = plans.get(sys);
  if (!plan) {
    plan = buildPlan(sys);
    plans.set(sys, plan);
  }
  return plan;
}

/**
 * Solve the interconnection: S_ext = S_ee + S_ei (Γ − S_ii)⁻¹ S_ie computed by growing sub-networks in a
 * greedy minimum-frontier order, then each system port referenced to its own Z0 (power waves, through a
 * lossless Z0 step joined like any other block).
 *
 * @param sys prepared system (block S referenced to sys.z0)
 * @param opts replace: block id → S used instead; waves: keep data for internalWaves (default true)
 * @returns composite S (n = system ports, [k][i][j]), port names and Z0, warnings, solve time in ms
 * @throws SingularSystemError naming the links and the frequency where a join is singular
 * @throws EngineInputError on malformed links, ports or block data
 * @example
 * const sol = solveSystem(sys);
 * sol.s.data[2 * (k * sol.s.n + 1) * sol.s.n] // Re S21 at frequency index k
 */
export function solveSystem(sys: PreparedSystem, opts: SolveOptions = {}): Solution {
  const t0 = performance.now();
  const plan = planFor(sys);
  const blockS = resolveBlockS(sys, opts.replace);
  const nf = sys.frequencies.length;
  const keepWaves = opts.waves !== false;
  const nClusters = plan.leaves.length + plan.steps.length;
  const bufs: (Float64Array | null)[] = new Array(nClusters).fill(null);
  const sizes = new Int32Array(nClusters);

  plan.leaves.forEach((leaf, id) => {
    const n = leaf.keep.length;
    sizes[id] = n;
    const buf = new Float64Array(2 * nf * n * n);
    if (leaf.block >= 0) {
      const s = blockS[leaf.block];
      const N = s.n;
      const d = s.data;
      const keep = leaf.keep;
      for (let f = 0; f < nf; f++) {
        const so = 2 * f * N * N;
        const o = 2 * f * n * n;
        for (let i = 0; i < n; i++) {
          const ri = so + 2 * keep[i] * N;
          for (let j = 0; j < n; j++) {
            buf[o + 2 * (i * n + j)] = d[ri + 2 * keep[j]];
            buf[o + 2 * (i * n + j) + 1] = d[ri + 2 * keep[j] + 1];
          }
        }
      }
    } else {
      const m = -1 - leaf.block;
      const rho = plan.rho[m];
      const t = plan.t[m];
      for (let f = 0; f < nf; f++) {
        buf[8 * f] = rho;
        buf[8 * f + 2] = t;
        buf[8 * f + 4] = t;
        buf[8 * f + 6] = -rho;
      }
    }
    bufs[id] = buf;
  });

  const warnings = [...sys.warnings];
  const maps: (Float64Array | null)[] = [];
  const cond = new Float64Array(2);
  for (const step of plan.steps) {
    const nC = step.ports.length;
    sizes[step.c] = nC;
    const out = new Float64Array(2 * nf * nC * nC);
    const map = keepWaves ? new Float64Array(2 * nf * step.inner.length * nC) : null;
    cond[0] = 0;
    cond[1] = 0;
    let bad: number;
    if (step.kind === "join") {
      bad = joinStack(out, map, bufs[step.a] as Float64Array, sizes[step.a], bufs[step.b] as Float64Array, sizes[step.b], step, nf, cond);
      bufs[step.b] = null;
    } else {
      bad = closeStack(out, map, bufs[step.a] as Float64Array, sizes[step.a], step, nf, cond);
    }
    bufs[step.a] = null;
    if (bad >= 0) {
      const f = sys.frequencies[bad];
      throw new SingularSystemError(`the interconnection is singular at ${formatHz(f)} (a lossless resonance or an unstable loop) through links ${step.links.join(", ")}`, step.links, f);
    }
    if (cond[0] > ILL_CONDITIONED) {
      warnings.push(`ill-conditioned interconnection through links ${step.links.join(", ")}: condition estimate ${cond[0].toExponential(1)} at ${formatHz(sys.frequencies[cond[1]])}; results there may lose about ${Math.round(Math.log10(cond[0]))} significant digits`);
    }
    bufs[step.c] = out;
    maps.push(map);
  }

  const E = sys.systemPorts.length;
  const data = new Float64Array(2 * nf * E * E);
  for (let i = 0; i < E; i++) {
    for (let j = 0; j < E; j++) {
      const c = plan.outCluster[i];
      if (plan.outCluster[j] !== c) continue;
      const buf = bufs[c] as Float64Array;
      const n = sizes[c];
      const pi = plan.outPos[i];
      const pj = plan.outPos[j];
      for (let f = 0; f < nf; f++) {
        data[2 * ((f * E + i) * E + j)] = buf[2 * ((f * n + pi) * n + pj)];
        data[2 * ((f * E + i) * E + j) + 1] = buf[2 * ((f * n + pi) * n + pj) + 1];
      }
    }
  }
  const sol: Solution = {
    system: sys,
    frequencies: sys.frequencies,
    ports: sys.systemPorts.map((p) => p.name),
    portZ0: sys.systemPorts.map((p) => p.z0),
    s: { n: E, nf, data },
    warnings,
    solveMs: performance.now() - t0,
  };
  if (keepWaves) waveStates.set(sol, { kind: "growth", plan, maps, blockS });
  return sol;
}
