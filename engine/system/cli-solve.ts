// `portolan solve <scenario.json> [--json] [--out file.sNp]`: the composite S-parameters of a scenario.
import { writeFileSync } from "node:fs";
import { resolve } from "node:path";
import { CliUsageError, MAX_MEMORY_USAGE, solveScenarioFile, takeMaxMemory, type CliCommand, type CliIO } from "../cli-support";
import { writeCompositeTouchstone } from "../touchstone/composite";
import { solutionToJson } from "./solution-json";

export const SOLVE_USAGE = [
  "portolan solve <scenario.json> [--json] [--out file.sNp] [--max-memory SIZE]",
  "  Solves the scenario and prints the composite S-parameters of its system ports.",
  "  (default)      Touchstone 1.1 (RI, Hz, R = system Z0); Touchstone 2.0 with [Reference]",
  "                 when system ports have different Z0",
  "  --json         JSON: { frequencies, ports, port_z0, s: [f][i][j] as [re, im], warnings, solve_ms }",
  "  --out FILE     write the Touchstone file to FILE (its name must end .sNp, N = system ports)",
  MAX_MEMORY_USAGE,
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
  const { maxBytes, rest: args } = takeMaxMemory(argv);
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
  // a plain solve asks for no internal waves, so their maps are not kept
  const solution = solveScenarioFile(positional[0], io.cwd, { maxBytes, waves: false });
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
  io.out(json ? `${JSON.stringify(solutionToJson(solution))}\n` : touchstone());
  return 0;
}

export const solveCommand: CliCommand = { summary: "solve a scenario and print its composite S-parameters", usage: SOLVE_USAGE, run: runSolve };
