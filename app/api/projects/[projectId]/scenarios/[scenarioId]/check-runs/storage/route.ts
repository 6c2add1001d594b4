import { clearRuns, runStorage } from "@/db/queries/check-runs";
import { getEnv } from "@/lib/base/env";
import { apiRoute, json } from "@/lib/server/api";
import { resolveAccess } from "@/lib/server/permissions";

type Params = { projectId: string; scenarioId: string };

/**
 * GET → { storage: { runs, bytes, pinned, clearable, clearableBytes, keptPerCheck } }: what the scenario's
 * check runs take and how much the retention rule would clear (anyone in the project).
 */
export const GET = apiRoute<Params>(async (ctx) => {
  const user = await ctx.requireUser();
  const access = await resolveAccess({ userId: user.id, projectId: ctx.params.projectId });
  return json({ storage: await runStorage({ access, scenarioId: ctx.params.scenarioId, keep: getEnv().runsKept }) });
});

/**
 * DELETE → { deleted, storage }: deletes every run beyond the newest RUNS_KEPT of each (check, revision),
 * pinned runs (a sign-off or bundle refers to them) excepted (owners; audited).
 */
export const DELETE = apiRoute<Params>(async (ctx) => {
  const user = await ctx.requireUser();
  const access = await resolveAccess({ userId: user.id, projectId: ctx.params.projectId });
  const keep = getEnv().runsKept;
  const deleted = await clearRuns({ access, actor: user, scenarioId: ctx.params.scenarioId, keep });
  return json({ deleted, storage: await runStorage({ access, scenarioId: ctx.params.scenarioId, keep }) });
});
