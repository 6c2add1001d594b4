import { getRunWithFreshness } from "@/lib/server/check-runs";
import { apiRoute, json } from "@/lib/server/api";
import { resolveAccess } from "@/lib/server/permissions";

type Params = { projectId: string; scenarioId: string; runId: string };

/** GET …/check-runs/:runId → { run } with its figures, marked current or stale (anyone in the project). */
export const GET = apiRoute<Params>(async (ctx) => {
  const user = await ctx.requireUser();
  const access = await resolveAccess({ userId: user.id, projectId: ctx.params.projectId });
  return json({ run: await getRunWithFreshness({ access, scenarioId: ctx.params.scenarioId, runId: ctx.params.runId }) });
});
