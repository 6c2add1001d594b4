import { changeMemberRole, removeMember } from "@/db/queries/members";
import { apiRoute, json, noContent } from "@/lib/server/api";
import { changeRoleSchema } from "@/lib/base/validation/projects";

type Params = { projectId: string; userId: string };

/** PATCH /api/projects/:projectId/members/:userId { role } → { member } (owners); 409 for the last owner. */
export const PATCH = apiRoute<Params>(async (ctx) => {
  const { role } = await ctx.body(changeRoleSchema);
  const user = await ctx.requireUser();
  const member = await changeMemberRole({ actor: user, projectId: ctx.params.projectId, userId: ctx.params.userId, role });
  return json({ member });
});

/** DELETE /api/projects/:projectId/members/:userId → 204 (owners, or a member leaving); 409 for the last owner. */
export const DELETE = apiRoute<Params>(async (ctx) => {
  const user = await ctx.requireUser();
  await removeMember({ actor: user, projectId: ctx.params.projectId, userId: ctx.params.userId });
  return noContent();
});
