/**
 * The `portolan` command line: `portolan solve <scenario.json> [--json] [--out file.sNp]`.
 *
 * Commands live in a table so that other areas add their own (the checks add `check`): a module
 * listed in OPTIONAL_COMMAND_MODULES is imported when present and its exported `cliCommands` are
 * registered; code may also call registerCommand directly.
 * Exit codes: 0 success, 2 bad input (one message on stderr), 1 an internal error.
 */
import { readFileSync, writeFileSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { pathToFileURL } from "node:url";
import { parseScenarioText } from "./scenario/parse-scenario";
import { solveScenario } from "./system/solve-scenario";
import { writeTouchstone } from "./touchstone";
import { EngineInputError, SingularSystemError, type Solution } from "./types";

/** Where a command writes: injected so that tests can capture output without spawning a process. */
export type CliIO = {
  out: (text: string) => void;
  err: (text: string) => void;
  /** directory that relative paths are resolved against */
  cwd: string;
};

/** One command: `run` returns the exit code (0 success, 2 bad input, 1 internal error). */
export type CliCommand = {
  /** one line shown by --help */
  summary: string;
  /** usage lines shown by --help and on misuse */
  usage: string;
  run: (args: string[], io: CliIO) => Promise<number>;
};

/** Exit code for input that cannot be used (bad scenario, missing file, bad options). */
export const EXIT_BAD_INPUT = 2;

/** The command table, by name. */
export const commands: Record<string, CliCommand> = {};

/**
 * Adds a command to the table (a later registration of the same name replaces the earlier one).
 *
 * @param name - the word typed after `portolan`, e.g. "check"
 * @param command - summary, usage and the function that runs it
 * @example
 * registerCommand("check", { summary: "run the scenario's rules", usage: "portolan check <scenario.json>", run });
 */
export function registerCommand(name: string, command: CliCommand): void {
  commands[name] = command;
}

/** Modules that may add commands; each may export `cliCommands: Record<string, CliCommand>`. */
export const OPTIONAL_COMMAND_MODULES = ["./checks/cli-check", "./bundle/cli-bundle"];

/**
 * Imports the optional command modules that exist and registers their commands.
 *
 * @returns names of the commands registered
 * @example
 * await loadCommandModules(); // ["check"] once engine/checks/cli-check.ts exists
 */
export async function loadCommandModules(): Promise<string[]> {
  const added: string[] = [];
  for (const path of OPTIONAL_COMMAND_MODULES) {
    let mod: { cliCommands?: Record<string, CliCommand> };
    try {
      mod = (await import(path)) as typeof mod;
    } catch (err) {
      const code = (err as { code?: string }).code;
      const missing = code === "ERR_MODULE_NOT_FOUND" && String((err as Error).message).includes(path.slice(2));
      if (missing) continue;
      throw err;
    }
    for (const [name, command] of Object.entries(mod.cliCommands ?? {})) {
      registerCommand(name, command);
      added.push(name);
    }
  }
  return added;
}

/** Thrown by commands for bad input; `main` prints the message alone and exits with 2. */
export class CliUsageError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "CliUsageError";
  }
}

function usageText(): string {
  const lines = ["Usage: portolan <command> [options]", "", "Commands:"];
  for (const [name, command] of Object.entries(commands)) lines.push(`  ${name.padEnd(8)} ${command.summary}`);
  lines.push("", "Run `portolan <command> --help` for a command's options.");
  for (const command of Object.values(commands)) lines.push("", command.usage);
  return `${lines.join("\n")}\n`;
}

const SOLVE_USAGE = [
  "portolan solve <scenario.json> [--json] [--out file.sNp]",
  "  Solves the scenario and prints the composite S-parameters of its system ports.",
  "  (default)      Touchstone 1.1 (RI, Hz, R = system Z0); Touchstone 2.0 with [Reference]",
  "                 when system ports have different Z0",
  "  --json         JSON: { frequencies, ports, s: [f][i][j] as [re, im], warnings, solve_ms }",
  "  --out FILE     write the Touchstone file to FILE (its name must end .sNp, N = system ports)",
  "  Part files named in the scenario are read relative to the scenario file.",
  "  Exit codes: 0 success, 2 bad input (message on stderr), 1 internal error.",
].join("\n");

