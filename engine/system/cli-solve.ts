// `portolan solve <scenario.json> [--json] [--out file.sNp]`: the composite S-parameters of a scenario.
import { writeFileSync } from "node:fs";
import { resolve } from "node:path";
import { CliUsageError, MAX_MEMORY_USAGE, readScenarioFile, takeMaxMemory, takeOption, withInputErrors, type CliCommand, type CliIO } from "../cli-support";
import type { Solution } from "../types";
import { solveScenario } from "./solve-scenario";
import { writeCompositeTouchstone } from "../touchstone/composite";
import { solutionToJson } from "./solution-json";

export const SOLVE_USAGE = [
  "portolan solve <scenario.json> [--json] [--out file.sNp] [--max-memory SIZE] [--repeat N]",
  "  Solves the scenario and prints the composite S-parameters of its system ports.",
  "  (default)      Touchstone 1.1 (RI, Hz, R = system Z0); Touchstone 2.0 with [Reference]",
  "                 when system ports have different Z0",
  "  --json         JSON: { frequencies, ports, port_z0, s: [f][i][j] as [re, im], warnings, solve_ms }",
  "  --out FILE     write the Touchstone file to FILE (its name must end .sNp, N = system ports)",
  MAX_MEMORY_USAGE,
  "  --repeat N     solve N times (files read once) and report on stderr the first (cold) solve time and",
  "                 the median of the other (warm) ones; with --json also as { repeat: { runs, first_ms,",
  "                 warm_median_ms } }. The output is the last solve's.",
  "  Part files named in the scenario are read relative to the scenario file.",
  "  Exit codes: 0 success, 2 bad input or over --max-memory (message on stderr), 70 internal error.",
].join("\n");

/**
 * Runs `solve`: prints (or writes) the composite; returns 0, bad input is thrown as CliUsageError.
 * @example await runSolve(["front-end.json", "--json"], io) // 0
 */
export async function runSolve(argv: string[], io: CliIO): Promise<number> {
  if (argv.includes("--help") || argv.includes("-h")) {
    io.out(`${SOLVE_USAGE}\n`);
    return 0;
  }
  const { maxBytes, rest: afterMemory } = takeMaxMemory(argv);
  const { value: repeatText, rest: args } = takeOption(afterMemory, "--repeat");
  const repeat = repeatText === undefined ? 1 : Number(repeatText);
  if (!Number.isInteger(repeat) || repeat < 1 || repeat > 10_000) throw new CliUsageError(`--repeat expects a whole number of runs from 1 to 10000, got "${repeatText}"`);
  let json = false;
  let out: string | undefined;
  const positional: string[] = [];
  for (let i = 0; i < args.length; i++) {
    const arg = args[i];
    if (arg === "--json") json = true;
    else if (arg === "--out" || arg.startsWith("--out=")) {
      out = arg.startsWith("--out=") ? arg.slice(6) : args[++i];
      if (!out) throw new CliUsageError("--out needs a file name, e.g. --out composite.s2p");
    } else if (arg.startsWith("-")) throw new CliUsageError(`unknown option ${arg} (see portolan solve --help)`);
    else positional.push(arg);
  }
  if (positional.length !== 1) throw new CliUsageError("expected exactly one scenario file: portolan solve <scenario.json> [--json] [--out file.sNp]");
  if (json && out) throw new CliUsageError("--json and --out cannot be combined: --out writes Touchstone");
  const { scenario, readFile } = readScenarioFile(positional[0], io.cwd);
  const times: number[] = [];
  let solution: Solution | undefined;
  for (let r = 0; r < repeat; r++) {
    const t0 = performance.now();
    // a plain solve asks for no internal waves, so their maps are not kept
    solution = withInputErrors(positional[0], () => solveScenario(scenario, { readFile, maxBytes, waves: false }));
    times.push(performance.now() - t0);
  }
  if (!solution) throw new Error("no solve ran");
  const timing = repeatText === undefined ? null : repeatTiming(times);
  if (timing) io.err(`${formatRepeat(timing)}\n`);
  const touchstone = () => writeCompositeTouchstone(solution, { scenarioName: solution.system.scenario.name });
  if (out) {
    const n = solution.ports.length;
    if (!new RegExp(`\\.s${n}p$`, "i").test(out)) {
      throw new CliUsageError(`${out}: the composite has ${n} port${n === 1 ? "" : "s"}, so the file name must end .s${n}p`);
    }
    try {
      writeFileSync(resolve(io.cwd, out), touchstone());
    } catch (err) {
      throw new CliUsageError(`${out}: cannot write (${(err as { code?: string }).code ?? String(err)})`);
    }
    for (const w of solution.warnings) io.err(`warning: ${w}\n`);
    return 0;
  }
  io.out(json ? `${JSON.stringify(timing ? { ...solutionToJson(solution), repeat: timing } : solutionToJson(solution))}\n` : touchstone());
  return 0;
}

/** Times of `solve --repeat N`, ms: the first (cold) solve and the median of the others (warm; null when N = 1). */
export type RepeatTiming = { runs: number; first_ms: number; warm_median_ms: number | null };

/**
 * The first time and the median of the rest (the mean of the two middle ones for an even count).
 * @example repeatTiming([90, 8, 7, 9]) // { runs: 4, first_ms: 90, warm_median_ms: 8 }
 */
export function repeatTiming(times: number[]): RepeatTiming {
  const warm = times.slice(1).sort((a, b) => a - b);
  const mid = warm.length >> 1;
  const median = warm.length === 0 ? null : warm.length % 2 === 1 ? warm[mid] : (warm[mid - 1] + warm[mid]) / 2;
  return { runs: times.length, first_ms: times[0], warm_median_ms: median };
}

/**
 * The stderr line of `solve --repeat N`.
 * @example formatRepeat({ runs: 4, first_ms: 90, warm_median_ms: 8 }) // "solve --repeat 4: first (cold) 90.00 ms, median of 3 warm 8.00 ms (prepare + solve; files read once)"
 */
export function formatRepeat(t: RepeatTiming): string {
  const warm = t.warm_median_ms === null ? "no warm runs" : `median of ${t.runs - 1} warm ${t.warm_median_ms.toFixed(2)} ms`;
  return `solve --repeat ${t.runs}: first (cold) ${t.first_ms.toFixed(2)} ms, ${warm} (prepare + solve; files read once)`;
}

export const solveCommand: CliCommand = { summary: "solve a scenario and print its composite S-parameters", usage: SOLVE_USAGE, run: runSolve };
