/**
 * One cold solve in this (fresh) process: prepareSystem, then the first solveSystem of the bench front
 * end, each timed once (wall and this process's CPU time). Bundled by esbuild and run in new Node
 * processes by tests/bench/cold.ts, as the CLI runs: prints one JSON line.
 */
import { solveSystem } from "../../engine/network";
import { prepareSystem } from "../../engine/system";
import { referenceFrontEnd } from "./scenarios";

const cpuMs = (): number => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
};

const scenario = referenceFrontEnd(...(process.env.POINTS ? [Number(process.env.POINTS)] : []));
const w0 = performance.now();
const c0 = cpuMs();
const sys = prepareSystem(scenario);
const w1 = performance.now();
const c1 = cpuMs();
solveSystem(sys, { waves: false });
const w2 = performance.now();
const c2 = cpuMs();
process.stdout.write(`${JSON.stringify({ prepareMs: w1 - w0, prepareCpuMs: c1 - c0, solveMs: w2 - w1, solveCpuMs: c2 - c1 })}\n`);
