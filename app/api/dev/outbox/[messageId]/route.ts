import { getOutboxMessage } from "@/db/queries/outbox";
import { apiRoute, json } from "@/lib/server/api";
import { AppError } from "@/lib/base/errors";
import { assertOutboxAccess } from "@/lib/server/outbox";

/** GET /api/dev/outbox/:messageId → { message } with text, html and raw source (site admin). */
export const GET = apiRoute<{ messageId: string }>(async (ctx) => {
  const user = await ctx.requireUser();
  assertOutboxAccess(user);
  const message = await getOutboxMessage({ messageId: ctx.params.messageId });
  if (!message) throw new AppError("not_found", 404, "Message not found.");
  return json({ message });
});
