// `portolan spread <scenario.json> --samples N --seed S [--min-yield Y] [--json]`: the spread analysis of a
// scenario's rules (docs/checks.md "Spread analysis").
import { mkdirSync, writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { CliUsageError, MAX_MEMORY_USAGE, readScenarioFile, takeMaxMemory, takeOption, withInputErrors, type CliCommand, type CliIO } from "../cli-support";
import { prepareSystem } from "../system/prepare-system";
import { runSpread, sampleScenario, MAX_SPREAD_SAMPLES, type SpreadResult } from "./analyse";

export const SPREAD_USAGE = [
  "portolan spread <scenario.json> --samples N --seed S [--min-yield Y] [--json] [--max-memory SIZE]",
  "  Samples the blocks' spreads N times (seeded: the same seed gives the same samples), solves every",
  "  sample and prints, for every rule, the yield (passing fraction) with its 95% Wilson interval, the",
  "  nominal margin, the worst sample and the parameters ranked by Spearman correlation with the margin.",
  `  --samples N    number of samples, 1 to ${MAX_SPREAD_SAMPLES}`,
  "  --seed S       seed of the generator, a whole number",
  "  --min-yield Y  required yield, 0 to 1: exit 1 when a rule's lower Wilson bound is below it",
  "  --json         JSON: { samples, seed, rules: [{ id, passed, total, yield, low, high, nominal_margin,",
  "                 worst, sensitivity }], envelopes: [{ rule, quantity, frequencies, nominal, p5, p50, p95 }]",
  "                 (dB), parameters, warnings }",
  "  --save-worst DIR  write each rule's worst sample as a scenario, DIR/worst-<rule id>.json (part data inline)",
  MAX_MEMORY_USAGE,
  "  Exit codes: 0 every rule's lower bound meets --min-yield (always without it), 1 some rule's does not,",
  "  2 bad input (message on stderr), 70 internal error.",
].join("\n");

function wholeNumber(text: string | undefined, option: string, min: number, max: number): number {
  if (text === undefined) throw new CliUsageError(`${option} is required (see portolan spread --help)`);
  const v = Number(text);
  if (!/^[+-]?\d+$/.test(text.trim()) || !Number.isSafeInteger(v) || v < min || v > max) {
    throw new CliUsageError(`${option} expects a whole number from ${min} to ${max}, got "${text}"`);
  }
  return v;
}

function percent(x: number): string {
  return `${(100 * x).toFixed(1)}%`;
}

/**
 * The analysis as a readable table: one line per rule with yield, interval, nominal margin and the
 * parameter that matters most, then the worst samples.
 * @example io.out(formatSpreadTable(result, 0.9))
 */
export function formatSpreadTable(r: SpreadResult, minYield: number | undefined): string {
  const lines = [`Scenario "${r.scenario}": ${r.samples} samples, seed ${r.seed}; spreads: ${r.parameters.map((p) => `${p.name} ${p.distribution === "uniform" ? "±" : "σ "}${p.amount}${p.unit ? ` ${p.unit}` : ""}`).join(", ")}`, ""];
  const rows: string[][] = [["rule", "yield", "95% interval", "nominal margin", "driven by (Spearman ρ)"]];
  for (const x of r.rules) {
    const top = x.sensitivity[0];
    rows.push([
      `${x.id} (${x.kind})`,
      `${percent(x.yield)} (${x.passed}/${x.total})`,
      `${percent(x.low)}–${percent(x.high)}${minYield !== undefined && x.low < minYield ? " BELOW" : ""}`,
      Number.isFinite(x.nominal_margin) ? `${x.nominal_margin >= 0 ? "+" : ""}${x.nominal_margin.toFixed(2)} dB` : "—",
      top && top.rho !== null ? `${top.name} (${top.rho.toFixed(2)})` : "—",
    ]);
  }
  const widths = rows[0].map((_, c) => Math.max(...rows.map((row) => row[c].length)));
  for (const row of rows) lines.push(row.map((cell, c) => cell.padEnd(widths[c])).join("  ").trimEnd());
  const worst = r.rules.filter((x) => x.worst);
  if (worst.length > 0) {
    lines.push("", "Worst samples:");
    for (const x of worst) {
      const w = x.worst!;
      lines.push(`  ${x.id}: sample ${w.sample}, margin ${w.margin >= 0 ? "+" : ""}${w.margin.toFixed(2)} dB at ${Object.entries(w.values).map(([k, v]) => `${k} = ${Number(v.toPrecision(6))}`).join(", ")}`);
    }
  }
  if (minYield !== undefined) lines.push("", `Required yield ${percent(minYield)} (lower Wilson bound): ${r.rules.every((x) => x.low >= minYield) ? "MET" : "NOT MET"}`);
  if (r.warnings.length > 0) lines.push("", "Warnings:", ...r.warnings.map((w) => `  ${w}`));
  return `${lines.join("\n")}\n`;
}

/**
 * Runs `spread`: returns 0, or 1 when some rule's lower bound is below --min-yield; bad input is thrown
 * as CliUsageError (exit 2 from the dispatcher).
 * @example await runSpreadCommand(["front-end.json", "--samples", "1000", "--seed", "7", "--json"], io) // 0
 */
export async function runSpreadCommand(argv: string[], io: CliIO): Promise<number> {
  if (argv.includes("--help") || argv.includes("-h")) {
    io.out(`${SPREAD_USAGE}\n`);
    return 0;
  }
  const { maxBytes, rest: a1 } = takeMaxMemory(argv);
  const { value: samplesText, rest: a2 } = takeOption(a1, "--samples");
  const { value: seedText, rest: a3 } = takeOption(a2, "--seed");
  const { value: minYieldText, rest: a4 } = takeOption(a3, "--min-yield");
  const { value: saveWorst, rest: args } = takeOption(a4, "--save-worst");
  let json = false;
  const positional: string[] = [];
  for (const arg of args) {
    if (arg === "--json") json = true;
    else if (arg.startsWith("-") && arg !== "-") throw new CliUsageError(`unknown option ${arg} (see portolan spread --help)`);
    else positional.push(arg);
  }
  if (positional.length !== 1) throw new CliUsageError("expected exactly one scenario file: portolan spread <scenario.json> --samples N --seed S");
  const samples = wholeNumber(samplesText, "--samples", 1, MAX_SPREAD_SAMPLES);
  const seed = wholeNumber(seedText, "--seed", Number.MIN_SAFE_INTEGER, Number.MAX_SAFE_INTEGER);
  let minYield: number | undefined;
  if (minYieldText !== undefined) {
    minYield = Number(minYieldText);
    if (minYieldText.trim() === "" || !Number.isFinite(minYield) || minYield < 0 || minYield > 1) throw new CliUsageError(`--min-yield expects a fraction from 0 to 1 (e.g. 0.95), got "${minYieldText}"`);
  }
  const path = positional[0];
  const { scenario, readFile } = readScenarioFile(path, io.cwd);
  // runSpread is async: withInputErrors sees its synchronous part, the awaited errors are placed here
  let result: SpreadResult;
  try {
    result = await runSpread(scenario, { samples, seed, readFile, maxBytes });
  } catch (err) {
    withInputErrors(path, () => {
      throw err;
    });
    throw err;
  }
  if (saveWorst !== undefined) {
    const dir = resolve(io.cwd, saveWorst);
    const system = withInputErrors(path, () => prepareSystem(scenario, { readFile, maxBytes }));
    mkdirSync(dir, { recursive: true });
    for (const rule of result.rules) {
      if (!rule.worst) continue;
      // rule ids are free text ("rules[0]", "tx iso"): keep letters, digits, dot, dash and underscore
      const file = join(dir, `worst-${rule.id.replace(/[^A-Za-z0-9._-]+/g, "_")}.json`);
      writeFileSync(file, `${JSON.stringify(sampleScenario(system, rule.worst.values), null, 2)}\n`);
    }
  }
  io.out(json ? `${JSON.stringify(result)}\n` : formatSpreadTable(result, minYield));
  return minYield !== undefined && result.rules.some((x) => x.low < minYield) ? 1 : 0;
}

export const spreadCommand: CliCommand = {
  summary: "yield of every rule under the blocks' spreads (seeded samples), with envelopes and sensitivities",
  usage: SPREAD_USAGE,
  run: runSpreadCommand,
};
