// Worker side of the parallel state sweep: evaluates a range of combinations of a transferred system.
import { parentPort } from "node:worker_threads";
import type { PreparedSystem, RuleSpec } from "../types";
import { switchStates, sweepRows, sweepSwitches } from "./state-sweep";

type Job = { sys: PreparedSystem; rules: RuleSpec[]; first: number; last: number };

parentPort?.on("message", (job: Job) => {
  try {
    const states = switchStates(job.sys);
    const throws = sweepSwitches(job.sys).map((s) => s.throws);
    parentPort?.postMessage({ rows: sweepRows(job.sys, job.rules, states, throws, job.first, job.last) });
  } catch (err) {
    parentPort?.postMessage({ error: err instanceof Error ? `${err.name}: ${err.message}` : String(err) });
  }
});
