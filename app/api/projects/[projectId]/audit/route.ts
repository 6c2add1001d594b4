import { listAuditEvents } from "@/db/queries/audit";
import { apiRoute } from "@/lib/server/api";
import { answerAuditQuery } from "@/lib/server/audit-export";

/** GET /api/projects/:projectId/audit?person&kind&from&to&page&format=json|csv → { events, page, hasOlder } newest first, or CSV (owners). */
export const GET = apiRoute<{ projectId: string }>(async (ctx) => {
  const user = await ctx.requireUser();
  return answerAuditQuery(ctx.request.url, (filter) => listAuditEvents({ actor: user, projectId: ctx.params.projectId, ...filter }), "portolan-project-audit.csv");
});
