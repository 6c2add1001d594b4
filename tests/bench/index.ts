/**
 * `npm run bench`: timings of the interconnection on reference systems, beside the same interconnection
 * solved densely by numpy (when /usr/bin/python3 has numpy). Medians of 7 runs.
 *
 * Other areas add rows by putting a module in tests/bench/rows/ that exports
 * `benchRows(): Promise<BenchRow[]> | BenchRow[]` (it may use the builders of ./scenarios and ./timing).
 */
import { readdirSync, existsSync } from "node:fs";
import { fileURLToPath, pathToFileURL } from "node:url";
import { join } from "node:path";
import { internalWaves, solveSystem } from "../../engine/network";
import { prepareSystem } from "../../engine/system";
import type { PreparedSystem, Solution } from "../../engine/types";
import { numpyAvailable, timeNumpyDense, type NumpyTiming } from "./numpy-dense";
import { array64, chain, referenceFrontEnd } from "./scenarios";
import { formatTable, timeMedian, type BenchRow } from "./timing";

const RUNS = 7;
/** Largest dense interior (2 × links) handed to numpy: the chain of 1000 (1998) would take hours at 1001 points. */
const MAX_DENSE_INTERIOR = 1200;

const progress = (what: string): void => {
  process.stderr.write(`… ${what}\n`);
};

function describeSize(sys: PreparedSystem): string {
  return `${sys.blocks.length} blocks, ${sys.blockPorts.length} ports, ${sys.systemPorts.length} sys, ${sys.frequencies.length} pts`;
}

/** Largest |ΔS| between our composite and numpy's, relative to the largest |S|. */
function deviation(sol: Solution, ref: number[][][][]): number {
  const { n, nf, data } = sol.s;
  let dev = 0;
  let scale = 1e-300;
  for (let k = 0; k < nf; k++) {
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        const at = 2 * ((k * n + i) * n + j);
        dev = Math.max(dev, Math.hypot(data[at] - ref[k][i][j][0], data[at + 1] - ref[k][i][j][1]));
        scale = Math.max(scale, Math.hypot(ref[k][i][j][0], ref[k][i][j][1]));
      }
    }
  }
  return dev / scale;
}

/** One excitation per system port: a unit incident wave (1 √W) at that port, zero elsewhere. */
function unitExcitations(sys: PreparedSystem): Float64Array[] {
  const nf = sys.frequencies.length;
  const ns = sys.systemPorts.length;
  return sys.systemPorts.map((_, port) => {
    const inc = new Float64Array(2 * nf * ns);
    for (let k = 0; k < nf; k++) inc[2 * (k * ns + port)] = 1;
    return inc;
  });
}

async function extraRows(): Promise<BenchRow[]> {
  const dir = fileURLToPath(new URL("./rows/", import.meta.url));
  if (!existsSync(dir)) return [];
  const rows: BenchRow[] = [];
  for (const file of readdirSync(dir).filter((f) => f.endsWith(".ts")).sort()) {
    const mod = (await import(pathToFileURL(join(dir, file)).href)) as { benchRows?: () => Promise<BenchRow[]> | BenchRow[] };
    if (mod.benchRows) rows.push(...(await mod.benchRows()));
  }
  return rows;
}

async function main(): Promise<void> {
  const withNumpy = numpyAvailable();
  const notes: string[] = [];
  const rows: BenchRow[] = [];
  const numpyFor = (sys: PreparedSystem, sol: Solution, label: string): NumpyTiming | undefined => {
    if (!withNumpy) return undefined;
    const interior = 2 * sys.links.length;
    if (interior > MAX_DENSE_INTERIOR) {
      notes.push(`${label}: numpy skipped: a dense ${interior} × ${interior} solve at ${sys.frequencies.length} points takes too long to repeat here`);
      return undefined;
    }
    progress(`numpy: ${label} (dense interior ${interior})`);
    const t = timeNumpyDense(sys, RUNS);
    notes.push(
      `${label}: numpy ran ${t.runsMs.length} time${t.runsMs.length === 1 ? "" : "s"}; its composite agrees with Portolan's to ${deviation(sol, t.s).toExponential(1)} (relative)`,
    );
    if (notes.length === 1) notes.unshift(`numpy ${t.numpy}, ${t.blas}, threads: ${JSON.stringify(t.threads)}; OPENBLAS_CORETYPE and OPENBLAS_L2_SIZE unset and OPENBLAS_NUM_THREADS=1 for numpy (Portolan's solve is single-threaded too)`);
    return t;
  };

  // (a) reference front end
  progress("front end");
  const fe = prepareSystem(referenceFrontEnd());
  const prepMs = timeMedian(() => prepareSystem(referenceFrontEnd()), RUNS, 1).median;
  const feSol = solveSystem(fe);
  const feComposite = timeMedian(() => solveSystem(fe), RUNS).median;
  const excitations = unitExcitations(fe);
  const feWaves = timeMedian(() => {
    const sol = solveSystem(fe);
    for (const inc of excitations) internalWaves(sol, inc);
  }, RUNS).median;
  const feNumpy = numpyFor(fe, feSol, "front end");
  rows.push({ name: "front end: prepare (evaluate blocks)", size: describeSize(fe), ms: prepMs });
  rows.push({
    name: "front end: composite",
    size: describeSize(fe),
    ms: feComposite,
    numpyMs: feNumpy?.medianMs,
  });
  rows.push({
    name: `front end: composite + internal waves (${excitations.length} excitations, one per system port)`,
    size: describeSize(fe),
    ms: feWaves,
    numpyMs: feNumpy?.medianMs,
    target: "≤ 30 ms and faster than numpy (numpy: composite only)",
    pass: feWaves <= 30 && (feNumpy === undefined || feWaves < feNumpy.medianMs),
  });

  // (b) chains
  const chainMs: Record<number, number> = {};
  for (const n of [10, 100, 1000]) {
    progress(`chain of ${n}`);
    const sys = prepareSystem(chain(n));
    const sol = solveSystem(sys);
    chainMs[n] = timeMedian(() => solveSystem(sys), RUNS).median;
    const np = numpyFor(sys, sol, `chain of ${n}`);
    rows.push({
      name: `chain of ${n} two-ports: composite`,
      size: describeSize(sys),
      ms: chainMs[n],
      numpyMs: np?.medianMs,
      ...(n === 1000
        ? { target: `≤ 12 × chain of 100 (${(12 * chainMs[100]).toFixed(1)} ms)`, pass: chainMs[1000] <= 12 * chainMs[100] }
        : {}),
    });
  }

  // (c) 64-element array
  progress("64-element array");
  const arr = prepareSystem(array64());
  const arrSol = solveSystem(arr);
  const arrMs = timeMedian(() => solveSystem(arr), RUNS, 1).median;
  const arrNumpy = numpyFor(arr, arrSol, "64-element array");
  rows.push({
    name: "64-element array: composite",
    size: describeSize(arr),
    ms: arrMs,
    numpyMs: arrNumpy?.medianMs,
    target: "≤ 1 s and ≥ 10× faster than numpy",
    pass: arrMs <= 1000 && (arrNumpy === undefined || arrNumpy.medianMs >= 10 * arrMs),
  });

  rows.push(...(await extraRows()));

  console.log(`Portolan benchmark — medians of ${RUNS} runs (Node ${process.version}); numpy medians of up to 7 runs (fewer when a run is slow; see notes)`);
  console.log("");
  console.log(formatTable(rows));
  console.log("");
  if (!withNumpy) console.log("numpy: /usr/bin/python3 with numpy not found, dense comparison skipped");
  for (const note of notes) console.log(note);
}

await main();
