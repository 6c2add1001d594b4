import { getPartTexts, partFilesOf } from "@/db/queries/parts";
import { getScenario } from "@/db/queries/scenarios";
import { apiRoute, parseWith } from "@/lib/server/api";
import { fileStem } from "@/lib/domain/scenarios/file-stem";
import { refusalError, runInPool, taskLimits } from "@/lib/server/jobs/pool";
import { solveQuerySchema } from "@/lib/base/validation/scenarios";

type Params = { projectId: string; scenarioId: string };

/**
 * GET …/solve?format=json|touchstone|csv[&revision=id]: the composite S of the latest (or given) revision,
 * solved on the server with the project's parts. 422 when the scenario cannot be solved yet.
 */
export const GET = apiRoute<Params>(async (ctx) => {
  const search = new URL(ctx.request.url).searchParams;
  const query = parseWith(solveQuerySchema, { format: search.get("format") ?? undefined, revision: search.get("revision") ?? undefined });
  const user = await ctx.requireUser();
  const { scenario, revision } = await getScenario({ userId: user.id, projectId: ctx.params.projectId, scenarioId: ctx.params.scenarioId, revisionId: query.revision });
  const parts = await getPartTexts({ projectId: ctx.params.projectId, files: partFilesOf(revision.content) });
  // solved in the job pool, never on the request's thread; the job stops when the client goes away
  const output = await runInPool(
    { kind: "solve", content: revision.content, parts, format: query.format, scenarioName: scenario.name, ...taskLimits() },
    { signal: ctx.request.signal },
  );
  if (!output.ok) throw refusalError(output, output.code === "too_large" ? `Revision ${revision.number} is too large to solve: ` : `Revision ${revision.number} cannot be solved: `);
  if (output.kind !== "solve") throw new Error(`a solve job answered ${output.kind}`);
  const stem = `${fileStem(scenario.name)}-r${revision.number}`;
  const headers = { "x-portolan-revision": String(revision.number), "x-portolan-content-hash": revision.contentHash };
  if (query.format === "json") return new Response(output.body, { status: 200, headers: { ...headers, "content-type": "application/json; charset=utf-8", "cache-control": "no-store" } });
  const text = output.body;
  // one composite port per system port (the file's .sNp)
  const fileName = query.format === "csv" ? `${stem}.csv` : `${stem}.s${revision.content.ports.length}p`;
  return new Response(text, {
    status: 200,
    headers: {
      ...headers,
      "content-type": query.format === "csv" ? "text/csv; charset=utf-8" : "text/plain; charset=utf-8",
      "content-disposition": `attachment; filename="${fileName}"`,
      "cache-control": "no-store",
    },
  });
});

