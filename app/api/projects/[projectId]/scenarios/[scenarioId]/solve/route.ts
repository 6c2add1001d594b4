import { getPartTexts } from "@/db/queries/parts";
import { getScenario } from "@/db/queries/scenarios";
import { parseScenario } from "@/engine/scenario";
import { solveScenario } from "@/engine/system";
import { writeTouchstone } from "@/engine/touchstone";
import { EngineInputError, SingularSystemError, type Solution } from "@/engine/types";
import { apiRoute, json, parseWith } from "@/lib/server/api";
import { fileStem } from "@/lib/domain/scenarios/file-stem";
import { solutionToCsv } from "@/lib/domain/results/results-math";
import { scenarioForEngine } from "@/lib/domain/scenarios/for-engine";
import { AppError } from "@/lib/base/errors";
import { solveQuerySchema } from "@/lib/base/validation/scenarios";

type Params = { projectId: string; scenarioId: string };

/** The composite in the shape of `portolan solve --json` (engine/cli.ts solutionToJson). */
function toJson(solution: Solution) {
  const { n, nf, data } = solution.s;
  const s: [number, number][][][] = [];
  for (let k = 0; k < nf; k++) {
    const rows: [number, number][][] = [];
    for (let i = 0; i < n; i++) {
      const row: [number, number][] = [];
      for (let j = 0; j < n; j++) {
        const at = 2 * ((k * n + i) * n + j);
        row.push([data[at], data[at + 1]]);
      }
      rows.push(row);
    }
    s.push(rows);
  }
  return { frequencies: Array.from(solution.frequencies), ports: solution.ports, port_z0: solution.portZ0, s, warnings: solution.warnings, solve_ms: solution.solveMs };
}

/** Touchstone of the composite as `portolan solve` writes it: 1.1 when all system ports share a Z0, else 2.0. */
function toTouchstone(solution: Solution, name: string): string {
  const z0s = solution.portZ0;
  const uniform = z0s.every((z) => z === z0s[0]);
  return writeTouchstone(
    {
      frequencies: solution.frequencies,
      s: solution.s,
      z0: uniform ? z0s[0] : Float64Array.from(z0s.flatMap((z) => [z, 0])),
      comments: [`Portolan composite of scenario "${name}"`, ...solution.ports.map((p, i) => `port ${i + 1}: ${p} (Z0 ${z0s[i]} ohm)`), ...solution.warnings.map((w) => `warning: ${w}`)],
    },
    { version: uniform ? "1.1" : "2.0", format: "RI", unit: "Hz" },
  );
}

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
  if (query.format === "json") return json(toJson(solution), { headers });
  const text = query.format === "csv" ? solutionToCsv(solution) : toTouchstone(solution, scenario.name);
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
