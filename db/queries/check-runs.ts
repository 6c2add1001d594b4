import "server-only";
import { and, desc, eq, sql } from "drizzle-orm";
import { gunzipSync } from "node:zlib";
import { db, runInTransaction, type Executor } from "@/db/client";
import { checkRuns, scenarioRevisions, users } from "@/db/schema";
import type { Verdict } from "@/engine/checks";
import type { CheckName } from "@/lib/domain/checks/inputs";
import type { CheckFigures, CheckRunSummary, CheckRunView } from "@/lib/domain/checks/types";
import { recordAudit } from "@/lib/server/audit";
import type { SessionUser } from "@/lib/server/auth/session";
import { AppError } from "@/lib/base/errors";
import { allow, type ProjectAccess } from "@/lib/server/permissions";
import { requireScenarioRow } from "./revisions";

/**
 * Store one run (the caller has authorised check.run and computed the outcome), its figures as gzip'd
 * JSON, then apply the retention rule to its (scenario, check, revision): the `keep` newest runs stay, and
 * every pinned run (one a sign-off or bundle refers to); older ones are deleted. One atomic batch, which
 * also reads the stored run back before the rule applies: under concurrent runs of the same check, a
 * later run's pruning may delete this one before its own answer could read it (bench:api saw 404s).
 *
 * @returns the stored run, as getCheckRun would give it
 */
export async function insertCheckRun(
  run: {
    id: string;
    scenarioId: string;
    revisionId: string;
    userId: string;
    check: CheckName;
    inputs: Record<string, unknown>;
    verdict: Verdict;
    headline: string;
    figuresGz: Uint8Array;
    contentHash: string;
    rulesHash: string;
    engineVersion: string;
  },
  { keep }: { keep: number },
): Promise<CheckRunView> {
  const { figuresGz, ...rest } = run;
  // one batch (atomic, one implicit transaction) rather than an interactive transaction: concurrent check
  // runs then never wait on each other's open transaction and fail as "database is locked"
  const [, stored] = await db.batch([
    db.insert(checkRuns).values({ ...rest, figuresGz: Buffer.from(figuresGz), figuresBytes: figuresGz.byteLength }),
    runQuery(run.id, run.scenarioId),
    db.run(pruneStatement({ scenarioId: run.scenarioId, keep, check: run.check, revisionId: run.revisionId })),
  ]);
  return toView(stored[0]);
}

function pruneStatement({ scenarioId, keep, check, revisionId }: { scenarioId: string; keep: number; check?: CheckName; revisionId?: string }) {
  const group = check !== undefined && revisionId !== undefined ? sql` and ${checkRuns.check} = ${check} and ${checkRuns.revisionId} = ${revisionId}` : sql``;
  // rank within (check, revision), newest first; rowid orders runs of the same second (created_at has whole seconds)
  return sql`
    delete from ${checkRuns} where id in (
      select id from (
        select id, pinned, row_number() over (partition by "check", revision_id order by created_at desc, rowid desc) as rank
        from ${checkRuns} where ${checkRuns.scenarioId} = ${scenarioId}${group}
      ) where rank > ${keep} and pinned = 0
    )`;
}

/**
 * Deletes a scenario's runs beyond the `keep` newest of each (check, revision), pinned runs excepted;
 * with `check` and `revisionId`, only in that group.
 *
 * @returns the number of runs deleted
 */
export async function pruneRuns(executor: Executor, { scenarioId, keep, check, revisionId }: { scenarioId: string; keep: number; check?: CheckName; revisionId?: string }): Promise<number> {
  const result = await executor.run(pruneStatement({ scenarioId, keep, check, revisionId }));
  return Number((result as { rowsAffected?: number }).rowsAffected ?? 0);
}

/** Storage of a scenario's runs: count and bytes, and how many of them the retention rule would delete. */
export type RunStorage = { runs: number; bytes: number; pinned: number; clearable: number; clearableBytes: number; keptPerCheck: number };

