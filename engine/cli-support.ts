// What every `portolan` command shares: its signature, the input error it throws, the exit codes, and
// reading and solving a scenario file. Node only (node:fs); the command table is in engine/cli.ts.
import { readFileSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { parseScenarioText } from "./scenario/parse-scenario";
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

/** Exit code for input that cannot be used (bad scenario, missing file, bad options). */
export const EXIT_BAD_INPUT = 2;

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

/**
 * Reads, validates and solves a scenario file (see readScenarioFile for the errors).
 *
 * @param path - scenario file path (relative to `cwd`)
 * @param cwd - directory for relative paths
 * @returns the solution
 * @example
 * const sol = solveScenarioFile("tests/fixtures/scenarios/telemetry-front-end.json", process.cwd());
 */
export function solveScenarioFile(path: string, cwd: string): Solution {
  const { scenario, readFile } = readScenarioFile(path, cwd);
  return withInputErrors(path, () => solveScenario(scenario, { readFile }));
}
