import { assertSiteAdmin } from "@/lib/server/admin";
import { apiRoute, json } from "@/lib/server/api";
import { setAccountActive } from "@/lib/server/account";
import { setAccountActiveSchema } from "@/lib/base/validation/admin";

/** PUT /api/admin/users/:userId/active { active } → { user } (site admin): deactivation ends the account's sessions at once. */
export const PUT = apiRoute<{ userId: string }>(async (ctx) => {
  const input = await ctx.body(setAccountActiveSchema);
  const actor = await ctx.requireUser();
  assertSiteAdmin(actor);
  return json({ user: await setAccountActive({ actor, userId: ctx.params.userId, active: input.active }) });
});
