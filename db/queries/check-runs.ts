import "server-only";
import { randomUUID } from "node:crypto";
import { and, desc, eq, sql } from "drizzle-orm";
import { db } from "@/db/client";
import { checkRuns, scenarioRevisions, users } from "@/db/schema";
import {
  defaultDriveSources,
  driveCheck,
  evaluateRule,
  formatHz,
  leakTrace,
  powerLedger,
  runAllChecks,
  stabilityCheck,
  stateSweep,
  worstVerdict,
  type RuleResult,
  type Verdict,
} from "@/engine/checks";
import { parseScenario } from "@/engine/scenario";
import { solveScenario } from "@/engine/system";
import { EngineInputError, SingularSystemError, type RuleSpec, type Scenario, type Solution } from "@/engine/types";
import type { CheckRunRequest } from "@/components/checks/check-inputs";
import { CHECK_TITLES, type CheckName } from "@/components/checks/check-inputs";
import type { CheckFigures, CheckRunSummary, CheckRunView, SkippedRule } from "@/components/checks/types";
import { mergeRules, rulePorts, type RuleSource } from "@/components/rules/rule-spec";
import { scenarioForEngine } from "@/lib/browser/scenario-model";
import type { SessionUser } from "@/lib/server/auth/session";
import { AppError } from "@/lib/base/errors";
import { authorize } from "@/lib/server/permissions";
import { getPartTexts } from "./parts";
import { projectRuleSpecs } from "./rules";
import { getScenario } from "./scenarios";

const signed = (x: number) => `${x >= 0 ? "+" : "−"}${Math.abs(x).toFixed(2)}`;

function ruleHeadline(r: RuleResult): string {
  if (!Number.isFinite(r.worst)) return r.messages[0] ?? r.verdict;
  return `${r.id}: worst ${r.quantity} ${r.worst.toFixed(2)} ${r.unit}${r.direction ? ` (${r.direction})` : ""} at ${formatHz(r.worstHz)}, margin ${signed(r.margin)} ${r.unit === "dBm" ? "dB" : r.unit}`;
}

/** The merged rules (project + scenario) that can run on this scenario, and those that cannot. */
function applicableRules(projectRules: RuleSpec[], scenario: Scenario): { rules: RuleSpec[]; sources: { id: string; source: RuleSource }[]; skipped: SkippedRule[] } {
  const ports = new Set(scenario.ports.map((p) => p.name));
  const rules: RuleSpec[] = [];
  const sources: { id: string; source: RuleSource }[] = [];
  const skipped: SkippedRule[] = [];
  mergeRules(projectRules, scenario.rules ?? []).forEach(({ spec, source }, i) => {
    const id = spec.id ?? `rules[${i}]`;
    const missing = rulePorts(spec).filter((p) => !ports.has(p));
    if (missing.length > 0) {
      skipped.push({ id, source, reason: `the scenario has no system port ${missing.map((p) => `"${p}"`).join(", ")}` });
      return;
    }
    rules.push({ ...spec, id });
    sources.push({ id, source });
  });
  return { rules, sources, skipped };
}

/**
 * Runs one check on a solved scenario. Verdicts: rule checks as evaluateRule; leak trace "fail" when
 * `min_db` is given and the traced isolation is below it, "warn" when the listed paths leave more than
 * 1 dB unexplained, else "pass"; state sweep "pass" when every combination passes, "fail" when none
 * does, else "warn"; stability and all rules the worst of their verdicts.
 */
