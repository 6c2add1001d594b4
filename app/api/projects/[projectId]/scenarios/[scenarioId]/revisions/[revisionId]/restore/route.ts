import { restoreRevision } from "@/db/queries/revisions";
import { apiRoute, json } from "@/lib/server/api";

type Params = { projectId: string; scenarioId: string; revisionId: string };

/** POST …/revisions/:revisionId/restore → 201 { revision }: a new revision with the old content (engineers, owners). */
export const POST = apiRoute<Params>(async (ctx) => {
  const user = await ctx.requireUser();
  const revision = await restoreRevision({ actor: user, projectId: ctx.params.projectId, scenarioId: ctx.params.scenarioId, revisionId: ctx.params.revisionId });
  return json({ revision }, { status: 201 });
});
