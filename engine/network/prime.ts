// Type feedback for the join kernels before the first real solve. V8 optimises a hot kernel while it runs
// (on-stack replacement); code it has not yet executed then has no type feedback, and reaching it later
// throws the optimised code away, for a second compile of tens of milliseconds on a busy machine
// ("Insufficient type feedback" deoptimisations, seen in the first solve of a fresh process). Running every
// path once on a tiny system first (join of one and of several port pairs, a closed loop, a Z0 step, with
// and without wave maps) lets the first optimisation cover them all.

import type { PreparedSystem, SData } from "../types";
import type { PlanEntry } from "./wave-store";

/** Frequencies of the priming system: enough for V8 to allocate feedback, far too few to cost anything. */
const NF = 8;
/** Rounds over the priming system. */
const ROUNDS = 3;

function constantS(n: number, seed: number): SData {
  const data = new Float64Array(2 * NF * n * n);
  for (let k = 0; k < NF; k++) {
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        const at = 2 * ((k * n + i) * n + j);
        // small, distinct entries: every loop through the system has gain well below one (never singular)
        data[at] = i === j ? 0.1 : 0.2 / (1 + ((seed + i + 2 * j) % 5));
        data[at + 1] = 0.05 * (((seed + 3 * i + j) % 3) - 1);
      }
    }
  }
  return { n, nf: NF, data };
}

/**
 * A small system whose join plan has every kind of step: B1–B2 joined through one link, the result
 * joined to B3 through two (a loop), B4 with two of its own ports linked (a closing step), and a system
 * port with its own Z0 (a Z0 step leaf).
 */
export function primingSystem(): PreparedSystem {
  const ports = [3, 2, 3, 4];
  const ids = ["B1", "B2", "B3", "B4"];
  const blockOffset: number[] = [];
  const blockPorts: PreparedSystem["blockPorts"] = [];
  ids.forEach((id, i) => {
    blockOffset.push(blockPorts.length);
    for (let p = 1; p <= ports[i]; p++) blockPorts.push({ index: blockPorts.length, block: id, port: p });
  });
  const g = (b: number, p: number) => blockOffset[b] + p - 1;
  const links: [number, number][] = [
    [g(0, 2), g(1, 1)],
    [g(1, 2), g(2, 1)],
    [g(2, 2), g(0, 3)],
    [g(2, 3), g(3, 1)],
    [g(3, 2), g(3, 3)],
  ];
  const frequencies = Float64Array.from({ length: NF }, (_, k) => 1e9 + 1e8 * k);
  return {
    scenario: { format: "portolan.scenario/1", name: "priming", z0: 50, frequency: { list: Array.from(frequencies) }, blocks: [], links: [], ports: [] } as unknown as PreparedSystem["scenario"],
    frequencies,
    z0: 50,
    blocks: ids.map((id, i) => ({ id, kind: "touchstone", s: constantS(ports[i], i), traits: { passive: true, reciprocal: false, radiates: false }, warnings: [] })),
    blockPorts,
    blockOffset,
    links,
    systemPorts: [
      { name: "P1", at: g(0, 1), z0: 50 },
      { name: "P2", at: g(3, 4), z0: 75 },
    ],
    unterminated: [],
    warnings: [],
  };
}

/**
 * Runs the join kernels over the priming system a few times, with and without wave maps.
 *
 * @param run - the solver's growth loop (runGrowth) and the plan entry of the priming system
 * @example primeKernels(runGrowth, entryFor(primingSystem()))
 */
export function primeKernels(
  run: (sys: PreparedSystem, entry: PlanEntry, blockS: SData[], maps: Float64Array | null) => unknown,
  sys: PreparedSystem,
  entry: PlanEntry,
): void {
  const blockS = sys.blocks.map((b) => b.s);
  const maps = new Float64Array(entry.mapTotal);
  for (let r = 0; r < ROUNDS; r++) {
    run(sys, entry, blockS, null);
    run(sys, entry, blockS, maps);
  }
}