export function executeCheck(request: CheckRunRequest, solution: Solution, projectRules: RuleSpec[]): { verdict: Verdict; figures: CheckFigures } {
  const scenario = solution.system.scenario;
  switch (request.check) {
    case "isolation":
    case "match":
    case "insertion_loss": {
      const rule = { kind: request.check, id: request.check, ...request.inputs } as RuleSpec;
      const result = evaluateRule(solution, rule, 0);
      return { verdict: result.verdict, figures: { headline: ruleHeadline(result), result } };
    }
    case "leak_trace": {
      const { min_db, ...opts } = request.inputs;
      const result = leakTrace(solution, opts);
      const isolation = -result.trueDb;
      let verdict: Verdict = Math.abs(result.accountedDb) > 1 ? "warn" : "pass";
      if (min_db !== undefined && isolation < min_db) verdict = "fail";
      const top = result.paths[0];
      const headline = `${result.from}→${result.to} at ${formatHz(result.frequencyHz)}: ${result.trueDb.toFixed(2)} dB, ${result.paths.length} path${result.paths.length === 1 ? "" : "s"}${top ? `; strongest ${top.db.toFixed(2)} dB` : ""}`;
      return { verdict, figures: { headline, result } };
    }
    case "power_ledger": {
      const result = powerLedger(solution, request.inputs.port, request.inputs.band);
      return { verdict: result.verdict, figures: { headline: `ledger from ${result.port}: closure ${result.worstClosure.toExponential(2)} at ${formatHz(result.worstClosureHz)}`, result } };
    }
    case "drive": {
      const sources = request.inputs.sources ?? defaultDriveSources(scenario);
      if (!sources) throw new AppError("unprocessable", 422, "Give the source powers: this scenario has no drive rule to take them from.", { sources: "Add at least one source." });
      const result = driveCheck(solution, { sources, band: request.inputs.band, coherent: request.inputs.coherent });
      const headline = result.worst
        ? `worst ${result.worst.block}:${result.worst.port} ${result.worst.dbm.toFixed(2)} dBm at ${formatHz(result.worst.hz)}, rating ${result.worst.ratingDbm.toFixed(1)} dBm, margin ${signed(result.worst.margin)} dB`
        : `highest incident power ${result.maxDbm.toFixed(2)} dBm at ${formatHz(result.maxHz)}; no block is rated`;
      return { verdict: result.verdict, figures: { headline, result } };
    }
    case "state_sweep": {
      const { rules, sources, skipped } = applicableRules(projectRules, scenario);
      const result = stateSweep(solution.system, rules);
      const verdict: Verdict = result.rows.length === 0 || result.failing === 0 ? "pass" : result.passing === 0 ? "fail" : "warn";
      const headline = `${result.combinations} combination${result.combinations === 1 ? "" : "s"} × ${rules.length} rule${rules.length === 1 ? "" : "s"}: ${result.passing} pass, ${result.failing} fail`;
      return { verdict, figures: { headline, result, ruleSources: sources, skipped } };
    }
    case "stability": {
      const result = stabilityCheck(solution);
      const verdict = worstVerdict(result.map((r) => r.verdict));
      const headline = result.length === 0 ? "no amplifier and no two-port composite: nothing to check" : result.map((r) => `${r.subject}: min K ${r.minK === null ? "∞" : r.minK.toFixed(3)}`).join("; ");
      return { verdict, figures: { headline, result } };
    }
    case "all_rules": {
      const { rules, sources, skipped } = applicableRules(projectRules, scenario);
      const result = runAllChecks({ ...scenario, rules }, solution.system, solution);
      const failing = result.rules.filter((r) => r.verdict === "fail").map((r) => r.id);
      const headline = `${result.rules.length} rule${result.rules.length === 1 ? "" : "s"}, ${result.checks.length} checks: ${failing.length === 0 ? "no rule fails" : `failing ${failing.join(", ")}`}`;
      return { verdict: result.verdict, figures: { headline, result, ruleSources: sources, skipped } };
    }
  }
}

/**
 * Run a check on a scenario revision (default the latest) on the server and store the run
 * (check.run: owners, engineers and reviewers). Bad inputs for this scenario (unknown ports, bands
 * outside the plan) and unsolvable revisions are 422 and store nothing.
 */
