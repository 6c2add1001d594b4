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
  run: { id: string; scenarioId: string; revisionId: string; userId: string; check: CheckName; inputs: Record<string, unknown>; verdict: Verdict; figures: CheckFigures },
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
  } as CheckRunView; // the stored check names the result its figures hold (written by lib/server/check-runs.ts)
}

/** A scenario's check runs, newest first, without their figures (anyone in the project). */
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
