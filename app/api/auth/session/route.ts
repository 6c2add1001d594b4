import { apiRoute, json } from "@/lib/server/api";

/** GET /api/auth/session → 200 { user, expiresAt } for the signed-in user; 401 otherwise. */
export const GET = apiRoute(async (ctx) => {
  const user = await ctx.requireUser();
  return json({ user, expiresAt: ctx.session()?.expiresAt ?? null });
});
