// State sweep split over worker threads (node:worker_threads): the combinations are cut into one
// contiguous range per worker; each worker receives the prepared system by structured clone.
// Node-only (not exported from engine/checks/index.ts, which stays usable in the browser).
import { Worker } from "node:worker_threads";
import type { PreparedSystem, RuleSpec } from "../types";
import { countCombinations, summarise, sweepSwitches, type StateSweepResult, type SweepRow } from "./state-sweep";

/**
 * The state sweep of stateSweep(), run on `workers` threads. Results are identical (same rows, same
 * order); only the wall time differs.
 *
 * @param sys prepared system (structured-cloned to each worker)
 * @param rules rules (default sys.scenario.rules)
 * @param workers thread count (default 2)
 * @returns the sweep result; `ms` includes starting the workers
 * @throws EngineInputError above the combination limit
 * @example const r = await stateSweepParallel(sys, undefined, 2);
 */
export async function stateSweepParallel(sys: PreparedSystem, rules: RuleSpec[] = sys.scenario.rules ?? [], workers = 2): Promise<StateSweepResult> {
  const t0 = performance.now();
  const sws = sweepSwitches(sys);
  const combinations = countCombinations(sws.map((s) => s.throws), sws.map((s) => s.block));
  const n = Math.max(1, Math.min(workers, combinations));
  const chunk = Math.ceil(combinations / n);
  const url = new URL("./state-sweep-worker.ts", import.meta.url);
  const parts = await Promise.all(
    Array.from({ length: n }, (_, w) => new Promise<SweepRow[]>((resolve, reject) => {
      const worker = new Worker(url, { execArgv: ["--import", "tsx"] });
      worker.once("message", (m: { rows?: SweepRow[]; error?: string }) => {
        void worker.terminate();
        if (m.error !== undefined) reject(new Error(m.error));
        else resolve(m.rows as SweepRow[]);
      });
      worker.once("error", reject);
      worker.postMessage({ sys, rules, first: w * chunk, last: Math.min(combinations, (w + 1) * chunk) });
    })),
  );
  return summarise(sys, rules, sws, combinations, parts.flat(), performance.now() - t0);
}