/** What a scenario's check runs take (anyone in the project may see it). */
export async function runStorage({ access, scenarioId, keep }: { access: ProjectAccess; scenarioId: string; keep: number }): Promise<RunStorage> {
  allow(access, "scenario.read");
  await requireScenarioRow(db, { projectId: access.projectId, scenarioId });
  const [row] = (await db.all(sql`
    select count(*) as runs, coalesce(sum(figures_bytes), 0) as bytes, coalesce(sum(pinned), 0) as pinned,
      coalesce(sum(case when rank > ${keep} and pinned = 0 then 1 else 0 end), 0) as clearable,
      coalesce(sum(case when rank > ${keep} and pinned = 0 then figures_bytes else 0 end), 0) as clearableBytes
    from (
      select figures_bytes, pinned, row_number() over (partition by "check", revision_id order by created_at desc, rowid desc) as rank
      from ${checkRuns} where ${checkRuns.scenarioId} = ${scenarioId}
    )`)) as { runs: number; bytes: number; pinned: number; clearable: number; clearableBytes: number }[];
  return { runs: Number(row.runs), bytes: Number(row.bytes), pinned: Number(row.pinned), clearable: Number(row.clearable), clearableBytes: Number(row.clearableBytes), keptPerCheck: keep };
}

/**
 * Clears a scenario's runs beyond the retention rule (owners: project.update); audited.
 *
 * @returns how many runs were deleted
 */
export async function clearRuns({ access, actor, scenarioId, keep }: { access: ProjectAccess; actor: SessionUser; scenarioId: string; keep: number }): Promise<number> {
  allow(access, "runs.clear");
  const scenario = await requireScenarioRow(db, { projectId: access.projectId, scenarioId });
  return runInTransaction(async (tx) => {
    const deleted = await pruneRuns(tx, { scenarioId, keep });
    await recordAudit(tx, { actor, projectId: access.projectId, action: "check_runs.clear", target: scenario.name, detail: { scenarioId, deleted, kept: keep } });
    return deleted;
  });
}

const runColumns = {
  id: checkRuns.id,
  scenarioId: checkRuns.scenarioId,
  revisionId: checkRuns.revisionId,
  revisionNumber: scenarioRevisions.number,
  check: checkRuns.check,
  inputs: checkRuns.inputs,
  verdict: checkRuns.verdict,
  contentHash: checkRuns.contentHash,
  rulesHash: checkRuns.rulesHash,
  engineVersion: checkRuns.engineVersion,
  headline: checkRuns.headline,
  userName: users.name,
  createdAt: checkRuns.createdAt,
};

type RunRow = { [K in keyof typeof runColumns]: unknown } & { figures?: unknown; figuresGz?: unknown };

/** The stored figures: gzip'd JSON in figures_gz, or the JSON text of runs stored before it existed. */
function readFigures(row: { figures?: unknown; figuresGz?: unknown }): CheckFigures {
  if (row.figuresGz) return JSON.parse(gunzipSync(row.figuresGz as Uint8Array).toString("utf8")) as CheckFigures;
  return (row.figures ?? { headline: "", result: null }) as CheckFigures;
}

function toView(row: RunRow): CheckRunView {
  const figures = "figures" in row || "figuresGz" in row ? readFigures(row) : ({ headline: (row.headline as string | null) ?? "", result: null } as unknown as CheckFigures);
  return {
    id: row.id as string,
    scenarioId: row.scenarioId as string,
    revisionId: (row.revisionId as string | null) ?? null,
    revisionNumber: (row.revisionNumber as number | null) ?? null,
    check: row.check as CheckName,
    inputs: (row.inputs as Record<string, unknown> | null) ?? {},
    verdict: row.verdict as Verdict,
    headline: (row.headline as string | null) ?? figures.headline ?? "",
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
  const [row] = await runQuery(runId, scenarioId);
  if (!row) throw new AppError("not_found", 404, "Check run not found.");
  return toView(row);
}

/** One run with its figures, the revision's number and the runner's name. */
function runQuery(runId: string, scenarioId: string) {
  return db
    .select({ ...runColumns, figures: checkRuns.figures, figuresGz: checkRuns.figuresGz })
    .from(checkRuns)
    .leftJoin(scenarioRevisions, eq(scenarioRevisions.id, checkRuns.revisionId))
    .leftJoin(users, eq(users.id, checkRuns.userId))
    .where(and(eq(checkRuns.id, runId), eq(checkRuns.scenarioId, scenarioId)));
}
