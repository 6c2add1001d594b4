import "server-only";
import { randomInt, randomUUID } from "node:crypto";
import { inArray } from "drizzle-orm";
import { db } from "@/db/client";
import { getCheckRun, insertCheckRun, listCheckRuns } from "@/db/queries/check-runs";
import { scenarioRevisions } from "@/db/schema";
import { getPartTexts, partFilesOf } from "@/db/queries/parts";
import { projectRuleSpecs } from "@/db/queries/rules";
import { loadScenario } from "@/db/queries/scenarios";
import { hashRuleSet } from "@/engine/bundle";
import { effectiveRuleSet } from "@/engine/checks";
import type { Scenario } from "@/engine/types";
import { ENGINE_VERSION } from "@/engine/version";
import { getEnv } from "@/lib/base/env";
import { CHECK_TITLES, type CheckName, type CheckRunRequest } from "@/lib/domain/checks/inputs";
import type { CheckRunSummary, CheckRunView } from "@/lib/domain/checks/types";
import { allow, type ProjectAccess } from "@/lib/server/permissions";
import { refusalError, runInPool, taskLimits } from "@/lib/server/jobs/pool";
import { enqueueCheck, queueEnabled } from "@/lib/server/jobs/queue";
import { startJob, type JobView } from "@/lib/server/jobs/registry";
import type { JobProgress, JobTask } from "@/lib/server/jobs/tasks";

/** Checks that run as long jobs (202 with a job id, progress, Cancel); the others answer in the request. */
export const LONG_CHECKS: ReadonlySet<CheckName> = new Set<CheckName>(["state_sweep", "spread"]);

/** Everything a check job needs, read once: the revision, only the parts it names, the project's rules. */
async function prepareCheck(access: ProjectAccess, scenarioId: string, given: CheckRunRequest) {
  allow(access, "check.run");
  // a spread run without a seed gets one drawn here, so the stored inputs repeat the run exactly
  const request: CheckRunRequest = given.check === "spread" && given.inputs.seed === undefined ? { ...given, inputs: { ...given.inputs, seed: randomInt(0, 2 ** 31) } } : given;
  const { projectId } = access;
  const { revision } = await loadScenario(access, { scenarioId, revisionId: request.revisionId });
  const parts = await getPartTexts({ projectId, files: partFilesOf(revision.content) });
  // the rules come from the stored content (not the engine's parse), so overrides and opt-outs are read as saved
  const ruleSet = effectiveRuleSet(await projectRuleSpecs({ projectId }), revision.content);
  const task: Extract<JobTask, { kind: "check" }> = { kind: "check", content: revision.content, parts, request, ruleSet, ...taskLimits() };
  // what the verdict is of: the revision's content, its effective rule set and this engine
  const identity = { contentHash: revision.contentHash, rulesHash: hashRuleSet(ruleSet), engineVersion: ENGINE_VERSION };
  return { revision, task, identity, prefix: `${CHECK_TITLES[request.check]} on revision ${revision.number}: ` };
}

/** Runs a prepared check in the pool and stores the run; 422 (stores nothing) when it is refused. */
async function executeAndStore(
  access: ProjectAccess,
  scenarioId: string,
  prepared: Awaited<ReturnType<typeof prepareCheck>>,
  opts: { signal?: AbortSignal; onProgress?: (p: JobProgress) => void },
): Promise<CheckRunView> {
  const output = await runInPool(prepared.task, opts);
  if (!output.ok) throw refusalError(output, prepared.prefix);
  if (output.kind !== "check") throw new Error(`a check job answered ${output.kind}`);
  const id = randomUUID();
  return insertCheckRun(
    {
      id,
      scenarioId,
      revisionId: prepared.revision.id,
      userId: access.userId,
      check: prepared.task.request.check,
      inputs: prepared.task.request.inputs as Record<string, unknown>,
      verdict: output.verdict,
      headline: output.headline,
      figuresGz: output.figuresGz,
      ...prepared.identity,
    },
    { keep: getEnv().runsKept },
  );
}

/**
 * Run a check on a scenario revision (default the latest) in the job pool and store the run
 * (check.run: owners, engineers and reviewers), with the caller's access resolved once by the route. Bad inputs for this scenario (unknown ports, bands
 * outside the plan), unsolvable revisions and revisions over the size limit are 422 and store nothing;
 * the job stops when `signal` aborts (the client went away). The run records what its verdict is of: the
 * revision's content hash, the hash of its effective rule set and the engine version.
 */
