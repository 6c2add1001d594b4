import { z } from "zod";
import { listSiteAuditEvents } from "@/db/queries/audit";
import { assertSiteAdmin } from "@/lib/server/admin";
import { apiRoute, json } from "@/lib/server/api";
import { AppError } from "@/lib/base/errors";

const pageSchema = z.object({
  limit: z.coerce.number().int().min(1).max(500).default(200),
  offset: z.coerce.number().int().min(0).default(0),
});

/** GET /api/admin/audit?limit&offset → { events } (site admin): every admin and account action, newest first. */
export const GET = apiRoute(async (ctx) => {
  const actor = await ctx.requireUser();
  assertSiteAdmin(actor);
  const url = new URL(ctx.request.url);
  const parsed = pageSchema.safeParse({ limit: url.searchParams.get("limit") ?? undefined, offset: url.searchParams.get("offset") ?? undefined });
  if (!parsed.success) throw new AppError("validation_failed", 400, "limit must be 1–500 and offset 0 or more.", { limit: "1–500", offset: "0 or more" });
  return json({ events: await listSiteAuditEvents(parsed.data) });
});
