import { deleteScenario, getScenario, renameScenario } from "@/db/queries/scenarios";
import { apiRoute, json, noContent, parseWith } from "@/lib/server/api";
import { idSchema } from "@/lib/base/validation/common";
import { renameScenarioSchema } from "@/lib/base/validation/scenarios";

type Params = { projectId: string; scenarioId: string };

/** GET …/scenarios/:scenarioId[?revision=id] → { scenario, revision, role } (latest revision unless asked). */
export const GET = apiRoute<Params>(async (ctx) => {
  const raw = new URL(ctx.request.url).searchParams.get("revision");
  const revisionId = raw === null ? undefined : parseWith(idSchema, raw);
  const user = await ctx.requireUser();
  return json(await getScenario({ userId: user.id, projectId: ctx.params.projectId, scenarioId: ctx.params.scenarioId, revisionId }));
});

/** PATCH { name } → { scenario } (engineers, owners). */
export const PATCH = apiRoute<Params>(async (ctx) => {
  const input = await ctx.body(renameScenarioSchema);
  const user = await ctx.requireUser();
  return json({ scenario: await renameScenario({ actor: user, projectId: ctx.params.projectId, scenarioId: ctx.params.scenarioId, name: input.name }) });
});

/** DELETE → 204 with every revision (engineers, owners). */
export const DELETE = apiRoute<Params>(async (ctx) => {
  const user = await ctx.requireUser();
  await deleteScenario({ actor: user, projectId: ctx.params.projectId, scenarioId: ctx.params.scenarioId });
  return noContent();
});
