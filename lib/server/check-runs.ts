import "server-only";
import { randomUUID } from "node:crypto";
import { getCheckRun, insertCheckRun } from "@/db/queries/check-runs";
import { getPartTexts, partFilesOf } from "@/db/queries/parts";
import { projectRuleSpecs } from "@/db/queries/rules";
import { loadScenario } from "@/db/queries/scenarios";
import { getEnv } from "@/lib/base/env";
import { CHECK_TITLES, type CheckName, type CheckRunRequest } from "@/lib/domain/checks/inputs";
import type { CheckRunView } from "@/lib/domain/checks/types";
import { allow, type ProjectAccess } from "@/lib/server/permissions";
import { refusalError, runInPool, taskLimits } from "@/lib/server/jobs/pool";
import { enqueueCheck, queueEnabled } from "@/lib/server/jobs/queue";
import { startJob, type JobView } from "@/lib/server/jobs/registry";
import type { JobProgress, JobTask } from "@/lib/server/jobs/tasks";

/** Checks that run as long jobs (202 with a job id, progress, Cancel); the others answer in the request. */
export const LONG_CHECKS: ReadonlySet<CheckName> = new Set<CheckName>(["state_sweep"]);

/** Everything a check job needs, read once: the revision, only the parts it names, the project's rules. */
async function prepareCheck(access: ProjectAccess, scenarioId: string, request: CheckRunRequest) {
  allow(access, "check.run");
  const { projectId } = access;
  const { revision } = await loadScenario(access, { scenarioId, revisionId: request.revisionId });
  const parts = await getPartTexts({ projectId, files: partFilesOf(revision.content) });
  const projectRules = await projectRuleSpecs({ projectId });
  const task: Extract<JobTask, { kind: "check" }> = { kind: "check", content: revision.content, parts, request, projectRules, ...taskLimits() };
  return { revision, task, prefix: `${CHECK_TITLES[request.check]} on revision ${revision.number}: ` };
}

/** Runs a prepared check in the pool and stores the run; 422 (stores nothing) when it is refused. */
async function executeAndStore(
  access: ProjectAccess,
  scenarioId: string,
  prepared: Awaited<ReturnType<typeof prepareCheck>>,
  opts: { signal?: AbortSignal; onProgress?: (p: JobProgress) => void },
): Promise<string> {
  const output = await runInPool(prepared.task, opts);
  if (!output.ok) throw refusalError(output, prepared.prefix);
  if (output.kind !== "check") throw new Error(`a check job answered ${output.kind}`);
  const id = randomUUID();
  await insertCheckRun(
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
    },
    { keep: getEnv().runsKept },
  );
  return id;
}

/**
 * Run a check on a scenario revision (default the latest) in the job pool and store the run
 * (check.run: owners, engineers and reviewers), with the caller's access resolved once by the route. Bad inputs for this scenario (unknown ports, bands
 * outside the plan), unsolvable revisions and revisions over the size limit are 422 and store nothing;
 * the job stops when `signal` aborts (the client went away).
 */
export async function runCheck({ access, scenarioId, request, signal }: { access: ProjectAccess; scenarioId: string; request: CheckRunRequest; signal?: AbortSignal }): Promise<CheckRunView> {
  const prepared = await prepareCheck(access, scenarioId, request);
  const id = await executeAndStore(access, scenarioId, prepared, { signal });
  return getCheckRun({ access, scenarioId, runId: id });
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
  if (queueEnabled()) return enqueueCheck({ projectId: access.projectId, scenarioId, revisionId: prepared.revision.id, userId: access.userId, task: prepared.task });
  return startJob({ projectId: access.projectId, scenarioId, userId: access.userId, kind: request.check }, ({ signal: jobSignal, report }) =>
    executeAndStore(access, scenarioId, prepared, { signal: jobSignal, onProgress: report }),
  );
}
