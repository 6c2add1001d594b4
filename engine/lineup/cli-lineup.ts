// `portolan lineup <scenario.json> --from IN --to OUT [--input-dbm P] [--blocks A,B,C] [--json]`.
import { CliUsageError, MAX_MEMORY_USAGE, readScenarioFile, takeMaxMemory, takeOption, withInputErrors, type CliCommand, type CliIO } from "../cli-support";
import { formatHz } from "../checks/band";
import { prepareSystem } from "../system/prepare-system";
import { lineup, type LineupResult } from "./lineup";

export const LINEUP_USAGE = [
  "portolan lineup <scenario.json> --from IN --to OUT [--input-dbm P] [--blocks A,B,C] [--json] [--max-memory SIZE]",
  "  The line-up from system port IN to system port OUT: per stage and cumulative gain (from the actual",
  "  waves), noise figure, levels for an input level, cascade P1dB and IP3, headroom (docs/checks.md#line-up).",
  "  --input-dbm P  the level entering at IN, dBm: levels and headroom",
  "  --blocks LIST  the blocks along the path, comma-separated (default: the leak trace's strongest path)",
  "  --json         JSON: { frequencies, from, to, gain_db[f], nf_db[f], input_dbm, path, stages[], warnings };",
  "                 each stage { block, kind, in_port, out_port, gain_db[f], cumulative_gain_db[f],",
  "                 cumulative_nf_db[f], p1db_out_dbm, oip3_dbm, cumulative_op1db_dbm[f], cumulative_ip1db_dbm[f],",
  "                 cumulative_oip3_dbm[f], cumulative_iip3_dbm[f], level_in_dbm[f], level_out_dbm[f], headroom_db[f] }",
  "                 (null where a figure is not defined: no input level, no P1dB, no transmission)",
  "  (default)      a stage table at the middle plan point, then the gain and NF range over the plan",
  MAX_MEMORY_USAGE,
  "  Exit codes: 0 success, 2 bad input (message on stderr), 70 internal error.",
].join("\n");

/**
 * The `lineup --json` shape (snake_case like the other commands' JSON).
 * @example lineupToJson(lineup(sys, { from: "IN", to: "OUT" })).nf_db
 */
export function lineupToJson(r: LineupResult): Record<string, unknown> {
  return {
    frequencies: r.frequencies,
    from: r.from,
    to: r.to,
    gain_db: r.gainDb,
    nf_db: r.nfDb,
    input_dbm: r.inputDbm,
    path: { source: r.path.source, frequency_hz: r.path.frequencyHz, text: r.path.text },
    stages: r.stages.map((s) => ({
      block: s.block,
      kind: s.kind,
      in_port: s.inPort,
      out_port: s.outPort,
      gain_db: s.gainDb,
      cumulative_gain_db: s.cumulativeGainDb,
      cumulative_nf_db: s.cumulativeNfDb,
      p1db_out_dbm: s.p1dbOutDbm,
      oip3_dbm: s.oip3Dbm,
      cumulative_op1db_dbm: s.cumulativeOp1dbDbm,
      cumulative_ip1db_dbm: s.cumulativeIp1dbDbm,
      cumulative_oip3_dbm: s.cumulativeOip3Dbm,
      cumulative_iip3_dbm: s.cumulativeIip3Dbm,
      level_in_dbm: s.levelInDbm,
      level_out_dbm: s.levelOutDbm,
      headroom_db: s.headroomDb,
    })),
    warnings: r.warnings,
  };
}

const num = (x: number, digits = 2): string => (Number.isFinite(x) ? x.toFixed(digits) : x > 0 ? "∞" : x < 0 ? "−∞" : "—");

