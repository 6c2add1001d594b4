/**
 * The `portolan` command line. Commands are entries of one static table (COMMANDS below): a new command
 * is a module exporting a CliCommand and one line in the table.
 * Exit codes: 0 success, 2 bad input or a scenario over --max-memory (one message on stderr), 70 an
 * internal error (EX_SOFTWARE); commands document their own further codes (check: 1 a failing check,
 * 3 a bundle tampered or not reproduced; spread: 1 a yield below --min-yield). 1 never means a crash.
 */
import { realpathSync } from "node:fs";
import { resolve } from "node:path";
import { pathToFileURL } from "node:url";
import { checkCommand } from "./bundle/cli-bundle";
import { CliUsageError, EXIT_BAD_INPUT, EXIT_INTERNAL, type CliCommand, type CliIO } from "./cli-support";
import { spreadCommand } from "./spread/cli-spread";
import { lineupCommand } from "./lineup/cli-lineup";
import { solveCommand } from "./system/cli-solve";
import { EngineInputError } from "./types";

export { CliUsageError, EXIT_BAD_INPUT, EXIT_INTERNAL, solveScenarioFile, type CliCommand, type CliIO } from "./cli-support";

/** The command table, by the word typed after `portolan`. */
export const COMMANDS: Readonly<Record<string, CliCommand>> = {
  solve: solveCommand,
  // scenarios and review bundles (.zip)
  check: checkCommand,
  spread: spreadCommand,
  lineup: lineupCommand,
};

function realPath(path: string): string {
  try {
    return realpathSync(path);
  } catch {
    return path;
  }
}

function usageText(): string {
  const lines = ["Usage: portolan <command> [options]", "", "Commands:"];
  for (const [name, command] of Object.entries(COMMANDS)) lines.push(`  ${name.padEnd(8)} ${command.summary}`);
  lines.push("", "Run `portolan <command> --help` for a command's options.");
  lines.push("Exit codes: 0 success, 2 bad input or over --max-memory, 70 internal error; check adds 1 (a check fails) and 3 (bundle not reproduced); spread adds 1 (a yield below --min-yield).");
  for (const command of Object.values(COMMANDS)) lines.push("", command.usage);
  return `${lines.join("\n")}\n`;
}

/**
 * Runs the command line: dispatches to a command of the table, prints usage for --help, turns input
 * errors into one message on stderr and exit code 2.
 *
 * @param argv - the arguments after the program name, e.g. ["solve", "front-end.json", "--json"]
 * @param io - output sinks and working directory
 * @returns the exit code
 * @example
 * const code = await main(["solve", "demo.json"], { out: (t) => process.stdout.write(t), err: (t) => process.stderr.write(t), cwd: process.cwd() });
 */
export async function main(argv: string[], io: CliIO): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined) {
    io.err(usageText());
    return EXIT_BAD_INPUT;
  }
  if (name === "--help" || name === "-h" || name === "help") {
    io.out(usageText());
    return 0;
  }
  const command = Object.hasOwn(COMMANDS, name) ? COMMANDS[name] : undefined;
  if (!command) {
    io.err(`unknown command "${name}"; commands: ${Object.keys(COMMANDS).join(", ")} (see portolan --help)\n`);
    return EXIT_BAD_INPUT;
  }
  try {
    return await command.run(rest, io);
  } catch (err) {
    if (err instanceof CliUsageError || err instanceof EngineInputError) {
      io.err(`${err.message}\n`);
      return EXIT_BAD_INPUT;
    }
    io.err(`internal error (exit ${EXIT_INTERNAL}): ${err instanceof Error ? (err.stack ?? err.message) : String(err)}\n`);
    return EXIT_INTERNAL;
  }
}

// Run when this file (or the bundle built from it, dist/portolan.mjs) is the program: through a symlink
// such as node_modules/.bin/portolan too, hence the real path.
const invokedDirectly = process.argv[1] !== undefined && import.meta.url === pathToFileURL(realPath(resolve(process.argv[1]))).href;
if (invokedDirectly) {
  void main(process.argv.slice(2), {
    out: (t) => process.stdout.write(t),
    err: (t) => process.stderr.write(t),
    cwd: process.cwd(),
  }).then((code) => {
    process.exitCode = code;
  });
}
