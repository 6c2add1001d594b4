// What every `portolan` command shares: its signature, the input error it throws, the exit codes, and
// reading and solving a scenario file. Node only (node:fs); the command table is in engine/cli.ts.
import { readFileSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { parseScenarioText } from "./scenario/parse-scenario";
import { DEFAULT_MAX_SOLVE_BYTES, formatBytes } from "./system/estimate";
import { solveScenario } from "./system/solve-scenario";
import { EngineInputError, SingularSystemError, type Scenario, type Solution } from "./types";

/** Where a command writes: injected so that tests can capture output without spawning a process. */
export type CliIO = {
  out: (text: string) => void;
  err: (text: string) => void;
  /** directory that relative paths are resolved against */
  cwd: string;
};

/** One command: `run` returns the exit code; bad input is thrown as CliUsageError. */
export type CliCommand = {
  /** one line shown by --help */
  summary: string;
  /** usage lines shown by --help and on misuse */
  usage: string;
  run: (args: string[], io: CliIO) => Promise<number>;
};

/** Exit code for input that cannot be used (bad scenario, missing file, bad options, over --max-memory). */
export const EXIT_BAD_INPUT = 2;

/**
 * Exit code for an internal error (a bug, not the design or the input): 70, EX_SOFTWARE of BSD sysexits.h
 * (common practice), never 1, so that a CI pipeline cannot read a crash as a failing check.
 */
export const EXIT_INTERNAL = 70;

/** Thrown by commands for bad input; `main` prints the message alone and exits with EXIT_BAD_INPUT. */
export class CliUsageError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "CliUsageError";
  }
}

/**
 * Reads and validates a scenario file, turning every input problem into a CliUsageError whose message
 * starts with the file name: "front-end.json: blocks[2].params.loss_db: expected a number ≥ 0".
 * Part files named in the scenario are read relative to it.
 *
 * @param path - scenario file path (relative to `cwd`)
 * @param cwd - directory for relative paths
 * @returns the parsed scenario and a reader for its part files
 * @example const { scenario, readFile } = readScenarioFile("front-end.json", process.cwd());
 */
export function readScenarioFile(path: string, cwd: string): { scenario: Scenario; readFile: (rel: string) => string } {
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
  return { scenario: withInputErrors(path, () => parseScenarioText(text, { readFile })), readFile };
}

/**
 * Runs `fn`, turning the engine's input errors (and a singular interconnection) into a CliUsageError
 * prefixed with the file name.
 *
 * @example withInputErrors("a.json", () => solveScenario(scenario))
 */
export function withInputErrors<T>(path: string, fn: () => T): T {
  try {
    return fn();
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

/** How a command solves: the memory limit and whether internal-wave maps are kept. */
export type SolveFileOptions = {
  /** refuse a scenario whose estimated size is over this (default DEFAULT_MAX_SOLVE_BYTES) */
  maxBytes?: number;
  /** keep what internalWaves needs (default true; `solve` alone does not need it) */
  waves?: boolean;
};

/**
 * Reads, validates and solves a scenario file (see readScenarioFile for the errors); a scenario over the
 * memory limit is refused before it is evaluated, with the estimate, the limit and what to reduce.
 *
 * @param path - scenario file path (relative to `cwd`)
 * @param cwd - directory for relative paths
 * @param opts - memory limit and waves
 * @returns the solution
 * @example
 * const sol = solveScenarioFile("tests/fixtures/scenarios/telemetry-front-end.json", process.cwd());
 */
export function solveScenarioFile(path: string, cwd: string, opts: SolveFileOptions = {}): Solution {
  const { scenario, readFile } = readScenarioFile(path, cwd);
  return withInputErrors(path, () => solveScenario(scenario, { readFile, maxBytes: opts.maxBytes ?? DEFAULT_MAX_SOLVE_BYTES, waves: opts.waves }));
}

const BYTE_UNITS: Record<string, number> = { "": 1, b: 1, k: 1e3, kb: 1e3, kib: 1024, m: 1e6, mb: 1e6, mib: 1024 ** 2, g: 1e9, gb: 1e9, gib: 1024 ** 3, t: 1e12, tb: 1e12, tib: 1024 ** 4 };

/**
 * Parses a memory size as people write it: "2GB" (10⁹), "2GiB" (2³⁰), "512MiB", "1.5G", "4096" (bytes).
 *
 * @throws CliUsageError naming the option for anything else
 * @example parseByteSize("2GiB", "--max-memory") // 2147483648
 */
export function parseByteSize(text: string, option: string): number {
  const m = /^\s*(\d+(?:\.\d+)?)\s*([a-z]*)\s*$/i.exec(text);
  const unit = m ? BYTE_UNITS[m[2].toLowerCase()] : undefined;
  if (!m || unit === undefined || !(Number(m[1]) > 0)) {
    throw new CliUsageError(`${option} expects a size such as 2GB, 2GiB, 512MB or a number of bytes, got "${text}"`);
  }
  return Number(m[1]) * unit;
}

/** Usage line of --max-memory, shared by the commands that solve. */
export const MAX_MEMORY_USAGE = `  --max-memory SIZE  refuse a scenario whose estimated solve needs more (default ${formatBytes(DEFAULT_MAX_SOLVE_BYTES)}; e.g. 8GB, 512MiB)`;

/**
 * Takes `--name VALUE` or `--name=VALUE` out of an argument list.
 *
 * @returns the value (undefined when absent) and the other arguments in order
 * @throws CliUsageError when the option is given without a value or more than once
 * @example takeOption(["a.json", "--max-memory", "1GB"], "--max-memory") // { value: "1GB", rest: ["a.json"] }
 */
export function takeOption(args: string[], name: string): { value: string | undefined; rest: string[] } {
  let value: string | undefined;
  const rest: string[] = [];
  for (let i = 0; i < args.length; i++) {
    const arg = args[i];
    if (arg !== name && !arg.startsWith(`${name}=`)) {
      rest.push(arg);
      continue;
    }
    if (value !== undefined) throw new CliUsageError(`${name} is given more than once`);
    value = arg === name ? args[++i] : arg.slice(name.length + 1);
    if (value === undefined || value === "") throw new CliUsageError(`${name} needs a value`);
  }
  return { value, rest };
}

/**
 * Takes --max-memory out of the arguments.
 *
 * @returns the limit in bytes (DEFAULT_MAX_SOLVE_BYTES when absent) and the other arguments
 * @example takeMaxMemory(["a.json", "--max-memory=8GB"]) // { maxBytes: 8e9, rest: ["a.json"] }
 */
export function takeMaxMemory(args: string[]): { maxBytes: number; rest: string[] } {
  const { value, rest } = takeOption(args, "--max-memory");
  return { maxBytes: value === undefined ? DEFAULT_MAX_SOLVE_BYTES : parseByteSize(value, "--max-memory"), rest };
}
