import "server-only";
import { getPartTexts, partFilesOf } from "@/db/queries/parts";
import { createScenario, loadScenario } from "@/db/queries/scenarios";
import { parseScenario } from "@/engine/scenario";
import { sampleScenario } from "@/engine/spread";
import { prepareSystem } from "@/engine/system";
import { checkSolveSize, estimateSolve } from "@/engine/system/estimate";
import { AppError } from "@/lib/base/errors";
import { getEnv } from "@/lib/base/env";
import { draftScenarioSchema } from "@/lib/base/validation/scenarios";
import type { SessionUser } from "@/lib/server/auth/session";
import { getRunWithFreshness } from "@/lib/server/check-runs";
import { allow, type ProjectAccess } from "@/lib/server/permissions";
import { scenarioForEngine } from "@/lib/domain/scenarios/for-engine";

/**
 * "Open worst sample as a scenario": the sample of a stored spread run with the lowest margin of one rule
 * becomes a scenario of its own (sampleScenario: sampled values set, parts with spreads as inline data,
 * spreads removed), created like any other (scenario.create: engineers and owners). The sample is rebuilt
 * from the run's own revision, so it is the sample the run judged even after later edits.
 *
 * @throws AppError 422 when the run is not a spread run, names no such rule, or the rule has no worst sample
 */
export async function openWorstSample({ access, actor, scenarioId, runId, rule }: { access: ProjectAccess; actor: SessionUser; scenarioId: string; runId: string; rule: string }) {
  allow(access, "scenario.create");
  const run = await getRunWithFreshness({ access, scenarioId, runId });
  if (run.check !== "spread") throw new AppError("unprocessable", 422, "Only a spread analysis has samples to open.", { runId: "Choose a spread analysis run." });
  const result = run.figures.result.rules.find((r) => r.id === rule);
  if (!result) throw new AppError("unprocessable", 422, `The run judged no rule "${rule}".`, { rule: `One of: ${run.figures.result.rules.map((r) => r.id).join(", ")}.` });
  if (!result.worst) throw new AppError("unprocessable", 422, `No sample of rule "${rule}" has a margin to rank.`, { rule: "This rule has no worst sample." });
  if (!run.revisionId) throw new AppError("unprocessable", 422, "The run's revision is gone.", { runId: "Run the analysis again." });
  const { scenario, revision } = await loadScenario(access, { scenarioId, revisionId: run.revisionId });
  const parts = await getPartTexts({ projectId: access.projectId, files: partFilesOf(revision.content) });
  const parsed = parseScenario(scenarioForEngine(revision.content), { parts });
  // the nominal system is built on this thread: refuse what the job pool would refuse
  checkSolveSize(estimateSolve(parsed, { parts, waves: false }), getEnv().maxSolveBytes);
  const sample = sampleScenario(prepareSystem(parsed, { parts }), result.worst.values);
  const name = `${scenario.name} — worst ${rule} (seed ${run.figures.result.seed}, sample ${result.worst.sample})`.slice(0, 200);
  const content = draftScenarioSchema.parse({ ...sample, name });
  return createScenario({ actor, projectId: access.projectId, name, content });
}
