/**
 * Runs tests/bench/dense_numpy.py on a prepared system: exports every block's S to a temporary binary
 * file, and times the dense solve in numpy in a subprocess whose environment drops OPENBLAS_CORETYPE and
 * OPENBLAS_L2_SIZE (set on this machine, they slow numpy down).
 */
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import type { PreparedSystem } from "../../engine/types";

export const PYTHON = "/usr/bin/python3";
const SCRIPT = fileURLToPath(new URL("./dense_numpy.py", import.meta.url));

export type NumpyTiming = {
  medianMs: number;
  /** median CPU time of the Python process over the same runs (one BLAS thread), ms */
  cpuMedianMs: number;
  runsMs: number[];
  /** composite from numpy, [f][i][j][re, im] */
  s: number[][][][];
  numpy: string;
  blas: string;
  threads: unknown;
  interior: number;
  /** whether an untimed warm-up run came first (only when one run is short) */
  warmup: boolean;
};

/** Whether /usr/bin/python3 with numpy is available. */
export function numpyAvailable(): boolean {
  if (!existsSync(PYTHON)) return false;
  return spawnSync(PYTHON, ["-c", "import numpy"], { encoding: "utf8" }).status === 0;
}

/**
 * Times the dense numpy solve of a prepared system (all system ports at the system Z0).
 *
 * @param sys - the prepared system
 * @param runs - timed runs in Python (fewer when they exceed the budget)
 * @param budgetSeconds - stop repeating after this long
 * @returns the timing and numpy's composite
 */
export function timeNumpyDense(sys: PreparedSystem, runs = 7, budgetSeconds = 30): NumpyTiming {
  if (sys.systemPorts.some((p) => p.z0 !== sys.z0)) throw new Error("the numpy reference handles system ports at the system Z0 only");
  const dir = mkdtempSync(join(tmpdir(), "portolan-bench-"));
  try {
    const total = sys.blocks.reduce((sum, b) => sum + b.s.data.length, 0);
    const flat = new Float64Array(total);
    let at = 0;
    for (const b of sys.blocks) {
      flat.set(b.s.data, at);
      at += b.s.data.length;
    }
    const dataPath = join(dir, "blocks.f64");
    writeFileSync(dataPath, new Uint8Array(flat.buffer, flat.byteOffset, flat.byteLength));
    const manifestPath = join(dir, "manifest.json");
    writeFileSync(
      manifestPath,
      JSON.stringify({
        nf: sys.frequencies.length,
        data: dataPath,
        block_ports: sys.blocks.map((b) => b.s.n),
        links: sys.links,
        system_ports: sys.systemPorts.map((p) => p.at),
      }),
    );
    const env = { ...process.env };
    delete env.OPENBLAS_CORETYPE;
    delete env.OPENBLAS_L2_SIZE;
    // one thread, like Portolan's solve: on this shared 2-core machine OpenBLAS's second thread made the
    // batched solves about 30× slower (measured: 1001 solves of 58 × 58, 7.6 s with 2 threads, 0.28 s with 1)
    env.OPENBLAS_NUM_THREADS = "1";
    env.OMP_NUM_THREADS = "1";
    const run = spawnSync(PYTHON, [SCRIPT, manifestPath, String(runs), String(budgetSeconds)], { encoding: "utf8", env, maxBuffer: 1 << 30 });
    if (run.status !== 0) throw new Error(`dense_numpy.py failed: ${run.stderr}`);
    const out = JSON.parse(run.stdout) as {
      median_ms: number;
      median_cpu_ms: number;
      runs_ms: number[];
      s: number[][][][];
      numpy: string;
      blas: string;
      threads: unknown;
      interior: number;
      warmup: boolean;
    };
    return { medianMs: out.median_ms, cpuMedianMs: out.median_cpu_ms, runsMs: out.runs_ms, s: out.s, numpy: out.numpy, blas: out.blas, threads: out.threads, interior: out.interior, warmup: out.warmup };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
