import { getRunWithFreshness } from "@/lib/server/check-runs";
import { apiRoute, json } from "@/lib/server/api";

type Params = { projectId: string; scenarioId: string; runId: string };

/** GET …/check-runs/:runId → { run } with its figures, marked current or stale (anyone in the project). */
export const GET = apiRoute<Params>(async (ctx) => {
  const user = await ctx.requireUser();
  return json({ run: await getRunWithFreshness({ userId: user.id, projectId: ctx.params.projectId, scenarioId: ctx.params.scenarioId, runId: ctx.params.runId }) });
});
