import { apiRoute, json } from "@/lib/server/api";
import { inviteMember } from "@/lib/server/invitations";
import { inviteMemberSchema } from "@/lib/base/validation/projects";

/** Shared by POST …/invitations and POST …/members: invite by e-mail with a role (owners) → 201 { invitation }. */
export const inviteHandler = apiRoute<{ projectId: string }>(async (ctx) => {
  const input = await ctx.body(inviteMemberSchema);
  const user = await ctx.requireUser();
  const invitation = await inviteMember({ actor: user, projectId: ctx.params.projectId, email: input.email, role: input.role });
  return json({ invitation }, { status: 201 });
});
