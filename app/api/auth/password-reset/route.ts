import { apiRoute, json } from "@/lib/server/api";
import { RESET_REQUESTED_MESSAGE, requestPasswordReset } from "@/lib/server/auth/password-reset";
import { passwordResetRequestSchema } from "@/lib/base/validation/auth";

/** POST /api/auth/password-reset { email } → 202, the same answer whether or not the account exists. */
export const POST = apiRoute(async (ctx) => {
  const { email } = await ctx.body(passwordResetRequestSchema);
  // Not awaiting delivery keeps the response time independent of whether a message is sent.
  await requestPasswordReset({ email });
  return json({ message: RESET_REQUESTED_MESSAGE }, { status: 202 });
}, { public: true });
