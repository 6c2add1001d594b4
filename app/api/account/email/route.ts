import { apiRoute, json } from "@/lib/server/api";
import { requestEmailChange } from "@/lib/server/account";
import { changeEmailSchema } from "@/lib/base/validation/account";

/** POST /api/account/email { newEmail, currentPassword } → 202 { pending: newEmail }: a confirmation link goes to the new address. */
export const POST = apiRoute(async (ctx) => {
  const user = await ctx.requireUser();
  const input = await ctx.body(changeEmailSchema);
  await requestEmailChange({ actor: user, newEmail: input.newEmail, currentPassword: input.currentPassword });
  return json({ pending: input.newEmail.trim().toLowerCase() }, { status: 202 });
});
