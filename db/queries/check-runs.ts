import "server-only";
import { and, desc, eq, sql } from "drizzle-orm";
import { db, type Executor } from "@/db/client";
import { checkRuns, scenarioRevisions, users } from "@/db/schema";
import type { Verdict } from "@/engine/checks";
import type { CheckName } from "@/lib/domain/checks/inputs";
import type { CheckFigures, CheckRunSummary, CheckRunView } from "@/lib/domain/checks/types";
import { AppError } from "@/lib/base/errors";
import { allow, type ProjectAccess } from "@/lib/server/permissions";
import { requireScenarioRow } from "./revisions";

/** Store one run (the caller has authorised check.run and computed the outcome). */
export async function insertCheckRun(
  run: {
    id: string;
    scenarioId: string;
    revisionId: string;
    userId: string;
    check: CheckName;
    inputs: Record<string, unknown>;
    verdict: Verdict;
    figures: CheckFigures;
    contentHash: string;
    rulesHash: string;
    engineVersion: string;
  },
  executor: Executor = db,
): Promise<void> {
  await executor.insert(checkRuns).values(run);
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
  contentHash: checkRuns.contentHash,
  rulesHash: checkRuns.rulesHash,
  engineVersion: checkRuns.engineVersion,
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
    contentHash: (row.contentHash as string | null) ?? null,
    rulesHash: (row.rulesHash as string | null) ?? null,
    engineVersion: (row.engineVersion as string | null) ?? null,
    stale: [],
    latest: true,
    userName: (row.userName as string | null) ?? null,
    createdAt: row.createdAt as Date,
    figures,
  } as CheckRunView; // the stored check names the result its figures hold (written by lib/server/check-runs.ts)
}

/**
 * A scenario's check runs, newest first, without their figures (anyone in the project). `stale` and
 * `latest` are filled in by lib/server/check-runs.ts, which knows the current rules.
 */
export async function listCheckRuns({ access, scenarioId, limit = 50 }: { access: ProjectAccess; scenarioId: string; limit?: number }): Promise<CheckRunSummary[]> {
  allow(access, "scenario.read");
  await requireScenarioRow(db, { projectId: access.projectId, scenarioId }); // 404s a foreign scenario
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

/** The newest run of a check on a revision with the given identity, if any (the caller has authorised). */
export async function findCurrentRun({ scenarioId, revisionId, check, rulesHash, engineVersion }: { scenarioId: string; revisionId: string; check: CheckName; rulesHash: string; engineVersion: string }): Promise<string | null> {
  const [row] = await db
    .select({ id: checkRuns.id })
    .from(checkRuns)
    .where(and(eq(checkRuns.scenarioId, scenarioId), eq(checkRuns.revisionId, revisionId), eq(checkRuns.check, check), eq(checkRuns.rulesHash, rulesHash), eq(checkRuns.engineVersion, engineVersion)))
    .orderBy(desc(checkRuns.createdAt), desc(sql`${checkRuns}.rowid`))
    .limit(1);
  return row?.id ?? null;
}

/** The newest run of a check on a revision whatever its identity (the caller has authorised), for "stale" marks. */
export async function newestRunOf({ scenarioId, revisionId, check }: { scenarioId: string; revisionId: string; check: CheckName }): Promise<{ id: string; verdict: Verdict; rulesHash: string | null; engineVersion: string | null; createdAt: Date } | null> {
  const [row] = await db
    .select({ id: checkRuns.id, verdict: checkRuns.verdict, rulesHash: checkRuns.rulesHash, engineVersion: checkRuns.engineVersion, createdAt: checkRuns.createdAt })
    .from(checkRuns)
    .where(and(eq(checkRuns.scenarioId, scenarioId), eq(checkRuns.revisionId, revisionId), eq(checkRuns.check, check)))
    .orderBy(desc(checkRuns.createdAt), desc(sql`${checkRuns}.rowid`))
    .limit(1);
  return row ?? null;
}

/** One run with its figures (anyone in the project). */
export async function getCheckRun({ access, scenarioId, runId }: { access: ProjectAccess; scenarioId: string; runId: string }): Promise<CheckRunView> {
  allow(access, "scenario.read");
  await requireScenarioRow(db, { projectId: access.projectId, scenarioId }); // 404s a foreign scenario
  const [row] = await db
    .select(runColumns)
    .from(checkRuns)
    .leftJoin(scenarioRevisions, eq(scenarioRevisions.id, checkRuns.revisionId))
    .leftJoin(users, eq(users.id, checkRuns.userId))
    .where(and(eq(checkRuns.id, runId), eq(checkRuns.scenarioId, scenarioId)));
  if (!row) throw new AppError("not_found", 404, "Check run not found.");
  return toView(row);
}
