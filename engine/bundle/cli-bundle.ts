// `portolan check <bundle.zip>`: verify a bundle's manifest and re-run its checks from its own files.
// The `check` entry of the command table (engine/cli.ts): it wraps the checks' scenario command and
// takes over when the argument is a .zip.
import { readFileSync } from "node:fs";
import { resolve } from "node:path";
import { CliUsageError, takeOption, type CliCommand, type CliIO } from "../cli-support";
import { CHECK_USAGE, runCheck } from "../checks/cli-check";
import { BundleIntegrityError, openBundle } from "./bundle-zip";
import { BundleError } from "./format";
import { reproduceBundle, type ReproduceResult } from "./reproduce";

/** Exit code when a bundle was tampered with or its verdicts do not reproduce. */
export const EXIT_NOT_REPRODUCED = 3;

export const BUNDLE_CHECK_USAGE = [
  "portolan check <bundle.zip> [--json]",
  "  Verifies a review bundle exported by Portolan: every file against the SHA-256 in manifest.json,",
  "  then solves scenario.json with the bundle's parts/ and re-runs every check, judging by the effective",
  "  rule set recorded in results/checks.json (project rules, scenario overrides, scenario-only rules),",
  "  comparing the verdicts and figures with results/checks.json and the composite with results/composite.sNp.",
  "  --json         print the comparison as JSON instead",
  "  Exit codes: 0 verified, reproduced and all pass (warnings allowed); 1 verified and reproduced but a",
  "  check fails; 2 the file cannot be read or is refused (not a zip, no manifest, unsafe entries, limits);",
  "  3 tampered (a file does not match manifest.json) or the stored verdicts do not reproduce; 70 internal error.",
].join("\n");

/**
 * The comparison as readable lines.
 * @example formatReproduction("b.zip", manifest, result)
 */
export function formatReproduction(file: string, bundle: ReturnType<typeof openBundle>, r: ReproduceResult): string {
  const m = bundle.manifest;
  const lines = [
    `Bundle ${file}: ${m.format}, Portolan ${m.app.version}`,
    `  project "${m.project.name}", scenario "${m.scenario.name}" revision ${m.revision.number}, exported ${m.created_at}${m.created_by ? ` by ${m.created_by.name} <${m.created_by.email}>` : ""}`,
    `  manifest: ${Object.keys(m.files).length} files verified (SHA-256)`,
    r.contentHashMatches
      ? `  scenario.json is the revision's content (SHA-256 ${m.revision.content_hash.slice(0, 12)}…, the hash sign-offs bind to)`
      : `  note: scenario.json does not hash to the revision's content hash ${m.revision.content_hash.slice(0, 12)}… (renamed since it was saved?)`,
    `  judged by ${r.ruleSet === "bundle" ? "the effective rule set recorded in the bundle" : "the scenario file's own rules (the bundle records no rule set)"}`,
    "",
  ];
  if (r.error) lines.push(`NOT REPRODUCED: ${r.error}`);
  const w = Math.max(8, ...r.items.map((i) => i.name.length));
  for (const item of r.items) {
    lines.push(`${item.same ? "same     " : "DIFFERS  "}${item.name.padEnd(w)}  stored ${item.stored}, re-run ${item.rerun}${item.note ? ` (${item.note})` : ""}`);
  }
  lines.push("");
  lines.push(r.reproduced ? `REPRODUCED: the stored verdicts and figures come out the same; verdict ${r.verdict.toUpperCase()}` : "NOT REPRODUCED: the stored results differ from a re-run of the bundle's own scenario and parts");
  if (r.failingRules.length > 0) lines.push(`FAILING RULES: ${r.failingRules.join(", ")}`);
  return `${lines.join("\n")}\n`;
}

/**
 * Runs `check` on a bundle: returns 0, 1 or 3 (see BUNDLE_CHECK_USAGE); a bundle that cannot be read is
 * thrown as CliUsageError (exit 2).
 * @example await runBundleCheck("review.zip", false, io) // 0
 */
export async function runBundleCheck(file: string, json: boolean, io: CliIO): Promise<number> {
  let bytes: Uint8Array;
  try {
    bytes = readFileSync(resolve(io.cwd, file));
  } catch (err) {
    const code = (err as { code?: string }).code;
    throw new CliUsageError(`${file}: cannot read bundle${code === "ENOENT" ? ": no such file" : code ? ` (${code})` : ""}`);
  }
  let bundle;
  try {
    bundle = openBundle(bytes);
  } catch (err) {
    if (err instanceof BundleIntegrityError) {
      if (json) io.out(`${JSON.stringify({ verified: false, reproduced: false, error: err.message, entry: err.entry })}\n`);
      io.err(`${file}: TAMPERED: ${err.message}\n`);
      return EXIT_NOT_REPRODUCED;
    }
    if (err instanceof BundleError) throw new CliUsageError(`${file}: ${err.message}`);
    throw err;
  }
  const result = reproduceBundle(bundle);
  io.out(json ? `${JSON.stringify({ verified: true, manifest: { ...bundle.manifest, files: Object.keys(bundle.manifest.files) }, ...result })}\n` : formatReproduction(file, bundle, result));
  if (!result.reproduced) return EXIT_NOT_REPRODUCED;
  return result.verdict === "fail" ? 1 : 0;
}

async function runCheckOrBundle(args: string[], io: CliIO): Promise<number> {
  if (args.includes("--help") || args.includes("-h")) {
    io.out(`${CHECK_USAGE}\n\n${BUNDLE_CHECK_USAGE}\n`);
    return 0;
  }
  // the value of --max-memory is not a file name (a bundle's re-run uses solveScenario's default limit)
  const rest = takeOption(args, "--max-memory").rest;
  const positional = rest.filter((a) => !a.startsWith("-"));
  if (positional.length === 1 && /\.zip$/i.test(positional[0])) {
    const unknown = rest.find((a) => a.startsWith("-") && a !== "--json");
    if (unknown) throw new CliUsageError(`unknown option ${unknown} (see portolan check --help)`);
    return runBundleCheck(positional[0], args.includes("--json"), io);
  }
  return runCheck(args, io);
}

/** `portolan check`: a scenario's checks, or a bundle's verification and re-run (see engine/cli.ts). */
export const checkCommand: CliCommand = {
  summary: "run a scenario's rules and built-in checks, or verify and re-run a bundle (.zip)",
  usage: `${CHECK_USAGE}\n\n${BUNDLE_CHECK_USAGE}`,
  run: runCheckOrBundle,
};