export async function runCheck({ access, scenarioId, request, signal }: { access: ProjectAccess; scenarioId: string; request: CheckRunRequest; signal?: AbortSignal }): Promise<CheckRunView> {
  const prepared = await prepareCheck(access, scenarioId, request);
  // the stored run as the store read it back (a concurrent run's retention may delete it right after)
  const run = await executeAndStore(access, scenarioId, prepared, { signal });
  return withFreshness(access, run);
}

/**
 * Start a long check (LONG_CHECKS) as a job: the size is checked first (422 before any job exists), then
 * the job runs in the background (this server's pool, or the Redis queue when REDIS_URL is set) and is
 * followed at GET /api/projects/:p/jobs/:id.
 */
export async function startCheckJob({ access, scenarioId, request, signal }: { access: ProjectAccess; scenarioId: string; request: CheckRunRequest; signal?: AbortSignal }): Promise<JobView> {
  const prepared = await prepareCheck(access, scenarioId, request);
  const estimate = await runInPool({ ...prepared.task, kind: "estimate" }, { signal });
  if (!estimate.ok) throw refusalError(estimate, prepared.prefix);
  // with REDIS_URL, a worker process (npm run worker) takes it and stores the run
  if (queueEnabled()) return enqueueCheck({ projectId: access.projectId, scenarioId, revisionId: prepared.revision.id, userId: access.userId, task: prepared.task, identity: prepared.identity });
  return startJob({ projectId: access.projectId, scenarioId, userId: access.userId, kind: request.check }, ({ signal: jobSignal, report }) =>
    executeAndStore(access, scenarioId, prepared, { signal: jobSignal, onProgress: report }).then((run) => run.id),
  );
}

/** Checks whose verdict depends on the rules (the others judge the revision alone). */
export const RULE_CHECKS: readonly CheckName[] = ["all_rules", "state_sweep", "spread"];

/**
 * Why a stored verdict is no longer current for its revision, in words (empty when current): recorded
 * before runs carried their identity, another engine version, or (for rule checks) other rules.
 */
export function staleReasons(run: Pick<CheckRunSummary, "check" | "rulesHash" | "engineVersion">, currentRulesHash: string | null): string[] {
  if (run.engineVersion === null || run.rulesHash === null) return ["recorded before verdicts carried their rules and engine version"];
  const reasons: string[] = [];
  if (run.engineVersion !== ENGINE_VERSION) reasons.push(`judged by engine ${run.engineVersion}, now ${ENGINE_VERSION}`);
  if (RULE_CHECKS.includes(run.check) && currentRulesHash !== null && run.rulesHash !== currentRulesHash) reasons.push("the rules changed since it ran");
  return reasons;
}

/** Current rules hashes of the given revisions (one query for their contents). */
async function rulesHashes(projectId: string, revisionIds: string[]): Promise<Map<string, string>> {
  const ids = [...new Set(revisionIds)];
  if (ids.length === 0) return new Map();
  const rows = await db.select({ id: scenarioRevisions.id, content: scenarioRevisions.content }).from(scenarioRevisions).where(inArray(scenarioRevisions.id, ids));
  const specs = await projectRuleSpecs({ projectId });
  return new Map(rows.map((r) => [r.id, hashRuleSet(effectiveRuleSet(specs, r.content as unknown as Scenario))]));
}

/** A scenario's runs, newest first, each marked current or stale (anyone in the project). */
export async function listRunsWithFreshness({ access, scenarioId, limit }: { access: ProjectAccess; scenarioId: string; limit?: number }): Promise<CheckRunSummary[]> {
  const { scenario } = await loadScenario(access, { scenarioId });
  const runs = await listCheckRuns({ access, scenarioId, limit });
  const hashes = await rulesHashes(access.projectId, runs.flatMap((r) => (r.revisionId ? [r.revisionId] : [])));
  return runs.map((r) => ({ ...r, stale: staleReasons(r, r.revisionId ? (hashes.get(r.revisionId) ?? null) : null), latest: r.revisionId === scenario.latestRevisionId }));
}

/** One run with its figures, marked current or stale (anyone in the project). */
export async function getRunWithFreshness({ access, scenarioId, runId }: { access: ProjectAccess; scenarioId: string; runId: string }): Promise<CheckRunView> {
  return withFreshness(access, await getCheckRun({ access, scenarioId, runId }));
}

/** A run marked current or stale against its revision's rules now, and whether that is the latest revision. */
async function withFreshness(access: ProjectAccess, run: CheckRunView): Promise<CheckRunView> {
  const { scenario } = await loadScenario(access, { scenarioId: run.scenarioId });
  const hashes = await rulesHashes(access.projectId, run.revisionId ? [run.revisionId] : []);
  return { ...run, stale: staleReasons(run, run.revisionId ? (hashes.get(run.revisionId) ?? null) : null), latest: run.revisionId === scenario.latestRevisionId };
}

