import { listPendingInvitations } from "@/db/queries/members";
import { apiRoute, json } from "@/lib/server/api";
import { inviteHandler } from "./handlers";

/** GET /api/projects/:projectId/invitations → { invitations } still open (owners). */
export const GET = apiRoute<{ projectId: string }>(async (ctx) => {
  const user = await ctx.requireUser();
  return json({ invitations: await listPendingInvitations({ actor: user, projectId: ctx.params.projectId }) });
});

/** POST /api/projects/:projectId/invitations { email, role } → 201 { invitation } and an e-mail with the link. */
export const POST = inviteHandler;
