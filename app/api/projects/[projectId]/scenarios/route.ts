import { createScenario, listScenarios } from "@/db/queries/scenarios";
import { apiRoute, json } from "@/lib/server/api";
import { createScenarioSchema, SCENARIO_BODY_LIMIT_BYTES } from "@/lib/base/validation/scenarios";

type Params = { projectId: string };

/** GET /api/projects/:projectId/scenarios → { scenarios } (anyone in the project). */
export const GET = apiRoute<Params>(async (ctx) => {
  const user = await ctx.requireUser();
  return json({ scenarios: await listScenarios({ userId: user.id, projectId: ctx.params.projectId }) });
});

/** POST { name, template? | scenario? } → 201 { scenario, revision } (engineers, owners). */
export const POST = apiRoute<Params>(async (ctx) => {
  const input = await ctx.body(createScenarioSchema, SCENARIO_BODY_LIMIT_BYTES);
  const user = await ctx.requireUser();
  const created = await createScenario({ actor: user, projectId: ctx.params.projectId, name: input.name, template: input.template, content: input.scenario });
  return json(created, { status: 201 });
});
