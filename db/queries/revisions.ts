import "server-only";
import { createHash, randomUUID } from "node:crypto";
import { and, desc, eq } from "drizzle-orm";
import { db, runInTransaction, type Executor } from "@/db/client";
import { scenarioDrafts, scenarioRevisions, scenarios, users, type ScenarioRevision } from "@/db/schema";
import { CanonicalJsonError, canonicalJson } from "@/engine/canonical-json";
import type { Scenario } from "@/engine/types";
import { scenarioWarnings } from "@/lib/domain/scenarios/for-engine";
import { recordAudit } from "@/lib/server/audit";
import type { SessionUser } from "@/lib/server/auth/session";
import { AppError } from "@/lib/base/errors";
import { authorize } from "@/lib/server/permissions";
import type { DraftScenario } from "@/lib/base/validation/scenarios";
import { stampRuleChanges } from "@/lib/domain/rules/stamp";
import { mergeScenarios, type MergeChoice, type MergeConflict } from "@/lib/domain/scenarios/merge";
import { summarizeChanges, type RevisionChangeSummary } from "@/lib/domain/scenarios/summary";
import { getPartTexts, partFilesOf } from "./parts";
import { partPinMoves } from "@/lib/domain/parts/pins";

export type RevisionOrigin = "create" | "save" | "restore" | "duplicate" | "seed" | "import" | "migrate";

/** A revision as the API returns it. */
export type RevisionDetail = {
  id: string;
  number: number;
  content: Scenario;
  contentHash: string;
  warnings: string[];
  origin: string;
  restoredFrom: number | null;
  authorName: string | null;
  /** the author's note on a deliberate save */
  note: string | null;
  /** what changed against the previous revision (null on revisions older than the column) */
  summary: RevisionChangeSummary | null;
  /** for a save merged with later revisions: the newest one's number */
  mergedWith: number | null;
  createdAt: Date;
};

/** A revision in the history list (no content). */
export type RevisionSummary = Omit<RevisionDetail, "content">;

/** SHA-256 (hex) of the canonical JSON (RFC 8785, engine/canonical-json.ts) of a scenario: what a sign-off binds to. */
export function hashScenarioContent(content: unknown): string {
  let text: string;
  try {
    text = canonicalJson(content);
  } catch (err) {
    // RFC 8785 has no form for a lone UTF-16 surrogate (or a non-finite number): refuse, naming where it is
    if (err instanceof CanonicalJsonError) throw new AppError("unprocessable", 422, `The scenario cannot be saved: ${err.message.replace(/^\$\.?/, "")}`, { [err.path.replace(/^\$\.?/, "") || "content"]: err.message });
    throw err;
  }
  return createHash("sha256").update(text, "utf8").digest("hex");
}

const revisionColumns = {
  id: scenarioRevisions.id,
  number: scenarioRevisions.number,
  contentHash: scenarioRevisions.contentHash,
  warnings: scenarioRevisions.warnings,
  origin: scenarioRevisions.origin,
  restoredFrom: scenarioRevisions.restoredFrom,
  authorName: users.name,
  note: scenarioRevisions.note,
  summary: scenarioRevisions.summary,
  mergedWith: scenarioRevisions.mergedWith,
  createdAt: scenarioRevisions.createdAt,
};

/**
 * Write revision `latestRevisionNumber + 1` of a scenario and make it the latest. Call inside the
 * transaction of the change (the scenario row must exist).
 */
