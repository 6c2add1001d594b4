import { duplicateScenario } from "@/db/queries/scenarios";
import { apiRoute, json, parseWith, readBodyText } from "@/lib/server/api";
import { AppError } from "@/lib/base/errors";
import { duplicateScenarioSchema } from "@/lib/base/validation/scenarios";

type Params = { projectId: string; scenarioId: string };

/** POST [{ name? }] → 201 { scenario, revision }: a copy of the latest revision as a new scenario (engineers, owners). */
export const POST = apiRoute<Params>(async (ctx) => {
  const text = await readBodyText(ctx.request);
  let body: unknown = {};
  if (text.trim() !== "") {
    try {
      body = JSON.parse(text);
    } catch {
      throw new AppError("bad_request", 400, "The request body is not valid JSON.");
    }
  }
  const input = parseWith(duplicateScenarioSchema, body);
  const user = await ctx.requireUser();
  return json(await duplicateScenario({ actor: user, projectId: ctx.params.projectId, scenarioId: ctx.params.scenarioId, name: input.name }), { status: 201 });
});
