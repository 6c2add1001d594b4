import { listAuditEvents } from "@/db/queries/audit";
import { apiRoute, json } from "@/lib/server/api";

/** GET /api/projects/:projectId/audit → { events } newest first (owners). */
export const GET = apiRoute<{ projectId: string }>(async (ctx) => {
  const user = await ctx.requireUser();
  return json({ events: await listAuditEvents({ actor: user, projectId: ctx.params.projectId }) });
});
