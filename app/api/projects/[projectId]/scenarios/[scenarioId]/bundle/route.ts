import { apiRoute, parseWith } from "@/lib/server/api";
import { exportBundle } from "@/lib/server/bundle/export";
import { resolveAccess } from "@/lib/server/permissions";
import { idSchema } from "@/lib/base/validation/common";

type Params = { projectId: string; scenarioId: string };

/**
 * GET …/scenarios/:scenarioId/bundle[?revisionId=id] → the review bundle (application/zip) of the latest
 * (or given) revision. Every member may export; 422 when the revision cannot be solved.
 */
export const GET = apiRoute<Params>(async (ctx) => {
  const raw = new URL(ctx.request.url).searchParams.get("revisionId");
  const revisionId = raw === null || raw === "" ? undefined : parseWith(idSchema, raw);
  const user = await ctx.requireUser();
  const access = await resolveAccess({ userId: user.id, projectId: ctx.params.projectId });
  const bundle = await exportBundle({ actor: user, access, scenarioId: ctx.params.scenarioId, revisionId, signal: ctx.request.signal });
  return new Response(new Blob([new Uint8Array(bundle.bytes)]), {
    status: 200,
    headers: {
      "content-type": "application/zip",
      "content-disposition": `attachment; filename="${bundle.fileName}"`,
      "content-length": String(bundle.bytes.length),
      "cache-control": "no-store",
      "x-portolan-revision": String(bundle.revisionNumber),
      "x-portolan-content-hash": bundle.contentHash,
    },
  });
});
