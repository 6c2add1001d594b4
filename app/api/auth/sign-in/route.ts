import { apiRoute, json } from "@/lib/server/api";
import { signIn } from "@/lib/server/auth/accounts";
import { readDeviceCookie } from "@/lib/server/auth/device";
import { signInSchema } from "@/lib/base/validation/auth";

/** POST /api/auth/sign-in { email, password } → 200 { user }, a session cookie and a device cookie; 401 wrong credentials; 429 throttled. */
export const POST = apiRoute(
  async (ctx) => {
    const input = await ctx.body(signInSchema);
    const client = { address: ctx.ip, deviceCookie: readDeviceCookie(ctx.request.headers.get("cookie")) };
    const { user, cookie, deviceCookie } = await signIn({ ...input, client });
    ctx.setCookie(cookie);
    ctx.setCookie(deviceCookie);
    return json({ user });
  },
  { public: true },
);