/**
 * The composite of a solution as Touchstone text: version 1.1 when every system port has the same Z0,
 * else version 2.0 with [Reference]; comments give the scenario name, port order and warnings.
 *
 * @param solution - the solved scenario
 * @returns Touchstone text (RI, Hz)
 * @example
 * writeFileSync("front-end.s3p", solutionToTouchstone(solveScenario(scenario)));
 */
export function solutionToTouchstone(solution: Solution): string {
  const z0s = solution.portZ0;
  const uniform = z0s.every((z) => z === z0s[0]);
  const comments = [
    `Portolan composite of scenario "${solution.system.scenario.name}"`,
    ...solution.ports.map((name, i) => `port ${i + 1}: ${name} (Z0 ${z0s[i]} ohm)`),
    ...solution.warnings.map((w) => `warning: ${w}`),
  ];
  const z0: number | Float64Array = uniform ? z0s[0] : Float64Array.from(z0s.flatMap((z) => [z, 0]));
  return writeTouchstone(
    { frequencies: solution.frequencies, s: solution.s, z0, comments },
    { version: uniform ? "1.1" : "2.0", format: "RI", unit: "Hz" },
  );
}

/**
 * The composite of a solution as the CLI's JSON shape.
 *
 * @param solution - the solved scenario
 * @returns `{ frequencies (Hz), ports, s: [f][i][j] as [re, im], warnings, solve_ms }`
 * @example
 * JSON.stringify(solutionToJson(sol)).length > 0;
 */
export function solutionToJson(solution: Solution): {
  frequencies: number[];
  ports: string[];
  port_z0: number[];
  s: [number, number][][][];
  warnings: string[];
  solve_ms: number;
} {
  const { n, nf, data } = solution.s;
  const s: [number, number][][][] = [];
  for (let k = 0; k < nf; k++) {
    const rows: [number, number][][] = [];
    for (let i = 0; i < n; i++) {
      const row: [number, number][] = [];
      for (let j = 0; j < n; j++) {
        const at = 2 * ((k * n + i) * n + j);
        row.push([data[at], data[at + 1]]);
      }
      rows.push(row);
    }
    s.push(rows);
  }
  return {
    frequencies: Array.from(solution.frequencies),
    ports: solution.ports.slice(),
    port_z0: solution.portZ0.slice(),
    s,
    warnings: solution.warnings.slice(),
    solve_ms: solution.solveMs,
  };
}

/**
 * Reads, validates and solves a scenario file, turning every input problem into a CliUsageError whose
 * message starts with the file name: "front-end.json: blocks[2].params.loss_db: expected a number ≥ 0".
 *
 * @param path - scenario file path (relative to `cwd`)
 * @param cwd - directory for relative paths
 * @returns the solution
 * @example
 * const sol = solveScenarioFile("tests/fixtures/scenarios/telemetry-front-end.json", process.cwd());
 */
export function solveScenarioFile(path: string, cwd: string): Solution {
  const full = resolve(cwd, path);
  let text: string;
  try {
    text = readFileSync(full, "utf8");
  } catch (err) {
    const code = (err as { code?: string }).code;
    throw new CliUsageError(`${path}: cannot read scenario file${code === "ENOENT" ? ": no such file" : code ? ` (${code})` : ""}`);
  }
  const base = dirname(full);
  const readFile = (rel: string): string => {
    try {
      return readFileSync(resolve(base, rel), "utf8");
    } catch (err) {
      const code = (err as { code?: string }).code;
      throw new Error(code === "ENOENT" ? "no such file" : code ?? String(err));
    }
  };
  try {
    return solveScenario(parseScenarioText(text, { readFile }), { readFile });
  } catch (err) {
    if (err instanceof EngineInputError) throw new CliUsageError(`${path}: ${err.message}`);
    if (err instanceof SingularSystemError) {
      // the message names the frequency and the links taking part
      const links = err.links.length > 0 && !err.links.every((l) => err.message.includes(l)) ? ` (links: ${err.links.join(", ")})` : "";
      throw new CliUsageError(`${path}: ${err.message}${links}`);
    }
    throw err;
  }
}