/** The text form: a stage table at the middle plan point, then ranges over the plan. */
function lineupText(r: LineupResult): string {
  const k = Math.floor((r.frequencies.length - 1) / 2);
  const lines = [`line-up ${r.from} → ${r.to} (${r.path.source === "given" ? "given blocks" : "strongest leak-trace path"}): ${r.path.text}`, `at ${formatHz(r.frequencies[k])}${r.inputDbm === null ? "" : `, ${r.inputDbm} dBm in`}:`];
  const head = ["stage", "gain dB", "cum gain dB", "cum NF dB", "cum OIP3 dBm", "cum OP1dB dBm", ...(r.inputDbm === null ? [] : ["out dBm", "headroom dB"])];
  const rows = r.stages.map((s) => [
    `${s.block} ${s.inPort}→${s.outPort}`,
    num(s.gainDb[k]),
    num(s.cumulativeGainDb[k]),
    num(s.cumulativeNfDb[k]),
    num(s.cumulativeOip3Dbm[k]),
    num(s.cumulativeOp1dbDbm[k]),
    ...(r.inputDbm === null ? [] : [num(s.levelOutDbm![k]), s.headroomDb ? num(s.headroomDb[k]) : "—"]),
  ]);
  const widths = head.map((h, c) => Math.max(h.length, ...rows.map((row) => row[c].length)));
  const fmt = (row: string[]) => row.map((v, c) => (c === 0 ? v.padEnd(widths[c]) : v.padStart(widths[c]))).join("  ");
  lines.push(fmt(head), ...rows.map(fmt));
  const range = (xs: number[]) => `${num(Math.min(...xs))} to ${num(Math.max(...xs))} dB`;
  lines.push(`over the plan (${r.frequencies.length} points): gain ${range(r.gainDb)}, noise figure ${range(r.nfDb)}`);
  for (const w of r.warnings) lines.push(`warning: ${w}`);
  return `${lines.join("\n")}\n`;
}

/**
 * Runs `lineup`; bad input is thrown as CliUsageError.
 * @example await runLineup(["front-end.json", "--from", "ANT", "--to", "RX", "--json"], io) // 0
 */
export async function runLineup(argv: string[], io: CliIO): Promise<number> {
  if (argv.includes("--help") || argv.includes("-h")) {
    io.out(`${LINEUP_USAGE}\n`);
    return 0;
  }
  const { maxBytes, rest: a0 } = takeMaxMemory(argv);
  const { value: from, rest: a1 } = takeOption(a0, "--from");
  const { value: to, rest: a2 } = takeOption(a1, "--to");
  const { value: inputText, rest: a3 } = takeOption(a2, "--input-dbm");
  const { value: blocksText, rest: args } = takeOption(a3, "--blocks");
  let json = false;
  const positional: string[] = [];
  for (const arg of args) {
    if (arg === "--json") json = true;
    else if (arg.startsWith("-")) throw new CliUsageError(`unknown option ${arg} (see portolan lineup --help)`);
    else positional.push(arg);
  }
  if (positional.length !== 1) throw new CliUsageError("expected exactly one scenario file: portolan lineup <scenario.json> --from IN --to OUT");
  if (!from || !to) throw new CliUsageError("lineup needs --from and --to, the system ports at the two ends of the path");
  let inputDbm: number | undefined;
  if (inputText !== undefined) {
    inputDbm = Number(inputText);
    if (inputText.trim() === "" || !Number.isFinite(inputDbm)) throw new CliUsageError(`--input-dbm expects a level in dBm, got "${inputText}"`);
  }
  const blocks = blocksText === undefined ? undefined : blocksText.split(",").map((b) => b.trim()).filter(Boolean);
  if (blocks && blocks.length === 0) throw new CliUsageError("--blocks expects block ids separated by commas");
  const { scenario, readFile } = readScenarioFile(positional[0], io.cwd);
  const result = withInputErrors(positional[0], () => lineup(prepareSystem(scenario, { readFile, maxBytes }), { from, to, inputDbm, blocks }));
  io.out(json ? `${JSON.stringify(lineupToJson(result))}\n` : lineupText(result));
  return 0;
}

export const lineupCommand: CliCommand = { summary: "gain, noise figure and linearity along a path", usage: LINEUP_USAGE, run: runLineup };
