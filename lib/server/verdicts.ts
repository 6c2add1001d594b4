import "server-only";
import { db, type Executor } from "@/db/client";
import { findCurrentRun, newestRunOf } from "@/db/queries/check-runs";
import { getPartTexts, partFilesOf } from "@/db/queries/parts";
import { projectRuleSpecs } from "@/db/queries/rules";
import { latestScenarioContents, loadScenario } from "@/db/queries/scenarios";
import { hashRuleSet } from "@/engine/bundle";
import { effectiveRuleSet, type EffectiveRuleSet } from "@/engine/checks";
import { parseScenario } from "@/engine/scenario";
import { solveScenario } from "@/engine/system";
import { EngineInputError, SingularSystemError, type RuleSpec, type Scenario } from "@/engine/types";
import { ENGINE_VERSION } from "@/engine/version";
import { AppError } from "@/lib/base/errors";
import type { CheckRunView, RevisionVerdict } from "@/lib/domain/checks/types";

export type { RevisionVerdict };
import { scenarioForEngine } from "@/lib/domain/scenarios/for-engine";
import type { SessionUser } from "@/lib/server/auth/session";
import { resolveAccess } from "@/lib/server/permissions";
import { getRunWithFreshness, runCheck, staleReasons } from "@/lib/server/check-runs";

/** A revision's effective rule set and its hash (docs/checks.md "Verdict identity"). */
export type RevisionRules = { ruleSet: EffectiveRuleSet; rulesHash: string };

/** The effective rule set of a revision's content under the project's current rules. */
export async function revisionRules({ projectId, content, executor = db }: { projectId: string; content: Scenario; executor?: Executor }): Promise<RevisionRules> {
  const ruleSet = effectiveRuleSet(await projectRuleSpecs({ projectId, executor }), content);
  return { ruleSet, rulesHash: hashRuleSet(ruleSet) };
}

/** Why a revision cannot be solved (the engine's message), or null when it solves. */
export async function solveProblem({ projectId, content }: { projectId: string; content: Scenario }): Promise<string | null> {
  // only the part versions this content pins (a library with many versions is not read whole)
  const parts = await getPartTexts({ projectId, files: partFilesOf(content) });
  try {
    solveScenario(parseScenario(scenarioForEngine(content), { parts }), { parts });
    return null;
  } catch (error) {
    if (error instanceof EngineInputError || error instanceof SingularSystemError) return error.message;
    throw error;
  }
}

/** Rule ids and built-in check names that fail in an "all rules" run: what a waiver must name. */
export function failingItems(run: Extract<CheckRunView, { check: "all_rules" }>): string[] {
  return run.figures.result.checks.filter((c) => c.verdict === "fail").map((c) => (c.name.startsWith("rule:") ? c.name.slice("rule:".length) : c.name));
}

/**
 * The current verdict of a revision (default the latest): the newest stored "all rules" run with the
 * revision's current rules hash and this engine version. With `ensure`, runs and stores it when there is
 * none (check.run); an unsolvable revision is then 422 naming the problem.
 */
export async function revisionVerdict({
  actor,
  projectId,
  scenarioId,
  revisionId,
  ensure,
}: {
  actor: SessionUser;
  projectId: string;
  scenarioId: string;
  revisionId?: string;
  ensure: boolean;
}): Promise<RevisionVerdict> {
  const access = await resolveAccess({ userId: actor.id, projectId });
  const { revision } = await loadScenario(access, { scenarioId, revisionId });
  const { ruleSet, rulesHash } = await revisionRules({ projectId, content: revision.content });
  let runId = await findCurrentRun({ scenarioId, revisionId: revision.id, check: "all_rules", rulesHash, engineVersion: ENGINE_VERSION });
  if (!runId && ensure) runId = (await runCheck({ access, scenarioId, request: { check: "all_rules", inputs: {}, revisionId: revision.id } })).id;
  let run: RevisionVerdict["run"] = null;
  if (runId) {
    const view = await getRunWithFreshness({ access, scenarioId, runId });
    if (view.check !== "all_rules") throw new AppError("internal", 500, "Stored run is not an all-rules run.");
    run = view;
  }
  return {
    revisionId: revision.id,
    revisionNumber: revision.number,
    contentHash: revision.contentHash,
    rulesHash,
    engineVersion: ENGINE_VERSION,
    ruleSet,
    run,
    failing: run && run.verdict === "fail" ? failingItems(run) : [],
  };
}

/** How the project's scenarios depart from one project rule: overrides (with their rule) and opt-outs (with reasons). */
export type RuleUsage = {
  overrides: { scenarioId: string; scenarioName: string; rule: RuleSpec; by?: string; at?: string }[];
  optOuts: { scenarioId: string; scenarioName: string; reason: string; by?: string; at?: string }[];
};

/** For each project rule (by name), the scenarios whose latest revision overrides or opts out of it (anyone in the project). */
export async function projectRuleUsage({ userId, projectId }: { userId: string; projectId: string }): Promise<Record<string, RuleUsage>> {
  const specs = await projectRuleSpecs({ projectId });
  const usage: Record<string, RuleUsage> = Object.fromEntries(specs.filter((r) => r.id).map((r) => [r.id!, { overrides: [], optOuts: [] }]));
  for (const s of await latestScenarioContents({ userId, projectId })) {
    const set = effectiveRuleSet(specs, s.content);
    for (const r of set.rules) {
      if (r.source === "scenario-override" && usage[r.id]) usage[r.id].overrides.push({ scenarioId: s.id, scenarioName: s.name, rule: r.rule, by: r.by, at: r.at });
    }
    for (const o of set.opted_out) {
      if (usage[o.id]) usage[o.id].optOuts.push({ scenarioId: s.id, scenarioName: s.name, reason: o.reason, by: o.by, at: o.at });
    }
  }
  return usage;
}

/** A scenario's latest revision and its "all rules" verdict as the project overview lists it. */
export type ScenarioVerdictRow = {
  scenarioId: string;
  scenarioName: string;
  revisionNumber: number;
  /** "current": judged by the current rules and engine; "stale": the newest verdict is not; "none": never judged */
  state: "current" | "stale" | "none";
  verdict: "pass" | "fail" | "warn" | null;
  reasons: string[];
  judgedAt: Date | null;
};

/** Each scenario's latest verdict, current or marked stale (anyone in the project). Runs nothing. */
export async function projectVerdicts({ userId, projectId }: { userId: string; projectId: string }): Promise<ScenarioVerdictRow[]> {
  const specs = await projectRuleSpecs({ projectId });
  const rows: ScenarioVerdictRow[] = [];
  for (const s of await latestScenarioContents({ userId, projectId })) {
    const rulesHash = hashRuleSet(effectiveRuleSet(specs, s.content));
    const run = await newestRunOf({ scenarioId: s.id, revisionId: s.revisionId, check: "all_rules" });
    const reasons = run ? staleReasons({ check: "all_rules", rulesHash: run.rulesHash, engineVersion: run.engineVersion }, rulesHash) : [];
    rows.push({
      scenarioId: s.id,
      scenarioName: s.name,
      revisionNumber: s.revisionNumber,
      state: !run ? "none" : reasons.length === 0 ? "current" : "stale",
      verdict: run?.verdict ?? null,
      reasons,
      judgedAt: run?.createdAt ?? null,
    });
  }
  return rows;
}
