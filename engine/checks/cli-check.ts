// The `portolan check <scenario.json> [--json]` command: solve, run every rule and built-in check, print
// a table (or JSON), exit 0 when all pass, 1 when any fails, 2 on bad input.
import { CliUsageError, MAX_MEMORY_USAGE, solveScenarioFile, takeMaxMemory, type CliIO } from "../cli-support";
import { formatHz } from "./band";
import { runAllChecks, type AllChecksResult } from "./run-all";

export const CHECK_USAGE = [
  "portolan check <scenario.json> [--json] [--max-memory SIZE]",
  "  Solves the scenario, runs its rules and the built-in checks (power ledger closure, passivity,",
  "  reciprocity where expected, stability of active blocks and of a composite holding one) and prints a table of verdicts.",
  "  --json         print every result as JSON instead",
  MAX_MEMORY_USAGE,
  "  Exit codes: 0 all pass (warnings allowed), 1 any check fails, 2 bad input or over --max-memory",
  "  (message on stderr), 70 internal error.",
].join("\n");

/**
 * The check results as a readable table: one line per check with verdict and headline figure, then the
 * warnings.
 * @example process.stdout.write(formatCheckTable(runAllChecks(sc, sys, sol)))
 */
export function formatCheckTable(r: AllChecksResult): string {
  const lines: string[] = [];
  lines.push(`Scenario "${r.scenario}" (${r.points} plan points): ${r.verdict.toUpperCase()}`);
  lines.push("");
  const rows: [string, string, string][] = [["verdict", "check", "figures"]];
  for (const x of r.rules) {
    const fig = Number.isFinite(x.margin)
      ? `worst ${x.worst.toFixed(2)} ${x.unit}${x.direction ? ` (${x.direction})` : ""} at ${formatHz(x.worstHz)}; limit ${x.limit.toFixed(2)} ${x.unit}; margin ${x.margin >= 0 ? "+" : ""}${x.margin.toFixed(2)} ${x.unit === "dBm" ? "dB" : x.unit}`
      : x.messages[0] ?? "";
    rows.push([x.verdict, `rule ${x.id} (${x.kind})`, fig]);
  }
  for (const l of r.ledgers) rows.push([l.verdict, `ledger ${l.port}`, `closure ${l.worstClosure.toExponential(2)} at ${formatHz(l.worstClosureHz)}`]);
  const q = r.dataQuality;
  rows.push([q.passivity, "passivity", `composite σmax ${q.composite.maxSingular.toFixed(9)} at ${formatHz(q.composite.maxSingularHz)}`]);
  rows.push([q.reciprocity, "reciprocity", `composite max|Sij−Sji| ${q.composite.reciprocityError.toExponential(2)}${q.composite.expectReciprocal ? "" : " (not expected)"}`]);
  for (const s of r.stability) rows.push([s.verdict, `stability ${s.subject}`, `min K ${s.minK === null ? "∞" : s.minK.toFixed(3)}, max |Δ| ${s.maxDelta.toFixed(3)}, min μ ${s.minMu === null ? "∞" : s.minMu.toFixed(3)}`]);
  const w0 = Math.max(...rows.map((x) => x[0].length));
  const w1 = Math.max(...rows.map((x) => x[1].length));
  for (const [a, b, c] of rows) lines.push(`${(a === "verdict" ? a : a.toUpperCase()).padEnd(w0)}  ${b.padEnd(w1)}  ${c}`);
  const notes = r.checks.filter((c) => c.verdict !== "pass").flatMap((c) => c.messages.slice(0, 3).map((m) => `  ${m}`));
  if (notes.length > 0) lines.push("", "Details:", ...notes);
  if (r.warnings.length > 0) lines.push("", "Warnings:", ...r.warnings.map((w) => `  ${w}`));
  if (r.notes.length > 0) lines.push("", "Notes:", ...r.notes.map((w) => `  ${w}`));
  return `${lines.join("\n")}\n`;
}

/**
 * Runs `check`: returns the exit code (0 all pass, 1 any fails); bad input is thrown as CliUsageError
 * (the dispatcher in engine/cli.ts prints it and exits with 2).
 * @param args arguments after "check"
 * @param io output sinks and working directory
 * @example await runCheck(["front-end.json", "--json"], io) // 0
 */
export async function runCheck(argv: string[], io: CliIO): Promise<number> {
  if (argv.includes("--help") || argv.includes("-h")) {
    io.out(`${CHECK_USAGE}\n`);
    return 0;
  }
  const { maxBytes, rest: args } = takeMaxMemory(argv);
  let json = false;
  const positional: string[] = [];
  for (const arg of args) {
    if (arg === "--json") json = true;
    else if (arg.startsWith("-")) throw new CliUsageError(`unknown option ${arg} (see portolan check --help)`);
    else positional.push(arg);
  }
  if (positional.length !== 1) throw new CliUsageError("expected exactly one scenario file: portolan check <scenario.json> [--json]");
  const solution = solveScenarioFile(positional[0], io.cwd, { maxBytes });
  const scenario = solution.system.scenario;
  let result: AllChecksResult;
  try {
    result = runAllChecks(scenario, solution.system, solution);
  } catch (err) {
    if (err instanceof Error && err.name === "EngineInputError") throw new CliUsageError(`${positional[0]}: ${err.message}`);
    throw err;
  }
  io.out(json ? `${JSON.stringify(result)}\n` : formatCheckTable(result));
  return result.verdict === "fail" ? 1 : 0;
}
