import { listSignoffs } from "@/db/queries/signoffs";
import { requestSignoffOnEvidence } from "@/lib/server/signoffs/evidence";
import { apiRoute, json, parseWith } from "@/lib/server/api";
import { notifySignoffRequested } from "@/lib/server/signoffs/notify";
import { idSchema } from "@/lib/base/validation/common";
import { requestSignoffSchema } from "./schema";

type Params = { projectId: string };

/** GET …/signoffs[?scenarioId=id] → { signoffs } newest first, each with `stale` and `displayState` (any member). */
export const GET = apiRoute<Params>(async (ctx) => {
  const raw = new URL(ctx.request.url).searchParams.get("scenarioId");
  const scenarioId = raw === null || raw === "" ? undefined : parseWith(idSchema, raw);
  const user = await ctx.requireUser();
  return json({ signoffs: await listSignoffs({ userId: user.id, projectId: ctx.params.projectId, scenarioId }) });
});

/**
 * POST …/signoffs { scenarioId, revisionId?, reviewerIds, note? } → 201 { signoffs, mail: { sent, skipped, failed } }
 * (engineers, owners); 422 naming the problem when the revision does not solve. Each reviewer gets an e-mail with a link to the scenario unless they turned them off.
 */
export const POST = apiRoute<Params>(async (ctx) => {
  const input = await ctx.body(requestSignoffSchema);
  const user = await ctx.requireUser();
  const requested = await requestSignoffOnEvidence({ actor: user, projectId: ctx.params.projectId, scenarioId: input.scenarioId, revisionId: input.revisionId, reviewerIds: input.reviewerIds, note: input.note ?? "" });
  const mail = await notifySignoffRequested(requested);
  return json({ signoffs: requested.signoffs, mail }, { status: 201 });
});
