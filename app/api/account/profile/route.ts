import { apiRoute, json } from "@/lib/server/api";
import { renameAccount } from "@/lib/server/account";
import { updateProfileSchema } from "@/lib/base/validation/account";

/** PATCH /api/account/profile { name } → { name }. */
export const PATCH = apiRoute(async (ctx) => {
  const user = await ctx.requireUser();
  const input = await ctx.body(updateProfileSchema);
  return json(await renameAccount({ actor: user, name: input.name }));
});
