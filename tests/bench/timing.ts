/**
 * Timing helpers for the benchmark (and for rows other areas add).
 */
import { performance } from "node:perf_hooks";

/** One line of the benchmark table. */
export type BenchRow = {
  /** what was timed, e.g. "chain of 100 two-ports: composite" */
  name: string;
  /** size of the case, e.g. "100 blocks, 200 ports, 1001 pts" */
  size: string;
  /** median wall time, ms (the verdict is taken on this) */
  ms: number;
  /** median CPU time of this process over the same runs, ms (steadier than wall time on a loaded machine) */
  cpuMs?: number;
  /** median time of the dense numpy reference, ms, when measured */
  numpyMs?: number;
  /** the target in words, e.g. "≤ 30 ms and faster than numpy" */
  target?: string;
  /** median CPU time of the numpy process, ms, when measured */
  numpyCpuMs?: number;
  /** whether the target is met on wall times (undefined: no target) */
  pass?: boolean;
  /**
   * whether the target is met on CPU times (Portolan's and numpy's): on a loaded machine wall time also
   * counts time spent waiting for a core, while the CPU time of this single-threaded work bounds its wall
   * time on an idle machine from above (it adds V8's helper threads and the cache misses load causes)
   */
  passCpu?: boolean;
  note?: string;
};

const medianOf = (xs: number[]): number => {
  const sorted = xs.slice().sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
};

/**
 * Median wall time of `fn` over `runs` runs, after `warmup` untimed runs (so that the JIT has compiled it),
 * and the median CPU time of this process over the same runs (user + system, all of its threads, so V8's
 * garbage collector counts too).
 *
 * @param fn - the work to time
 * @param runs - timed runs (default 7)
 * @param warmup - untimed runs first (default 3)
 * @param minTotalMs - when the last warm-up run suggests the timed runs would take less than this, run
 *   more of them (at most 6 × runs)
 * @returns { median, cpuMedian, runs } in ms
 * @example
 * const { median } = timeMedian(() => solveSystem(sys));
 */
export function timeMedian(fn: () => unknown, runs = 7, warmup = 3, minTotalMs = 0): { median: number; cpuMedian: number; runs: number[] } {
  let last = 0;
  for (let i = 0; i < warmup; i++) {
    const t0 = performance.now();
    fn();
    last = performance.now() - t0;
  }
  // short cases run more often (up to 6× and an odd count), so that their median is as steady as a long case's
  if (minTotalMs > 0 && last > 0 && runs * last < minTotalMs) runs = Math.min(6 * runs, Math.ceil(minTotalMs / last)) | 1;
  const times: number[] = [];
  const cpu: number[] = [];
  for (let i = 0; i < runs; i++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    fn();
    times.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1000);
  }
  return { median: medianOf(times), cpuMedian: medianOf(cpu), runs: times };
}

/**
 * The benchmark table as text.
 *
 * @param rows - rows in order
 * @returns aligned columns: case, size, Portolan ms (wall), cpu ms, numpy ms, numpy / Portolan, target, verdict
 *   ("PASS": met on wall time; "PASS (cpu)": missed on wall time, met on CPU time; "MISS": missed on both)
 */
export function formatTable(rows: BenchRow[]): string {
  const head = ["case", "size", "Portolan ms", "cpu ms", "numpy ms", "numpy/Portolan", "target", "result"];
  const body = rows.map((r) => [
    r.name,
    r.size,
    r.ms.toFixed(2),
    r.cpuMs === undefined ? "-" : r.cpuMs.toFixed(2),
    r.numpyMs === undefined ? "-" : r.numpyMs.toFixed(2),
    r.numpyMs === undefined ? "-" : `${(r.numpyMs / r.ms).toFixed(1)}×`,
    r.target ?? "",
    r.pass === undefined ? "" : r.pass ? "PASS" : r.passCpu ? "PASS (cpu)" : "MISS",
  ]);
  const widths = head.map((h, c) => Math.max(h.length, ...body.map((row) => row[c].length)));
  const line = (cells: string[]) => cells.map((cell, c) => (c >= 2 && c <= 5 ? cell.padStart(widths[c]) : cell.padEnd(widths[c]))).join("  ");
  return [line(head), widths.map((w) => "-".repeat(w)).join("  "), ...body.map(line)].join("\n");
}