async function runSolve(args: string[], io: CliIO): Promise<number> {
  let json = false;
  let out: string | undefined;
  const positional: string[] = [];
  for (let i = 0; i < args.length; i++) {
    const arg = args[i];
    if (arg === "--help" || arg === "-h") {
      io.out(`${SOLVE_USAGE}\n`);
      return 0;
    }
    if (arg === "--json") json = true;
    else if (arg === "--out" || arg.startsWith("--out=")) {
      out = arg.startsWith("--out=") ? arg.slice(6) : args[++i];
      if (!out) throw new CliUsageError("--out needs a file name, e.g. --out composite.s2p");
    } else if (arg.startsWith("-")) throw new CliUsageError(`unknown option ${arg} (see portolan solve --help)`);
    else positional.push(arg);
  }
  if (positional.length !== 1) throw new CliUsageError("expected exactly one scenario file: portolan solve <scenario.json> [--json] [--out file.sNp]");
  if (json && out) throw new CliUsageError("--json and --out cannot be combined: --out writes Touchstone");
  const solution = solveScenarioFile(positional[0], io.cwd);
  if (out) {
    const n = solution.ports.length;
    if (!new RegExp(`\\.s${n}p$`, "i").test(out)) {
      throw new CliUsageError(`${out}: the composite has ${n} port${n === 1 ? "" : "s"}, so the file name must end .s${n}p`);
    }
    try {
      writeFileSync(resolve(io.cwd, out), solutionToTouchstone(solution));
    } catch (err) {
      throw new CliUsageError(`${out}: cannot write (${(err as { code?: string }).code ?? String(err)})`);
    }
    for (const w of solution.warnings) io.err(`warning: ${w}\n`);
    return 0;
  }
  io.out(json ? `${JSON.stringify(solutionToJson(solution))}\n` : solutionToTouchstone(solution));
  return 0;
}

registerCommand("solve", { summary: "solve a scenario and print its composite S-parameters", usage: SOLVE_USAGE, run: runSolve });

/**
 * Runs the command line: dispatches to a registered command, prints usage for --help, turns input
 * errors into one message on stderr and exit code 2.
 *
 * @param argv - the arguments after the program name, e.g. ["solve", "front-end.json", "--json"]
 * @param io - output sinks and working directory
 * @returns the exit code
 * @example
 * const code = await main(["solve", "demo.json"], { out: (t) => process.stdout.write(t), err: (t) => process.stderr.write(t), cwd: process.cwd() });
 */
export async function main(argv: string[], io: CliIO): Promise<number> {
  await loadCommandModules();
  const [name, ...rest] = argv;
  if (name === undefined) {
    io.err(usageText());
    return EXIT_BAD_INPUT;
  }
  if (name === "--help" || name === "-h" || name === "help") {
    io.out(usageText());
    return 0;
  }
  const command = commands[name];
  if (!command) {
    io.err(`unknown command "${name}"; commands: ${Object.keys(commands).join(", ")} (see portolan --help)\n`);
    return EXIT_BAD_INPUT;
  }
  try {
    return await command.run(rest, io);
  } catch (err) {
    if (err instanceof CliUsageError) {
      io.err(`${err.message}\n`);
      return EXIT_BAD_INPUT;
    }
    if (err instanceof EngineInputError) {
      io.err(`${err.message}\n`);
      return EXIT_BAD_INPUT;
    }
    io.err(`internal error: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}\n`);
    return 1;
  }
}

const invokedDirectly = process.argv[1] !== undefined && import.meta.url === pathToFileURL(resolve(process.argv[1])).href;
if (invokedDirectly) {
  void main(process.argv.slice(2), {
    out: (t) => process.stdout.write(t),
    err: (t) => process.stderr.write(t),
    cwd: process.cwd(),
  }).then((code) => {
    process.exitCode = code;
  });
}
