import { listMembers } from "@/db/queries/members";
import { apiRoute, json } from "@/lib/server/api";
import { inviteHandler } from "../invitations/handlers";

/** GET /api/projects/:projectId/members → { members: [{ userId, email, name, role, joinedAt }] } (any member). */
export const GET = apiRoute<{ projectId: string }>(async (ctx) => {
  const user = await ctx.requireUser();
  return json({ members: await listMembers({ actor: user, projectId: ctx.params.projectId }) });
});

/**
 * POST /api/projects/:projectId/members { email, role } → 201 { invitation }. People join only by
 * accepting an invitation, so adding a member sends one (same as POST …/invitations).
 */
export const POST = inviteHandler;
