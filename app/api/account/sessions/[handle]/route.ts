import { apiRoute, noContent } from "@/lib/server/api";
import { revokeOwnSession } from "@/lib/server/account";
import { sessionHandleSchema } from "@/lib/base/validation/account";
import { AppError } from "@/lib/base/errors";

/** DELETE /api/account/sessions/:handle → 204: that session of one's own ends (404 if it is not one). */
export const DELETE = apiRoute<{ handle: string }>(async (ctx) => {
  const user = await ctx.requireUser();
  const handle = sessionHandleSchema.safeParse(ctx.params.handle);
  if (!handle.success) throw new AppError("not_found", 404, "No such session of yours.");
  await revokeOwnSession({ actor: user, handle: handle.data });
  return noContent();
});
