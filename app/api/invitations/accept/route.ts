import { apiRoute, json } from "@/lib/server/api";
import { validateSessionToken, readSessionToken } from "@/lib/server/auth/session";
import { acceptInvitation } from "@/lib/server/invitations";
import { acceptInvitationSchema } from "@/lib/base/validation/auth";

/**
 * POST /api/invitations/accept { token, name?, password? } → 200 { projectId, role, user }.
 * Signed in: links this account. Not signed in: creates the account (name and password) and signs in.
 */
export const POST = apiRoute(async (ctx) => {
  const input = await ctx.body(acceptInvitationSchema);
  const current = await validateSessionToken(readSessionToken(ctx.request.headers.get("cookie")));
  const result = await acceptInvitation({ ...input, currentUser: current.user });
  if (result.signedIn) ctx.setCookie(result.signedIn.cookie);
  return json({ projectId: result.projectId, role: result.role, user: result.user });
}, { public: true });
