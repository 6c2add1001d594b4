import { deleteRule, updateRule } from "@/db/queries/rules";
import { apiRoute, json, noContent } from "@/lib/server/api";
import { ruleBodySchema } from "../schema";

type Params = { projectId: string; ruleId: string };

/** PUT { spec } → { rule } (engineers, owners; rule.edit). */
export const PUT = apiRoute<Params>(async (ctx) => {
  const input = await ctx.body(ruleBodySchema);
  const user = await ctx.requireUser();
  return json({ rule: await updateRule({ actor: user, projectId: ctx.params.projectId, ruleId: ctx.params.ruleId, spec: input.spec }) });
});

/** DELETE → 204 (engineers, owners; rule.edit). */
export const DELETE = apiRoute<Params>(async (ctx) => {
  const user = await ctx.requireUser();
  await deleteRule({ actor: user, projectId: ctx.params.projectId, ruleId: ctx.params.ruleId });
  return noContent();
});
