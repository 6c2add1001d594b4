import { deleteDraft, getDraft, putDraft } from "@/db/queries/drafts";
import { apiRoute, json, noContent } from "@/lib/server/api";
import { putDraftSchema, SCENARIO_BODY_LIMIT_BYTES } from "@/lib/base/validation/scenarios";

type Params = { projectId: string; scenarioId: string };

/** GET …/draft → { draft } the caller's own working draft, or { draft: null } (engineers, owners). */
export const GET = apiRoute<Params>(async (ctx) => {
  const user = await ctx.requireUser();
  return json({ draft: await getDraft({ userId: user.id, projectId: ctx.params.projectId, scenarioId: ctx.params.scenarioId }) });
});

/** PUT { baseRevisionId, scenario } → { draft } (autosave; engineers, owners). Never writes a revision. */
export const PUT = apiRoute<Params>(async (ctx) => {
  const input = await ctx.body(putDraftSchema, SCENARIO_BODY_LIMIT_BYTES);
  const user = await ctx.requireUser();
  return json({ draft: await putDraft({ userId: user.id, projectId: ctx.params.projectId, scenarioId: ctx.params.scenarioId, baseRevisionId: input.baseRevisionId, content: input.scenario }) });
});

/** DELETE → 204: the caller's draft is discarded (engineers, owners). */
export const DELETE = apiRoute<Params>(async (ctx) => {
  const user = await ctx.requireUser();
  await deleteDraft({ userId: user.id, projectId: ctx.params.projectId, scenarioId: ctx.params.scenarioId });
  return noContent();
});
