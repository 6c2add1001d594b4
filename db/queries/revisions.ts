import "server-only";
import { createHash, randomUUID } from "node:crypto";
import { and, desc, eq } from "drizzle-orm";
import { db, runInTransaction, type Executor } from "@/db/client";
import { scenarioRevisions, scenarios, users, type ScenarioRevision } from "@/db/schema";
import { CanonicalJsonError, canonicalJson } from "@/engine/canonical-json";
import type { Scenario } from "@/engine/types";
import { scenarioWarnings } from "@/lib/domain/scenarios/for-engine";
import { recordAudit } from "@/lib/server/audit";
import type { SessionUser } from "@/lib/server/auth/session";
import { AppError } from "@/lib/base/errors";
import { authorize } from "@/lib/server/permissions";
import type { DraftScenario } from "@/lib/base/validation/scenarios";
import { stampRuleChanges } from "@/lib/domain/rules/stamp";
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
  }: { scenarioId: string; projectId: string; content: Scenario | DraftScenario; authorId: string | null; origin: RevisionOrigin; restoredFrom?: number | null },
): Promise<RevisionDetail> {
  const [row] = await tx
    .select({ number: scenarios.latestRevisionNumber, name: scenarios.name })
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
    createdAt: now,
  });
  await tx.update(scenarios).set({ latestRevisionId: id, latestRevisionNumber: number, updatedAt: now }).where(eq(scenarios.id, scenarioId));
  let authorName: string | null = null;
  if (authorId) {
    const [author] = await tx.select({ name: users.name }).from(users).where(eq(users.id, authorId));
    authorName = author?.name ?? null;
  }
  return { id, number, content: stored, contentHash, warnings, origin, restoredFrom, authorName, createdAt: now };
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

/** A save that started from an older revision than the latest. */
export class StaleRevisionError extends AppError {
  readonly current: { revisionId: string; number: number; authorName: string | null; createdAt: Date };
  constructor(current: StaleRevisionError["current"]) {
    super(
      "conflict",
      409,
      `Someone saved this scenario (revision ${current.number}${current.authorName ? ` by ${current.authorName}` : ""}) after you opened it. Reload the latest revision or save your edits as a new scenario.`,
    );
    this.current = current;
  }
}

/**
 * Save the workspace's scenario as a new revision, if `baseRevisionId` is still the latest one;
 * otherwise StaleRevisionError (409) naming the current revision. Engineers and owners.
 */
export async function saveRevision({
  actor,
  projectId,
  scenarioId,
  baseRevisionId,
  content,
}: {
  actor: SessionUser;
  projectId: string;
  scenarioId: string;
  baseRevisionId: string;
  content: DraftScenario;
}): Promise<RevisionDetail> {
  return runInTransaction(async (tx) => {
    await authorize({ userId: actor.id, projectId, action: "scenario.edit", executor: tx });
    const row = await requireScenarioRow(tx, { projectId, scenarioId });
    if (row.latestRevisionId !== baseRevisionId) {
      const current = await loadRevision(tx, { scenarioId, revisionId: row.latestRevisionId ?? "" });
      throw new StaleRevisionError({ revisionId: current.id, number: current.number, authorName: current.authorName, createdAt: current.createdAt });
    }
    // who changed an override or opt-out is the saving user, not what the client wrote
    const base = await loadRevision(tx, { scenarioId, revisionId: baseRevisionId });
    const stamped = stampRuleChanges(base.content, content, actor.email, new Date());
    const revision = await insertRevision(tx, { scenarioId, projectId, content: stamped, authorId: actor.id, origin: "save" });
    await recordAudit(tx, { actor, projectId, action: "scenario.save", target: revision.content.name, detail: { scenarioId, revision: revision.number } });
    // a block moved to another version of its part ("newer version available") is its own audit event
    for (const move of partPinMoves(base.content, revision.content)) {
      await recordAudit(tx, { actor, projectId, action: "part.move", target: move.file.replace(/^parts\//, ""), detail: { scenarioId, scenario: revision.content.name, revision: revision.number, block: move.blockId, from: move.from, to: move.to } });
    }
    return revision;
  });
}

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
