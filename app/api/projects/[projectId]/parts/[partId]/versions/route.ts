import { listPartVersions, partUses } from "@/db/queries/parts";
import { apiRoute, json } from "@/lib/server/api";

type Params = { projectId: string; partId: string };

/**
 * GET …/parts/:partId/versions → { fileName, versions, uses } (every member): every version of the part
 * file that row `partId` is a version of, oldest first, with the figures stored at upload and who uploaded
 * it; and the blocks of each scenario's latest revision that use the file, with the version each pins.
 */
export const GET = apiRoute<Params>(async (ctx) => {
  const user = await ctx.requireUser();
  const { fileName, versions } = await listPartVersions({ userId: user.id, projectId: ctx.params.projectId, partId: ctx.params.partId });
  return json({ fileName, versions, uses: await partUses({ projectId: ctx.params.projectId, fileName }) });
});
