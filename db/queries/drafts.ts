import "server-only";
import { and, eq } from "drizzle-orm";
import { db, runInTransaction } from "@/db/client";
import { scenarioDrafts, scenarioRevisions } from "@/db/schema";
import type { Scenario } from "@/engine/types";
import { AppError } from "@/lib/base/errors";
import type { DraftScenario } from "@/lib/base/validation/scenarios";
import { authorize } from "@/lib/server/permissions";
import { hashScenarioContent, requireScenarioRow } from "./revisions";

/** A person's working draft as the API returns it. */
export type ScenarioDraft = { baseRevisionId: string; baseNumber: number; content: Scenario; updatedAt: Date };

/** The draft with its base revision's content: what the workspace compares the draft against. */
export type ScenarioDraftWithBase = ScenarioDraft & { baseContent: Scenario };

/**
 * The caller's own working draft of a scenario, or null. Drafts are per person: the query is keyed by the
 * caller's id, so nobody reads another person's draft. Only those who may edit have drafts (engineers,
 * owners); a reviewer is refused.
 */
export async function getDraft({ userId, projectId, scenarioId }: { userId: string; projectId: string; scenarioId: string }): Promise<ScenarioDraftWithBase | null> {
  await authorize({ userId, projectId, action: "scenario.edit" });
  await requireScenarioRow(db, { projectId, scenarioId });
  const [row] = await db
    .select({ baseRevisionId: scenarioDrafts.baseRevisionId, baseNumber: scenarioRevisions.number, content: scenarioDrafts.content, updatedAt: scenarioDrafts.updatedAt, baseContent: scenarioRevisions.content })
    .from(scenarioDrafts)
    .innerJoin(scenarioRevisions, eq(scenarioRevisions.id, scenarioDrafts.baseRevisionId))
    .where(and(eq(scenarioDrafts.scenarioId, scenarioId), eq(scenarioDrafts.userId, userId)));
  return row ?? null;
}

/**
 * Write (or replace) the caller's working draft: what autosave sends after each pause in editing. Never a
 * revision and never audited (it is private and frequent); the base must be one of this scenario's
 * revisions. Engineers and owners.
 */
export async function putDraft({
  userId,
  projectId,
  scenarioId,
  baseRevisionId,
  content,
}: {
  userId: string;
  projectId: string;
  scenarioId: string;
  baseRevisionId: string;
  content: DraftScenario;
}): Promise<ScenarioDraft> {
  return runInTransaction(async (tx) => {
    await authorize({ userId, projectId, action: "scenario.edit", executor: tx });
    await requireScenarioRow(tx, { projectId, scenarioId });
    const [base] = await tx
      .select({ number: scenarioRevisions.number })
      .from(scenarioRevisions)
      .where(and(eq(scenarioRevisions.id, baseRevisionId), eq(scenarioRevisions.scenarioId, scenarioId)));
    if (!base) throw new AppError("unprocessable", 422, "The draft's base revision is not a revision of this scenario.", { baseRevisionId: "Not a revision of this scenario." });
    const updatedAt = new Date();
    const values = { scenarioId, userId, baseRevisionId, content: content as Scenario, updatedAt };
    await tx
      .insert(scenarioDrafts)
      .values(values)
      .onConflictDoUpdate({ target: [scenarioDrafts.scenarioId, scenarioDrafts.userId], set: { baseRevisionId, content: content as Scenario, updatedAt } });
    return { baseRevisionId, baseNumber: base.number, content: content as Scenario, updatedAt };
  });
}

/** Throw the caller's working draft away (an explicit action in the workspace). Engineers and owners. */
export async function deleteDraft({ userId, projectId, scenarioId }: { userId: string; projectId: string; scenarioId: string }): Promise<void> {
  await authorize({ userId, projectId, action: "scenario.edit" });
  await requireScenarioRow(db, { projectId, scenarioId });
  await db.delete(scenarioDrafts).where(and(eq(scenarioDrafts.scenarioId, scenarioId), eq(scenarioDrafts.userId, userId)));
}

/**
 * Whether the person's working draft of a scenario holds changes not in `content` (a revision's): a
 * sign-off is requested only with no such draft. Internal (the caller has authorized the action).
 */
export async function hasDraftBeyond({ userId, scenarioId, content }: { userId: string; scenarioId: string; content: Scenario }): Promise<boolean> {
  const [row] = await db
    .select({ content: scenarioDrafts.content })
    .from(scenarioDrafts)
    .where(and(eq(scenarioDrafts.scenarioId, scenarioId), eq(scenarioDrafts.userId, userId)));
  if (!row) return false;
  // the stored name follows the scenario row; compare what the person edited
  return hashScenarioContent({ ...row.content, name: content.name }) !== hashScenarioContent(content);
}
