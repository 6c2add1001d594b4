import { apiRoute, json } from "@/lib/server/api";
import { listOwnSessions } from "@/lib/server/account";

/** GET /api/account/sessions → { sessions: [{ handle, createdAt, expiresAt, current }] }, one's own only. */
export const GET = apiRoute(async (ctx) => {
  const user = await ctx.requireUser();
  return json({ sessions: await listOwnSessions({ userId: user.id, currentSessionId: ctx.session()?.id ?? null }) });
});
