import { z } from "zod";
import { idSchema } from "@/lib/base/validation/common";
import { apiRoute, json, parseWith } from "@/lib/server/api";
import { revisionVerdict } from "@/lib/server/verdicts";

type Params = { projectId: string; scenarioId: string };

const verdictQuerySchema = z.object({ revisionId: idSchema.optional() });
const verdictBodySchema = z.object({ revisionId: idSchema.optional() }).strict();

/**
 * GET …/verdict[?revisionId=] → { verdict }: the revision's effective rule set (each rule with its source),
 * its rules hash, the engine version and the stored "all rules" run that is current for them, or
 * `run: null` when none is (anyone in the project). Runs nothing.
 */
export const GET = apiRoute<Params>(async (ctx) => {
  const query = parseWith(verdictQuerySchema, { revisionId: new URL(ctx.request.url).searchParams.get("revisionId") ?? undefined });
  const user = await ctx.requireUser();
  return json({ verdict: await revisionVerdict({ actor: user, projectId: ctx.params.projectId, scenarioId: ctx.params.scenarioId, revisionId: query.revisionId, ensure: false }) });
});

/**
 * POST { revisionId? } → { verdict }: as GET, but runs and stores "all rules" first when no stored run is
 * current (check.run: owners, engineers, reviewers); 422 naming the problem when the revision does not
 * solve. What the sign-off panel and compare call on open.
 */
export const POST = apiRoute<Params>(async (ctx) => {
  const body = await ctx.body(verdictBodySchema);
  const user = await ctx.requireUser();
  return json({ verdict: await revisionVerdict({ actor: user, projectId: ctx.params.projectId, scenarioId: ctx.params.scenarioId, revisionId: body.revisionId, ensure: true }) });
});
