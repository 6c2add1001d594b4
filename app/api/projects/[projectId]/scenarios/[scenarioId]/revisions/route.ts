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
 * POST { baseRevisionId, scenario, note?, resolutions? } → 201 { revision, merged } (engineers, owners).
 * When someone saved after `baseRevisionId` the edits are merged with it (`merged`: { number, authorName,
 * settled }); a real conflict answers 409 { error, current: { revisionId, number, authorName, createdAt },
 * conflicts: [{ key, area, label, mine, theirs }] } and writes nothing; posting again with `resolutions`
 * ({ [key]: "mine" | "theirs" }) settles them.
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
      note: input.note ?? null,
      resolutions: input.resolutions,
    });
    const { merged, ...detail } = revision;
    return json({ revision: detail, merged }, { status: 201 });
  } catch (error) {
    if (error instanceof StaleRevisionError) {
      return json({ error: { code: error.code, message: error.message }, current: error.current, conflicts: error.conflicts }, { status: 409 });
    }
    throw error;
  }
});
