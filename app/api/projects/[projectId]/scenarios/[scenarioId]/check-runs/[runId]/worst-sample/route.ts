import { z } from "zod";
import { apiRoute, json } from "@/lib/server/api";
import { resolveAccess } from "@/lib/server/permissions";
import { openWorstSample } from "@/lib/server/spread-sample";

type Params = { projectId: string; scenarioId: string; runId: string };

const bodySchema = z.object({ rule: z.string().trim().min(1, { error: "Name the rule whose worst sample to open." }).max(200) }).strict();

/**
 * POST …/check-runs/:runId/worst-sample { rule } → 201 { scenario, revision }: the spread run's worst
 * sample of that rule as a new scenario (engineers, owners); 422 when the run is not a spread run.
 */
export const POST = apiRoute<Params>(async (ctx) => {
  const { rule } = await ctx.body(bodySchema);
  const user = await ctx.requireUser();
  const access = await resolveAccess({ userId: user.id, projectId: ctx.params.projectId });
  const created = await openWorstSample({ access, actor: user, scenarioId: ctx.params.scenarioId, runId: ctx.params.runId, rule });
  return json(created, { status: 201 });
});
