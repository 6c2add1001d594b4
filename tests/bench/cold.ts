/**
 * The first solve in a fresh process, as a CI pipeline running `portolan check` once per scenario feels it:
 * tests/bench/cold-solve.ts is bundled by esbuild (as the CLI is) and run in new Node processes, each
 * preparing the bench front end and solving it once.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { build } from "esbuild";

export type ColdRun = { prepareMs: number; prepareCpuMs: number; solveMs: number; solveCpuMs: number };

const median = (xs: number[]): number => {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 === 1 ? s[m] : (s[m - 1] + s[m]) / 2;
};

/**
 * Medians over `processes` fresh processes of the cold prepare and cold solve (wall and CPU time).
 *
 * @example const c = await timeColdSolve(7); c.solveMs
 */
export async function timeColdSolve(processes: number): Promise<{ runs: ColdRun[]; prepareMs: number; solveMs: number; solveCpuMs: number }> {
  const dir = mkdtempSync(join(tmpdir(), "portolan-cold-"));
  try {
    const outfile = join(dir, "cold-solve.mjs");
    await build({ entryPoints: [fileURLToPath(new URL("./cold-solve.ts", import.meta.url))], outfile, bundle: true, platform: "node", format: "esm", target: "node20", logLevel: "warning" });
    const runs: ColdRun[] = [];
    for (let i = 0; i < processes; i++) {
      const r = spawnSync(process.execPath, [outfile], { encoding: "utf8" });
      if (r.status !== 0) throw new Error(`cold solve failed: ${r.stderr}`);
      runs.push(JSON.parse(r.stdout) as ColdRun);
    }
    return { runs, prepareMs: median(runs.map((r) => r.prepareMs)), solveMs: median(runs.map((r) => r.solveMs)), solveCpuMs: median(runs.map((r) => r.solveCpuMs)) };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
