import { apiRoute, json } from "@/lib/server/api";
import { signUp } from "@/lib/server/auth/accounts";
import { signUpSchema } from "@/lib/base/validation/auth";

/** POST /api/auth/sign-up { name, email, password } → 201 { user } and a session cookie. */
export const POST = apiRoute(async (ctx) => {
  const input = await ctx.body(signUpSchema);
  const { user, cookie } = await signUp(input);
  ctx.setCookie(cookie);
  return json({ user }, { status: 201 });
});
