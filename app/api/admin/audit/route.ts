import { listSiteAuditEvents } from "@/db/queries/audit";
import { assertSiteAdmin } from "@/lib/server/admin";
import { apiRoute } from "@/lib/server/api";
import { answerAuditQuery } from "@/lib/server/audit-export";

/** GET /api/admin/audit?person&kind&from&to&page&format=json|csv → { events, page, hasOlder } or CSV (site admin): every admin and account action. */
export const GET = apiRoute(async (ctx) => {
  const actor = await ctx.requireUser();
  assertSiteAdmin(actor);
  return answerAuditQuery(ctx.request.url, (filter) => listSiteAuditEvents(filter), "portolan-admin-audit.csv");
});