export async function insertRevision(
  tx: Executor,
  {
    scenarioId,
    projectId,
    content,
    authorId,
    origin,
    restoredFrom = null,
    note = null,
    mergedWith = null,
  }: {
    scenarioId: string;
    projectId: string;
    content: Scenario | DraftScenario;
    authorId: string | null;
    origin: RevisionOrigin;
    restoredFrom?: number | null;
    note?: string | null;
    mergedWith?: number | null;
  },
): Promise<RevisionDetail> {
  const [row] = await tx
    .select({ number: scenarios.latestRevisionNumber, name: scenarios.name, latestId: scenarios.latestRevisionId })
    .from(scenarios)
    .where(eq(scenarios.id, scenarioId));
  if (!row) throw new AppError("not_found", 404, "Scenario not found.");
  const number = row.number + 1;
  // the row's name is the scenario's name; the file's `name` follows it
  const stored = { ...(content as Scenario), name: row.name };
  const warnings = scenarioWarnings(stored, await getPartTexts({ projectId, files: partFilesOf(stored), executor: tx }));
  const id = randomUUID();
  const now = new Date();
  const contentHash = hashScenarioContent(stored);
  // what changed against the revision before, in words, stored so that the history needs no diffing
  const [previous] = row.latestId ? await tx.select({ content: scenarioRevisions.content }).from(scenarioRevisions).where(eq(scenarioRevisions.id, row.latestId)) : [];
  const summary = summarizeChanges(previous?.content ?? null, stored, previous ? row.number : null);
  await tx.insert(scenarioRevisions).values({
    id,
    scenarioId,
    number,
    content: stored,
    contentHash,
    warnings,
    origin,
    restoredFrom,
    authorId,
    blockCount: Array.isArray(stored.blocks) ? stored.blocks.length : 0,
    portNames: (Array.isArray(stored.ports) ? stored.ports : []).map((p) => p?.name).filter((n): n is string => typeof n === "string"),
    note,
    summary,
    mergedWith,
    createdAt: now,
  });
  await tx.update(scenarios).set({ latestRevisionId: id, latestRevisionNumber: number, updatedAt: now }).where(eq(scenarios.id, scenarioId));
  let authorName: string | null = null;
  if (authorId) {
    const [author] = await tx.select({ name: users.name }).from(users).where(eq(users.id, authorId));
    authorName = author?.name ?? null;
  }
  return { id, number, content: stored, contentHash, warnings, origin, restoredFrom, authorName, note, summary, mergedWith, createdAt: now };
}

/** The scenario row if it belongs to the project; 404 otherwise. */
export async function requireScenarioRow(executor: Executor, { projectId, scenarioId }: { projectId: string; scenarioId: string }) {
  const [row] = await executor
    .select()
    .from(scenarios)
    .where(and(eq(scenarios.id, scenarioId), eq(scenarios.projectId, projectId)));
  if (!row) throw new AppError("not_found", 404, "Scenario not found.");
  return row;
}

/** One revision of a scenario with its content; 404 if it is not one of this scenario's. */
export async function loadRevision(executor: Executor, { scenarioId, revisionId }: { scenarioId: string; revisionId: string }): Promise<RevisionDetail> {
  const [row] = await executor
    .select({ ...revisionColumns, content: scenarioRevisions.content })
    .from(scenarioRevisions)
    .leftJoin(users, eq(users.id, scenarioRevisions.authorId))
    .where(and(eq(scenarioRevisions.id, revisionId), eq(scenarioRevisions.scenarioId, scenarioId)));
  if (!row) throw new AppError("not_found", 404, "Revision not found.");
  return row;
}

/** A save that started from an older revision than the latest, whose edits conflict with the later ones. */
export class StaleRevisionError extends AppError {
  readonly current: { revisionId: string; number: number; authorName: string | null; createdAt: Date };
  /** the conflicts still to settle (mine = the save's, theirs = the latest revision's) */
  readonly conflicts: MergeConflict[];
  constructor(current: StaleRevisionError["current"], conflicts: MergeConflict[]) {
    super(
      "conflict",
      409,
      `Someone saved this scenario (revision ${current.number}${current.authorName ? ` by ${current.authorName}` : ""}) after you opened it, and ${conflicts.length === 1 ? "one of your edits changes the same thing" : `${conflicts.length} of your edits change the same things`}: choose yours or theirs for each.`,
    );
    this.current = current;
    this.conflicts = conflicts;
  }
}

/**
 * Save the workspace's scenario as a new revision. When `baseRevisionId` is no longer the latest, the
 * edits are merged three-way with what was saved since (lib/domain/scenarios/merge.ts): different blocks,
 * links and rules merge by themselves (the revision records `mergedWith`); a real conflict needs a
 * resolution (mine or theirs) per conflict key, else StaleRevisionError (409) lists them and writes
 * nothing. The saver's working draft goes with the save. Engineers and owners.
 */
