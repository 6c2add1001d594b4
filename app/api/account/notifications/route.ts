import { getSignoffNotifications, setSignoffNotifications } from "@/db/queries/signoffs";
import { apiRoute, json } from "@/lib/server/api";
import { notificationsSchema } from "./schema";

/** GET /api/account/notifications → { notifySignoff } for the signed-in account. */
export const GET = apiRoute(async (ctx) => {
  const user = await ctx.requireUser();
  return json({ notifySignoff: await getSignoffNotifications({ userId: user.id }) });
});

/** PATCH /api/account/notifications { notifySignoff } → { notifySignoff }: sign-off e-mails on or off. */
export const PATCH = apiRoute(async (ctx) => {
  const input = await ctx.body(notificationsSchema);
  const user = await ctx.requireUser();
  return json({ notifySignoff: await setSignoffNotifications({ actor: user, enabled: input.notifySignoff }) });
});
