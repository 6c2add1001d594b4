import { apiRoute, json } from "@/lib/server/api";
import { requestSignUp, SIGN_UP_REQUESTED_MESSAGE } from "@/lib/server/auth/accounts";
import { signUpSchema } from "@/lib/base/validation/auth";

/**
 * POST /api/auth/sign-up { name, email, password } → 202 { message }, the same whether or not the address
 * already has an account (its owner is e-mailed instead). Nobody is signed in: sign in next.
 */
export const POST = apiRoute(
  async (ctx) => {
    const input = await ctx.body(signUpSchema);
    // Not awaiting delivery keeps the response time independent of which message is sent.
    await requestSignUp(input);
    return json({ message: SIGN_UP_REQUESTED_MESSAGE }, { status: 202 });
  },
  { public: true },
);
