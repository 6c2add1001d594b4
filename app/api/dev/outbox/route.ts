import { listOutboxMessages } from "@/db/queries/outbox";
import { apiRoute, json } from "@/lib/server/api";
import { assertOutboxAccess } from "@/lib/server/outbox";

/** GET /api/dev/outbox → { messages } newest first (site admin; 404 when the outbox is off). */
export const GET = apiRoute(async (ctx) => {
  const user = await ctx.requireUser();
  assertOutboxAccess(user);
  return json({ messages: await listOutboxMessages() });
});
