import "server-only";
import { randomUUID } from "node:crypto";
import { getCheckRun, insertCheckRun } from "@/db/queries/check-runs";
import { getPartTexts } from "@/db/queries/parts";
import { projectRuleSpecs } from "@/db/queries/rules";
import { loadScenario } from "@/db/queries/scenarios";
import { parseScenario } from "@/engine/scenario";
import { solveScenario } from "@/engine/system";
import { EngineInputError, SingularSystemError } from "@/engine/types";
import { AppError } from "@/lib/base/errors";
import { executeCheck } from "@/lib/domain/checks/execute";
import { CHECK_TITLES, type CheckRunRequest } from "@/lib/domain/checks/inputs";
import type { CheckFigures, CheckOutcome, CheckRunView } from "@/lib/domain/checks/types";
import { scenarioForEngine } from "@/lib/domain/scenarios/for-engine";
import { allow, type ProjectAccess } from "@/lib/server/permissions";

/**
 * Run a check on a scenario revision (default the latest) on the server and store the run
 * (check.run: owners, engineers and reviewers), with the caller's access resolved once by the route. Bad inputs for this scenario (unknown ports, bands
 * outside the plan) and unsolvable revisions are 422 and store nothing.
 */
export async function runCheck({ access, scenarioId, request }: { access: ProjectAccess; scenarioId: string; request: CheckRunRequest }): Promise<CheckRunView> {
  allow(access, "check.run");
  const { projectId } = access;
  const { revision } = await loadScenario(access, { scenarioId, revisionId: request.revisionId });
  const parts = await getPartTexts({ projectId });
  const projectRules = await projectRuleSpecs({ projectId });
  let outcome: CheckOutcome;
  try {
    const scenario = parseScenario(scenarioForEngine(revision.content), { parts });
    const solution = solveScenario(scenario, { parts });
    outcome = executeCheck(request, solution, projectRules);
  } catch (error) {
    if (error instanceof EngineInputError || error instanceof SingularSystemError) {
      throw new AppError("unprocessable", 422, `${CHECK_TITLES[request.check]} on revision ${revision.number}: ${error.message}`);
    }
    throw error;
  }
  // JSON round trip: stored exactly as the client will read it (no typed arrays, ±∞ as null)
  const figures = JSON.parse(JSON.stringify(outcome.figures)) as CheckFigures;
  const id = randomUUID();
  await insertCheckRun({
    id,
    scenarioId,
    revisionId: revision.id,
    userId: access.userId,
    check: request.check,
    inputs: request.inputs as Record<string, unknown>,
    verdict: outcome.verdict,
    figures,
  });
  return getCheckRun({ access, scenarioId, runId: id });
}
