import { apiRoute, json } from "@/lib/server/api";
import { confirmEmailChange } from "@/lib/server/account";
import { confirmEmailSchema } from "@/lib/base/validation/account";

/** POST /api/auth/email-change/confirm { token } → { email } (public: the mailed link is the proof). */
export const POST = apiRoute(
  async (ctx) => {
    const input = await ctx.body(confirmEmailSchema);
    const { email } = await confirmEmailChange({ token: input.token });
    return json({ email });
  },
  { public: true },
);
