import { listRevisions, saveRevision, StaleRevisionError } from "@/db/queries/revisions";
import { apiRoute, json } from "@/lib/server/api";
import { saveRevisionSchema, SCENARIO_BODY_LIMIT_BYTES } from "@/lib/base/validation/scenarios";

type Params = { projectId: string; scenarioId: string };

/** GET …/revisions → { revisions } newest first, without content. */
export const GET = apiRoute<Params>(async (ctx) => {
  const user = await ctx.requireUser();
  return json({ revisions: await listRevisions({ userId: user.id, projectId: ctx.params.projectId, scenarioId: ctx.params.scenarioId }) });
});

/**
 * POST { baseRevisionId, scenario } → 201 { revision }; 409 { error, current: { revisionId, number, authorName, createdAt } }
 * when someone saved after `baseRevisionId` (engineers, owners).
 */
export const POST = apiRoute<Params>(async (ctx) => {
  const input = await ctx.body(saveRevisionSchema, SCENARIO_BODY_LIMIT_BYTES);
  const user = await ctx.requireUser();
  try {
    const revision = await saveRevision({
      actor: user,
      projectId: ctx.params.projectId,
      scenarioId: ctx.params.scenarioId,
      baseRevisionId: input.baseRevisionId,
      content: input.scenario,
    });
    return json({ revision }, { status: 201 });
  } catch (error) {
    if (error instanceof StaleRevisionError) {
      return json({ error: { code: error.code, message: error.message }, current: error.current }, { status: 409 });
    }
    throw error;
  }
});
