import { apiRoute, json } from "@/lib/server/api";
import { signIn } from "@/lib/server/auth/accounts";
import { signInSchema } from "@/lib/base/validation/auth";

/** POST /api/auth/sign-in { email, password } → 200 { user } and a session cookie; 401 wrong credentials; 429 throttled. */
export const POST = apiRoute(async (ctx) => {
  const input = await ctx.body(signInSchema);
  const { user, cookie } = await signIn({ ...input, ip: ctx.ip });
  ctx.setCookie(cookie);
  return json({ user });
});
