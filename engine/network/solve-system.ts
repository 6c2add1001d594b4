// Composite S of a system by sub-network growth in a planned order (Gupta, Garg and Chadha, Computer-Aided
// Design of Microwave Circuits, 1981; Compton and Rutledge, 1989 — both "from memory"), every arithmetic
// step run over a chunk of frequencies at once.

import { SingularSystemError, type PreparedSystem, type SData, type Solution } from "../types";
import { resolveBlockS } from "./blocks";
import { closeStack } from "./close";
import { joinStack } from "./join";
import { formatHz } from "./names";
import { buildPlan, type Plan } from "./plan";
import { primeKernels, primingSystem } from "./prime";
import { waveStates, type PlanEntry } from "./wave-store";

/** Options of solveSystem / solveDense. */
export type SolveOptions = {
  /** block id → S to use instead of the block's own (same shape); the plan is reused */
  replace?: Record<string, SData>;
  /** keep what internalWaves needs (default true); false skips the wave maps */
  waves?: boolean;
};

/** Condition estimates above this add a warning to the solution. */
export const ILL_CONDITIONED = 1e8;

const entries = new WeakMap<PreparedSystem, PlanEntry>();

function entryFor(sys: PreparedSystem): PlanEntry {
  let entry = entries.get(sys);
  if (!entry) {
    const plan = buildPlan(sys);
    const nf = sys.frequencies.length;
    const mapOffset = new Int32Array(plan.steps.length); // integer offsets keep index arithmetic in small integers
    let mapTotal = 0;
    plan.steps.forEach((step, i) => {
      mapOffset[i] = mapTotal;
      mapTotal += 2 * nf * step.inner.length * step.ports.length;
    });
    entry = { plan, mapOffset, mapTotal, arena: null, generation: 0 };
    entries.set(sys, entry);
  }
  return entry;
}

/**
 * The join plan of a system, built on first use and cached on the PreparedSystem object (the plan depends
 * only on links, system ports and port counts, so it must not be reused after those are edited).
 *
 * @example planFor(sys).steps.length
 */
export function planFor(sys: PreparedSystem): Plan {
  return entryFor(sys).plan;
}

// Buffers of intermediate sub-networks, kept between solves: fresh memory costs more than the arithmetic
// on small systems. Solves are synchronous and every buffer is returned before a solve ends.
const pool = new Map<number, Float64Array[]>();
function take(len: number): Float64Array {
  const free = pool.get(len);
  return free && free.length > 0 ? (free.pop() as Float64Array) : new Float64Array(len);
}
function give(buf: Float64Array): void {
  const free = pool.get(buf.length);
  if (free) {
    if (free.length < 64) free.push(buf);
  } else pool.set(buf.length, [buf]);
}

/**
 * Run the planned joins over every frequency: composite S referenced to each system port's own Z0, and,
 * when `maps` is given, the wave map of every step (layout in entry.mapOffset).
 *
 * @returns the composite data ([k][i][j], n = system ports) and the ill-conditioning warnings
 * @throws SingularSystemError naming the links and the frequency of a singular join
 * @example const { data } = runGrowth(sys, entry, blockS, null);
 */
