import "server-only";
import { randomUUID } from "node:crypto";
import { inArray } from "drizzle-orm";
import { db } from "@/db/client";
import { getCheckRun, insertCheckRun, listCheckRuns } from "@/db/queries/check-runs";
import { scenarioRevisions } from "@/db/schema";
import { getPartTexts } from "@/db/queries/parts";
import { projectRuleSpecs } from "@/db/queries/rules";
import { loadScenario } from "@/db/queries/scenarios";
import { hashRuleSet } from "@/engine/bundle";
import { effectiveRuleSet } from "@/engine/checks";
import { parseScenario } from "@/engine/scenario";
import { solveScenario } from "@/engine/system";
import { EngineInputError, SingularSystemError, type Scenario } from "@/engine/types";
import { ENGINE_VERSION } from "@/engine/version";
import { AppError } from "@/lib/base/errors";
import { executeCheck } from "@/lib/domain/checks/execute";
import { CHECK_TITLES, type CheckName, type CheckRunRequest } from "@/lib/domain/checks/inputs";
import type { CheckFigures, CheckOutcome, CheckRunSummary, CheckRunView } from "@/lib/domain/checks/types";
import { scenarioForEngine } from "@/lib/domain/scenarios/for-engine";
import { allow, type ProjectAccess } from "@/lib/server/permissions";

/**
 * Run a check on a scenario revision (default the latest) on the server and store the run
 * (check.run: owners, engineers and reviewers), with the caller's access resolved once by the route. Bad
 * inputs for this scenario (unknown ports, bands outside the plan) and unsolvable revisions are 422 and
 * store nothing. The run records what its verdict is of: the revision's content hash, the hash of its
 * effective rule set and the engine version.
 */
export async function runCheck({ access, scenarioId, request }: { access: ProjectAccess; scenarioId: string; request: CheckRunRequest }): Promise<CheckRunView> {
  allow(access, "check.run");
  const { projectId } = access;
  const { revision } = await loadScenario(access, { scenarioId, revisionId: request.revisionId });
  const parts = await getPartTexts({ projectId });
  // the rules come from the stored content (not the engine's parse), so overrides and opt-outs are read as saved
  const ruleSet = effectiveRuleSet(await projectRuleSpecs({ projectId }), revision.content);
  let outcome: CheckOutcome;
  try {
    const scenario = parseScenario(scenarioForEngine(revision.content), { parts });
    const solution = solveScenario(scenario, { parts });
    outcome = executeCheck(request, solution, ruleSet);
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
    contentHash: revision.contentHash,
    rulesHash: hashRuleSet(ruleSet),
    engineVersion: ENGINE_VERSION,
  });
  return getRunWithFreshness({ access, scenarioId, runId: id });
}

/** Checks whose verdict depends on the rules (the others judge the revision alone). */
export const RULE_CHECKS: readonly CheckName[] = ["all_rules", "state_sweep"];

/**
 * Why a stored verdict is no longer current for its revision, in words (empty when current): recorded
 * before runs carried their identity, another engine version, or (for rule checks) other rules.
 */
export function staleReasons(run: Pick<CheckRunSummary, "check" | "rulesHash" | "engineVersion">, currentRulesHash: string | null): string[] {
  if (run.engineVersion === null || run.rulesHash === null) return ["recorded before verdicts carried their rules and engine version"];
  const reasons: string[] = [];
  if (run.engineVersion !== ENGINE_VERSION) reasons.push(`judged by engine ${run.engineVersion}, now ${ENGINE_VERSION}`);
  if (RULE_CHECKS.includes(run.check) && currentRulesHash !== null && run.rulesHash !== currentRulesHash) reasons.push("the rules changed since it ran");
  return reasons;
}

/** Current rules hashes of the given revisions (one query for their contents). */
async function rulesHashes(projectId: string, revisionIds: string[]): Promise<Map<string, string>> {
  const ids = [...new Set(revisionIds)];
  if (ids.length === 0) return new Map();
  const rows = await db.select({ id: scenarioRevisions.id, content: scenarioRevisions.content }).from(scenarioRevisions).where(inArray(scenarioRevisions.id, ids));
  const specs = await projectRuleSpecs({ projectId });
  return new Map(rows.map((r) => [r.id, hashRuleSet(effectiveRuleSet(specs, r.content as unknown as Scenario))]));
}

/** A scenario's runs, newest first, each marked current or stale (anyone in the project). */
export async function listRunsWithFreshness({ access, scenarioId, limit }: { access: ProjectAccess; scenarioId: string; limit?: number }): Promise<CheckRunSummary[]> {
  const { scenario } = await loadScenario(access, { scenarioId });
  const runs = await listCheckRuns({ access, scenarioId, limit });
  const hashes = await rulesHashes(access.projectId, runs.flatMap((r) => (r.revisionId ? [r.revisionId] : [])));
  return runs.map((r) => ({ ...r, stale: staleReasons(r, r.revisionId ? (hashes.get(r.revisionId) ?? null) : null), latest: r.revisionId === scenario.latestRevisionId }));
}

/** One run with its figures, marked current or stale (anyone in the project). */
export async function getRunWithFreshness({ access, scenarioId, runId }: { access: ProjectAccess; scenarioId: string; runId: string }): Promise<CheckRunView> {
  const { scenario } = await loadScenario(access, { scenarioId });
  const run = await getCheckRun({ access, scenarioId, runId });
  const hashes = await rulesHashes(access.projectId, run.revisionId ? [run.revisionId] : []);
  return { ...run, stale: staleReasons(run, run.revisionId ? (hashes.get(run.revisionId) ?? null) : null), latest: run.revisionId === scenario.latestRevisionId };
}

