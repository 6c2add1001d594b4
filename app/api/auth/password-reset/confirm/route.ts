import { apiRoute, json } from "@/lib/server/api";
import { confirmPasswordReset } from "@/lib/server/auth/password-reset";
import { passwordResetConfirmSchema } from "@/lib/base/validation/auth";

/** POST /api/auth/password-reset/confirm { token, password } → 200; 422 if the link expired or was used. */
export const POST = apiRoute(async (ctx) => {
  const input = await ctx.body(passwordResetConfirmSchema);
  await confirmPasswordReset(input);
  return json({ message: "Your password has been changed. Sign in with the new password." });
}, { public: true });