export async function saveRevision({
  actor,
  projectId,
  scenarioId,
  baseRevisionId,
  content,
  note = null,
  resolutions = {},
}: {
  actor: SessionUser;
  projectId: string;
  scenarioId: string;
  baseRevisionId: string;
  content: DraftScenario;
  note?: string | null;
  resolutions?: Record<string, MergeChoice>;
}): Promise<RevisionDetail & { merged: SaveMerge | null }> {
  return runInTransaction(async (tx) => {
    await authorize({ userId: actor.id, projectId, action: "scenario.edit", executor: tx });
    const row = await requireScenarioRow(tx, { projectId, scenarioId });
    const base = await loadRevision(tx, { scenarioId, revisionId: baseRevisionId });
    let latest = base;
    let merged: Scenario = content as Scenario;
    let mergedWith: number | null = null;
    let settled = 0;
    if (row.latestRevisionId !== baseRevisionId) {
      latest = await loadRevision(tx, { scenarioId, revisionId: row.latestRevisionId ?? "" });
      const result = mergeScenarios(base.content, content as Scenario, latest.content, resolutions);
      if (!result.ok) throw new StaleRevisionError({ revisionId: latest.id, number: latest.number, authorName: latest.authorName, createdAt: latest.createdAt }, result.conflicts);
      merged = result.scenario;
      mergedWith = latest.number;
      settled = result.conflicts.length;
    }
    // who changed an override or opt-out is the saving user, not what the client wrote
    const stamped = stampRuleChanges(latest.content, merged, actor.email, new Date());
    const revision = await insertRevision(tx, { scenarioId, projectId, content: stamped, authorId: actor.id, origin: "save", note: note?.trim() || null, mergedWith });
    await tx.delete(scenarioDrafts).where(and(eq(scenarioDrafts.scenarioId, scenarioId), eq(scenarioDrafts.userId, actor.id)));
    await recordAudit(tx, { actor, projectId, action: "scenario.save", target: revision.content.name, detail: { scenarioId, revision: revision.number, ...(mergedWith !== null ? { mergedWith } : {}) } });
    // a block moved to another version of its part ("newer version available") is its own audit event
    for (const move of partPinMoves(latest.content, revision.content)) {
      await recordAudit(tx, { actor, projectId, action: "part.move", target: move.file.replace(/^parts\//, ""), detail: { scenarioId, scenario: revision.content.name, revision: revision.number, block: move.blockId, from: move.from, to: move.to } });
    }
    return { ...revision, merged: mergedWith !== null ? { number: latest.number, authorName: latest.authorName, settled } : null };
  });
}

/** A save merged with a later revision: which one, by whom, and how many conflicts the saver settled. */
export type SaveMerge = { number: number; authorName: string | null; settled: number };

/** Every revision of a scenario, newest first, without content. Anyone in the project. */
export async function listRevisions({ userId, projectId, scenarioId }: { userId: string; projectId: string; scenarioId: string }): Promise<RevisionSummary[]> {
  await authorize({ userId, projectId, action: "scenario.read" });
  await requireScenarioRow(db, { projectId, scenarioId });
  return db
    .select(revisionColumns)
    .from(scenarioRevisions)
    .leftJoin(users, eq(users.id, scenarioRevisions.authorId))
    .where(eq(scenarioRevisions.scenarioId, scenarioId))
    .orderBy(desc(scenarioRevisions.number));
}

/** Restore = a new revision with the content of an older one (history is never rewritten). */
export async function restoreRevision({
  actor,
  projectId,
  scenarioId,
  revisionId,
}: {
  actor: SessionUser;
  projectId: string;
  scenarioId: string;
  revisionId: string;
}): Promise<RevisionDetail> {
  return runInTransaction(async (tx) => {
    await authorize({ userId: actor.id, projectId, action: "scenario.edit", executor: tx });
    await requireScenarioRow(tx, { projectId, scenarioId });
    const old = await loadRevision(tx, { scenarioId, revisionId });
    const revision = await insertRevision(tx, { scenarioId, projectId, content: old.content, authorId: actor.id, origin: "restore", restoredFrom: old.number });
    await recordAudit(tx, { actor, projectId, action: "scenario.restore", target: revision.content.name, detail: { scenarioId, from: old.number, revision: revision.number } });
    return revision;
  });
}

export type { ScenarioRevision };
