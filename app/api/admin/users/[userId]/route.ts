import { setSiteAdmin } from "@/db/queries/users";
import { assertSiteAdmin } from "@/lib/server/admin";
import { apiRoute, json } from "@/lib/server/api";
import { updateUserSchema } from "@/lib/base/validation/admin";

/** PATCH /api/admin/users/:userId { isSiteAdmin } → { user } (site admin); 409 when removing the last site admin. */
export const PATCH = apiRoute<{ userId: string }>(async (ctx) => {
  const input = await ctx.body(updateUserSchema);
  const actor = await ctx.requireUser();
  assertSiteAdmin(actor);
  const user = await setSiteAdmin({ userId: ctx.params.userId, isSiteAdmin: input.isSiteAdmin, actor });
  return json({ user });
});
