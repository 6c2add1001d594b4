// What a job thread does, as plain functions of plain data (no database, no Next): the worker entry
// (worker-entry.ts, built to dist/job-worker.mjs) calls them in a piscina thread or a BullMQ worker
// process, and the tests call them directly. Every task checks the engine's size estimate first, so a
// scenario over the limit is refused before its block data is allocated.
import { gzipSync } from "node:zlib";
import { checkSolveSize, estimateSolve, SizeLimitError, formatBytes } from "@/engine/system/estimate";
import { setPartCacheLimit } from "@/engine/system/parts";
import { solutionToJson, solveScenario } from "@/engine/system";
import { parseScenario } from "@/engine/scenario";
import { writeCompositeTouchstone } from "@/engine/touchstone";
import { EngineInputError, SingularSystemError, type Scenario } from "@/engine/types";
import { BUNDLE_PATHS, BundleError, bundleFiles, computeBundleResults, sha256, writeBundleZip, type BundleIdentity, type BundleWaiver, type SpreadSummary } from "@/engine/bundle";
import type { EffectiveRuleSet } from "@/engine/checks";
import { isAppError } from "@/lib/base/errors";
import { renderReportHtml } from "@/lib/server/bundle/report-html";
import { executeCheck } from "@/lib/domain/checks/execute";
import { executeSpread } from "@/lib/domain/checks/execute-spread";
import type { CheckRunRequest } from "@/lib/domain/checks/inputs";
import type { JobProgress } from "@/lib/domain/jobs";
import { solutionToCsv } from "@/lib/domain/results/results-math";
import { scenarioForEngine } from "@/lib/domain/scenarios/for-engine";

/** What every task carries: the revision's content, the texts of the parts it names, and the limits. */
type TaskBase = {
  content: Scenario;
  /** Touchstone texts keyed as blocks name them (`parts/<fileName>`): only the parts the scenario names */
  parts: Record<string, string>;
  maxBytes: number;
  partCacheBytes: number;
};

export type JobTask =
  | (TaskBase & { kind: "estimate" })
  | (TaskBase & { kind: "solve"; format: "json" | "touchstone" | "csv"; scenarioName: string })
  | (TaskBase & { kind: "check"; request: CheckRunRequest; ruleSet: EffectiveRuleSet })
  | (TaskBase & { kind: "bundle"; identity: BundleIdentity; ruleSet: EffectiveRuleSet; waivers: BundleWaiver[]; spread?: SpreadSummary });

/** A refusal the route turns into a 422 (or the status given): bad input, unsolvable, over the size limit. */
export type JobRefusal = { ok: false; status: number; code: "unprocessable" | "too_large"; message: string; estimateBytes?: number; limitBytes?: number };

export type JobOutput =
  | { ok: true; kind: "estimate"; bytes: number; work: number }
  | { ok: true; kind: "solve"; body: string }
  | { ok: true; kind: "check"; verdict: "pass" | "fail" | "warn"; headline: string; figuresGz: Uint8Array }
  | { ok: true; kind: "bundle"; bytes: Uint8Array; verdict: "pass" | "fail" | "warn"; rulesHash: string }
  | JobRefusal;

export type { JobProgress };

function refusal(error: unknown): JobRefusal | null {
  if (error instanceof SizeLimitError) {
    return {
      ok: false,
      status: 422,
      code: "too_large",
      // the engine's message names the CLI option; on the server the limit is MAX_SOLVE_MEMORY
      message: error.message.slice(error.where.length + 2).replace("(--max-memory)", "(MAX_SOLVE_MEMORY on the server)"),
      estimateBytes: error.estimate.bytes,
      limitBytes: error.limitBytes,
    };
  }
  if (error instanceof EngineInputError || error instanceof SingularSystemError) return { ok: false, status: 422, code: "unprocessable", message: error.message };
  if (error instanceof BundleError) return { ok: false, status: 422, code: "unprocessable", message: error.message };
  if (isAppError(error)) return { ok: false, status: error.status, code: "unprocessable", message: error.message };
  return null;
}

