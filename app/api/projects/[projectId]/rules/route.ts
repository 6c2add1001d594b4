import { createRule, listRules } from "@/db/queries/rules";
import { apiRoute, json } from "@/lib/server/api";
import { ruleBodySchema } from "./schema";

type Params = { projectId: string };

/** GET /api/projects/:projectId/rules → { rules } oldest first (anyone in the project). */
export const GET = apiRoute<Params>(async (ctx) => {
  const user = await ctx.requireUser();
  return json({ rules: await listRules({ userId: user.id, projectId: ctx.params.projectId }) });
});

/** POST { spec } → 201 { rule } (engineers, owners; rule.edit). 409 when the name is taken. */
export const POST = apiRoute<Params>(async (ctx) => {
  const input = await ctx.body(ruleBodySchema);
  const user = await ctx.requireUser();
  return json({ rule: await createRule({ actor: user, projectId: ctx.params.projectId, spec: input.spec }) }, { status: 201 });
});