export function runGrowth(sys: PreparedSystem, entry: PlanEntry, blockS: SData[], maps: Float64Array | null): { data: Float64Array; warnings: string[] } {
  const { plan, mapOffset } = entry;
  const nf = sys.frequencies.length;
  const { leaves, steps } = plan;
  const nLeaves = leaves.length;
  const nClusters = nLeaves + steps.length;
  const sizes = new Int32Array(nClusters);
  let maxN = 1;
  leaves.forEach((leaf, id) => (sizes[id] = leaf.keep.length));
  for (const step of steps) sizes[step.c] = step.ports.length;
  for (let i = 0; i < nClusters; i++) maxN = Math.max(maxN, sizes[i]);
  // frequencies run in chunks so that the working set of intermediate sub-networks stays in cache
  const chunk = Math.max(1, Math.min(nf, Math.floor(16384 / (maxN * maxN))));

  // a leaf that keeps every port of its block reads the block's data in place
  const direct = leaves.map((leaf) => leaf.block >= 0 && leaf.keep.length === blockS[leaf.block].n);
  const bufs: (Float64Array | null)[] = new Array(nClusters).fill(null);
  const bufOff = new Int32Array(nClusters);
  const owned = new Uint8Array(nClusters);
  const condWorst = new Float64Array(steps.length);
  const condAt = new Int32Array(steps.length);
  const cond = new Float64Array(2);
  const offsets = { out: 0, map: 0, a: 0, b: 0 };
  const E = sys.systemPorts.length;
  const data = new Float64Array(2 * nf * E * E);
  const release = () => {
    for (let id = 0; id < nClusters; id++) {
      if (bufs[id] && owned[id]) give(bufs[id] as Float64Array);
      bufs[id] = null;
    }
  };

  for (let f0 = 0; f0 < nf; f0 += chunk) {
    const nfc = Math.min(chunk, nf - f0);
    for (let id = 0; id < nLeaves; id++) {
      const leaf = leaves[id];
      const n = sizes[id];
      if (direct[id]) {
        bufs[id] = blockS[leaf.block].data;
        bufOff[id] = 2 * f0 * n * n;
        owned[id] = 0;
        continue;
      }
      const buf = take(2 * chunk * n * n);
      bufs[id] = buf;
      bufOff[id] = 0;
      owned[id] = 1;
      if (leaf.block >= 0) {
        const s = blockS[leaf.block];
        const N = s.n;
        const d = s.data;
        const keep = leaf.keep;
        for (let f = 0; f < nfc; f++) {
          const so = 2 * (f0 + f) * N * N;
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
        for (let f = 0; f < nfc; f++) {
          buf[8 * f] = rho;
          buf[8 * f + 1] = 0;
          buf[8 * f + 2] = t;
          buf[8 * f + 3] = 0;
          buf[8 * f + 4] = t;
          buf[8 * f + 5] = 0;
          buf[8 * f + 6] = -rho;
          buf[8 * f + 7] = 0;
        }
      }
    }
    for (let si = 0; si < steps.length; si++) {
      const step = steps[si];
      const nC = sizes[step.c];
      const out = take(2 * chunk * nC * nC);
      offsets.out = 0;
      offsets.map = mapOffset[si] + 2 * f0 * step.inner.length * nC;
      offsets.a = bufOff[step.a];
      cond[0] = 0;
      cond[1] = 0;
      let bad: number;
      if (step.kind === "join") {
        offsets.b = bufOff[step.b];
        bad = joinStack(out, maps, bufs[step.a] as Float64Array, sizes[step.a], bufs[step.b] as Float64Array, sizes[step.b], step, nfc, cond, offsets);
        if (owned[step.b]) give(bufs[step.b] as Float64Array);
        bufs[step.b] = null;
      } else {
        bad = closeStack(out, maps, bufs[step.a] as Float64Array, sizes[step.a], step, nfc, cond, offsets);
      }
      if (owned[step.a]) give(bufs[step.a] as Float64Array);
      bufs[step.a] = null;
      bufs[step.c] = out;
      bufOff[step.c] = 0;
      owned[step.c] = 1;
      if (bad >= 0) {
        release();
        const f = sys.frequencies[f0 + bad];
        throw new SingularSystemError(`the interconnection is singular at ${formatHz(f)} (a lossless resonance or an unstable loop) through links ${step.links.join(", ")}`, step.links, f);
      }
      if (cond[0] > condWorst[si]) {
        condWorst[si] = cond[0];
        condAt[si] = f0 + cond[1];
      }
    }
    for (let i = 0; i < E; i++) {
      const c = plan.outCluster[i];
      const buf = bufs[c] as Float64Array;
      const bo = bufOff[c];
      const n = sizes[c];
      const pi = plan.outPos[i];
      for (let j = 0; j < E; j++) {
        if (plan.outCluster[j] !== c) continue;
        const pj = plan.outPos[j];
        for (let f = 0; f < nfc; f++) {
          const src = bo + 2 * ((f * n + pi) * n + pj);
          const dst = 2 * (((f0 + f) * E + i) * E + j);
          data[dst] = buf[src];
          data[dst + 1] = buf[src + 1];
        }
      }
    }
    release();
  }

  const warnings: string[] = [];
  steps.forEach((step, si) => {
    if (condWorst[si] > ILL_CONDITIONED) {
      warnings.push(`ill-conditioned interconnection through links ${step.links.join(", ")}: condition estimate ${condWorst[si].toExponential(1)} at ${formatHz(sys.frequencies[condAt[si]])}; results there may lose about ${Math.round(Math.log10(condWorst[si]))} significant digits`);
    }
  });
  return { data, warnings };
}

/** Whether this process has run the kernels over the priming system yet (engine/network/prime.ts). */
let primed = false;

/**
 * Runs the join kernels over a tiny system (engine/network/prime.ts) the first time it is called in a
 * process, so that their first optimisation has type feedback for every path; later calls return at once.
 * solveSystem calls it. (Priming long enough for V8 to optimise the kernels before the real solve was
 * tried and cost more than it saved: reaching the optimisation budget is the slow part.)
 *
 * @example primeSolver(); // before a process's first solve
 */
export function primeSolver(): void {
  if (primed) return;
  primed = true;
  const priming = primingSystem();
  primeKernels(runGrowth, priming, entryFor(priming));
}

/**
 * Solve the interconnection: S_ext = S_ee + S_ei (Γ − S_ii)⁻¹ S_ie computed by growing sub-networks in a
 * greedy minimum-frontier order, then each system port referenced to its own Z0 (power waves, through a
 * lossless Z0 step joined like any other block).
 *
 * Wave maps for internalWaves are written into a buffer kept with the plan and reused by the next solve of
 * the same system; internalWaves on an older solution of that system recomputes its maps (correct, slower).
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
  primeSolver();
  const entry = entryFor(sys);
  const blockS = resolveBlockS(sys, opts.replace);
  const nf = sys.frequencies.length;
  const keepWaves = opts.waves !== false;
  let maps: Float64Array | null = null;
  if (keepWaves) {
    if (!entry.arena) entry.arena = new Float64Array(entry.mapTotal);
    maps = entry.arena;
    entry.generation++;
  }
  const { data, warnings } = runGrowth(sys, entry, blockS, maps);
  const E = sys.systemPorts.length;
  const sol: Solution = {
    system: sys,
    frequencies: sys.frequencies,
    ports: sys.systemPorts.map((p) => p.name),
    portZ0: sys.systemPorts.map((p) => p.z0),
    s: { n: E, nf, data },
    warnings: [...sys.warnings, ...warnings],
    solveMs: performance.now() - t0,
  };
  if (maps) waveStates.set(sol, { kind: "growth", entry, generation: entry.generation, maps, blockS });
  return sol;
}
