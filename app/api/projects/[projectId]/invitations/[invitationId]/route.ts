import { revokeInvitation } from "@/db/queries/members";
import { apiRoute, noContent } from "@/lib/server/api";

/** DELETE /api/projects/:projectId/invitations/:invitationId → 204 (owners). */
export const DELETE = apiRoute<{ projectId: string; invitationId: string }>(async (ctx) => {
  const user = await ctx.requireUser();
  await revokeInvitation({ actor: user, projectId: ctx.params.projectId, invitationId: ctx.params.invitationId });
  return noContent();
});
