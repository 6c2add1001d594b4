import { getPartTexts } from "@/db/queries/parts";
import { getScenario } from "@/db/queries/scenarios";
import { parseScenario } from "@/engine/scenario";
import { solutionToJson, solveScenario } from "@/engine/system";
import { writeCompositeTouchstone } from "@/engine/touchstone";
import { EngineInputError, SingularSystemError, type Solution } from "@/engine/types";
import { apiRoute, json, parseWith } from "@/lib/server/api";
import { fileStem } from "@/lib/domain/scenarios/file-stem";
import { solutionToCsv } from "@/lib/domain/results/results-math";
import { scenarioForEngine } from "@/lib/domain/scenarios/for-engine";
import { AppError } from "@/lib/base/errors";
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
  const parts = await getPartTexts({ projectId: ctx.params.projectId });
  let solution: Solution;
  try {
    const parsed = parseScenario(scenarioForEngine(revision.content), { parts });
    solution = solveScenario(parsed, { parts });
  } catch (error) {
    if (error instanceof EngineInputError || error instanceof SingularSystemError) {
      throw new AppError("unprocessable", 422, `Revision ${revision.number} cannot be solved: ${error.message}`);
    }
    throw error;
  }
  const stem = `${fileStem(scenario.name)}-r${revision.number}`;
  const headers = { "x-portolan-revision": String(revision.number), "x-portolan-content-hash": revision.contentHash };
  if (query.format === "json") return json(solutionToJson(solution), { headers });
  const text = query.format === "csv" ? solutionToCsv(solution) : writeCompositeTouchstone(solution, { scenarioName: scenario.name });
  const fileName = query.format === "csv" ? `${stem}.csv` : `${stem}.s${solution.ports.length}p`;
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
