import { runInTransaction } from "@/db/client";
import { getSignupMode, setSignupMode } from "@/db/queries/settings";
import { assertSiteAdmin } from "@/lib/server/admin";
import { apiRoute, json } from "@/lib/server/api";
import { updateSettingsSchema } from "@/lib/base/validation/admin";

/** GET /api/admin/settings → { settings: { signupMode } } (site admin). */
export const GET = apiRoute(async (ctx) => {
  const user = await ctx.requireUser();
  assertSiteAdmin(user);
  return json({ settings: { signupMode: await getSignupMode() } });
});

/** PATCH /api/admin/settings { signupMode: "open" | "invite" } → { settings } (site admin). */
export const PATCH = apiRoute(async (ctx) => {
  const input = await ctx.body(updateSettingsSchema);
  const user = await ctx.requireUser();
  assertSiteAdmin(user);
  await runInTransaction((tx) => setSignupMode({ mode: input.signupMode, actor: user, executor: tx }));
  return json({ settings: { signupMode: input.signupMode } });
});