export async function runCheck({
  actor,
  projectId,
  scenarioId,
  request,
}: {
  actor: SessionUser;
  projectId: string;
  scenarioId: string;
  request: CheckRunRequest;
}): Promise<CheckRunView> {
  await authorize({ userId: actor.id, projectId, action: "check.run" });
  const { revision } = await getScenario({ userId: actor.id, projectId, scenarioId, revisionId: request.revisionId });
  const parts = await getPartTexts({ projectId });
  const projectRules = await projectRuleSpecs({ projectId });
  let outcome: { verdict: Verdict; figures: CheckFigures };
  try {
    const scenario = parseScenario(scenarioForEngine(revision.content as unknown as Scenario), { parts });
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
  await db.insert(checkRuns).values({
    id,
    scenarioId,
    revisionId: revision.id,
    userId: actor.id,
    check: request.check,
    inputs: request.inputs as Record<string, unknown>,
    verdict: outcome.verdict,
    figures: figures as unknown as Record<string, unknown>,
  });
  return getCheckRun({ userId: actor.id, projectId, scenarioId, runId: id });
}

const runColumns = {
  id: checkRuns.id,
  scenarioId: checkRuns.scenarioId,
  revisionId: checkRuns.revisionId,
  revisionNumber: scenarioRevisions.number,
  check: checkRuns.check,
  inputs: checkRuns.inputs,
  verdict: checkRuns.verdict,
  figures: checkRuns.figures,
  userName: users.name,
  createdAt: checkRuns.createdAt,
};

type RunRow = { [K in keyof typeof runColumns]: unknown };

function toView(row: RunRow): CheckRunView {
  const figures = (row.figures ?? { headline: "", result: null }) as CheckFigures;
  return {
    id: row.id as string,
    scenarioId: row.scenarioId as string,
    revisionId: (row.revisionId as string | null) ?? null,
    revisionNumber: (row.revisionNumber as number | null) ?? null,
    check: row.check as CheckName,
    inputs: (row.inputs as Record<string, unknown> | null) ?? {},
    verdict: row.verdict as Verdict,
    headline: figures.headline ?? "",
    userName: (row.userName as string | null) ?? null,
    createdAt: row.createdAt as Date,
    figures,
  };
}

/** A scenario's check runs, newest first, without their figures (anyone in the project). */
export async function listCheckRuns({ userId, projectId, scenarioId, limit = 50 }: { userId: string; projectId: string; scenarioId: string; limit?: number }): Promise<CheckRunSummary[]> {
  await getScenario({ userId, projectId, scenarioId }); // authorises scenario.read and 404s a foreign scenario
  const rows = await db
    .select(runColumns)
    .from(checkRuns)
    .leftJoin(scenarioRevisions, eq(scenarioRevisions.id, checkRuns.revisionId))
    .leftJoin(users, eq(users.id, checkRuns.userId))
    .where(eq(checkRuns.scenarioId, scenarioId))
    // created_at has whole-second resolution by default; rowid keeps runs of the same second in insertion order
    .orderBy(desc(checkRuns.createdAt), desc(sql`${checkRuns}.rowid`))
    .limit(limit);
  return rows.map((r) => {
    const { figures: _figures, ...summary } = toView(r);
    void _figures;
    return summary;
  });
}

/** One run with its figures (anyone in the project). */
export async function getCheckRun({ userId, projectId, scenarioId, runId }: { userId: string; projectId: string; scenarioId: string; runId: string }): Promise<CheckRunView> {
  await authorize({ userId, projectId, action: "scenario.read" });
  await getScenario({ userId, projectId, scenarioId });
  const [row] = await db
    .select(runColumns)
    .from(checkRuns)
    .leftJoin(scenarioRevisions, eq(scenarioRevisions.id, checkRuns.revisionId))
    .leftJoin(users, eq(users.id, checkRuns.userId))
    .where(and(eq(checkRuns.id, runId), eq(checkRuns.scenarioId, scenarioId)));
  if (!row) throw new AppError("not_found", 404, "Check run not found.");
  return toView(row);
}
