import { apiRoute, json } from "@/lib/server/api";
import { AppError } from "@/lib/base/errors";
import { changePassword } from "@/lib/server/account";
import { changePasswordSchema } from "@/lib/base/validation/account";

/** POST /api/account/password { currentPassword, newPassword } → { endedSessions }: every other session of the account ends. */
export const POST = apiRoute(async (ctx) => {
  const user = await ctx.requireUser();
  const input = await ctx.body(changePasswordSchema);
  const session = ctx.session();
  if (!session) throw new AppError("forbidden", 403, "Change the password from a signed-in browser session, not with an API token.");
  return json(await changePassword({ actor: user, sessionId: session.id, currentPassword: input.currentPassword, newPassword: input.newPassword }));
});