/**
 * Runs one task: estimate (refusing over `maxBytes`), then solve and, for a check, run it and gzip its
 * figures (JSON, ±∞ as null, as the client reads them) so the main thread only stores bytes.
 *
 * @param task - the job's data (structured-clone safe)
 * @param report - called with progress between phases
 * @returns the output, or a refusal for input the engine cannot use; other errors are thrown
 */
export async function runTask(task: JobTask, report: (p: JobProgress) => void = () => undefined): Promise<JobOutput> {
  setPartCacheLimit(task.partCacheBytes);
  try {
    report({ phase: "estimating", fraction: 0 });
    const scenario = parseScenario(scenarioForEngine(task.content), { parts: task.parts });
    const waves = task.kind !== "solve";
    const estimate = estimateSolve(scenario, { parts: task.parts, waves });
    checkSolveSize(estimate, task.maxBytes);
    if (task.kind === "estimate") return { ok: true, kind: "estimate", bytes: estimate.bytes, work: estimate.work };
    report({ phase: "solving", fraction: 0.1 });
    if (task.kind === "bundle") return await bundleTask(task);
    if (task.kind === "check" && task.request.check === "spread") {
      // the samples are solved through the nominal join plan, batch by batch, reporting as they go
      const outcome = await executeSpread(task.request, scenario, task.parts, task.ruleSet, {
        maxBytes: task.maxBytes,
        onProgress: (f) => report({ phase: "sampling", fraction: 0.1 + 0.8 * f }),
      });
      report({ phase: "storing", fraction: 0.9 });
      return { ok: true, kind: "check", verdict: outcome.verdict, headline: outcome.figures.headline, figuresGz: gzipSync(JSON.stringify(outcome.figures)) };
    }
    const solution = solveScenario(scenario, { parts: task.parts, maxBytes: Infinity, waves });
    if (task.kind === "solve") {
      const body =
        task.format === "json"
          ? JSON.stringify(solutionToJson(solution))
          : task.format === "csv"
            ? solutionToCsv(solution)
            : writeCompositeTouchstone(solution, { scenarioName: task.scenarioName });
      return { ok: true, kind: "solve", body };
    }
    report({ phase: "checking", fraction: 0.4 });
    const outcome = executeCheck(task.request, solution, task.ruleSet);
    report({ phase: "storing", fraction: 0.9 });
    return { ok: true, kind: "check", verdict: outcome.verdict, headline: outcome.figures.headline, figuresGz: gzipSync(JSON.stringify(outcome.figures)) };
  } catch (error) {
    const refused = refusal(error);
    if (refused) return refused;
    throw error;
  }
}

/** A review bundle: solve and check (computeBundleResults), the files, the report, the zip. */
async function bundleTask(task: Extract<JobTask, { kind: "bundle" }>): Promise<JobOutput> {
  const results = computeBundleResults(task.content, task.parts, task.ruleSet, task.waivers, task.spread);
  const files = bundleFiles(task.content, task.parts, results);
  const hashes = [...files].map(([path, text]) => ({ path, sha256: sha256(text) }));
  // the manifest names the switch setting the verdicts were judged in, beside the revision
  const identity = { ...task.identity, switch_states: results.checks.switch_states };
  files.set(BUNDLE_PATHS.report, renderReportHtml({ identity, results, files: hashes }));
  const bytes = await writeBundleZip(identity, files);
  return { ok: true, kind: "bundle", bytes, verdict: results.checks.verdict, rulesHash: results.checks.rule_set.sha256 };
}

/** The size refusal's fields for the 422 body: the estimate and the limit, in bytes and in words. */
export function sizeFields(r: JobRefusal): Record<string, string> | undefined {
  if (r.estimateBytes === undefined || r.limitBytes === undefined) return undefined;
  return { estimate: `${r.estimateBytes} bytes (${formatBytes(r.estimateBytes)})`, limit: `${r.limitBytes} bytes (${formatBytes(r.limitBytes)})` };
}
