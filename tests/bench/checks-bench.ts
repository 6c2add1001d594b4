/**
 * Benchmark rows of the integration checks: the state sweep of the reference front end (3 SP4T and
 * 2 SPDT switches, 256 combinations, 201 points, its rules) and a leak trace on the 64-element array.
 * Registered through tests/bench/rows/checks.ts (the bench index loads every module in rows/).
 */
import { leakTrace, stateSweep } from "../../engine/checks";
import { solveSystem } from "../../engine/network";
import { prepareSystem } from "../../engine/system";
import { array64, referenceFrontEnd } from "./scenarios";
import { timeMedian, type BenchRow } from "./timing";

/**
 * The checks' rows of `npm run bench`.
 * @returns two rows with targets (sweep ≤ 2 s, leak trace ≤ 300 ms)
 * @example const rows = await benchRows();
 */
export async function benchRows(): Promise<BenchRow[]> {
  const rows: BenchRow[] = [];

  const fe = prepareSystem(referenceFrontEnd(201));
  let sweep = stateSweep(fe);
  const sweepT = timeMedian(() => { sweep = stateSweep(fe); }, 5, 2);
  const sweepMs = sweepT.median;
  rows.push({
    name: `state sweep: front end, ${sweep.combinations} combinations × ${sweep.rules.length} rules`,
    size: `${fe.blocks.length} blocks, ${fe.blockPorts.length} ports, ${fe.frequencies.length} pts`,
    ms: sweepMs,
    cpuMs: sweepT.cpuMedian,
    target: "≤ 2 s",
    pass: sweepMs <= 2000,
    passCpu: sweepT.cpuMedian <= 2000,
    note: `${sweep.passing} combinations pass, ${sweep.failing} fail`,
  });

  const arr = prepareSystem(array64());
  const arrSol = solveSystem(arr);
  let trace = leakTrace(arrSol, { from: "SUM", to: "SUM", frequencyHz: 9.5e9 });
  // warm runs: the first call in a process also pays JIT compilation of the slice, plan and path search
  const traceT = timeMedian(() => { trace = leakTrace(arrSol, { from: "SUM", to: "SUM", frequencyHz: 9.5e9 }); }, 7, 3);
  const traceMs = traceT.median;
  rows.push({
    name: `leak trace: 64-element array, SUM reflection, ${trace.paths.length} paths + ${trace.whatIf.length} ideal-block what-ifs`,
    size: `${arr.blocks.length} blocks, ${arr.blockPorts.length} ports, 1 of ${arr.frequencies.length} pts`,
    ms: traceMs,
    cpuMs: traceT.cpuMedian,
    target: "≤ 300 ms",
    pass: traceMs <= 300,
    passCpu: traceT.cpuMedian <= 300,
  });
  return rows;
}
