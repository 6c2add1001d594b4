import "server-only";
import { randomUUID } from "node:crypto";
import { and, asc, eq, gt, sql } from "drizzle-orm";
import { db, runInTransaction } from "@/db/client";
import { parts, scenarioRevisions, scenarios, users, type Role } from "@/db/schema";
import { blocksBehindByScenario } from "./parts";
import { scenarioFromTemplate } from "@/lib/domain/scenarios/templates";
import { recordAudit } from "@/lib/server/audit";
import type { SessionUser } from "@/lib/server/auth/session";
import type { Scenario } from "@/engine/types";
import { allow, authorize, resolveAccess, type ProjectAccess } from "@/lib/server/permissions";
import type { DraftScenario, ScenarioTemplate } from "@/lib/base/validation/scenarios";
import { insertRevision, loadRevision, requireScenarioRow, type RevisionDetail } from "./revisions";

/** A scenario in the project's list. */
export type ScenarioSummary = {
  id: string;
  name: string;
  latestRevisionId: string | null;
  revisionNumber: number;
  blockCount: number;
  portNames: string[];
  warningCount: number;
  /** blocks of the latest revision pinning an older part version than the library's latest */
  blocksBehind: number;
  updatedAt: Date;
  updatedByName: string | null;
  createdAt: Date;
};

export type ScenarioInfo = {
  id: string;
  projectId: string;
  name: string;
  latestRevisionId: string;
  latestRevisionNumber: number;
  createdAt: Date;
  updatedAt: Date;
};

function info(row: typeof scenarios.$inferSelect): ScenarioInfo {
  return {
    id: row.id,
    projectId: row.projectId,
    name: row.name,
    latestRevisionId: row.latestRevisionId ?? "",
    latestRevisionNumber: row.latestRevisionNumber,
    createdAt: row.createdAt,
    updatedAt: row.updatedAt,
  };
}

/** The project's scenarios by name, with a few facts from each latest revision. Anyone in the project. */
export async function listScenarios({ userId, projectId }: { userId: string; projectId: string }): Promise<ScenarioSummary[]> {
  await authorize({ userId, projectId, action: "scenario.read" });
  // One plain statement with positional columns: the list is the busiest read of the app, and drizzle's
  // select builder and row mapping doubled its cost (0.5 → 1.1 ms for 60 scenarios: tests/bench/api.ts).
  // Block counts and port names are stored when a revision is saved; they are counted in SQLite (never
  // read into the server) only for rows older than those columns, so no content is parsed here.
  const rows = await db.values<[string, string, string | null, number, number, number, number, string | null, number, string | null]>(sql`
    select ${scenarios.id}, ${scenarios.name}, ${scenarios.latestRevisionId}, ${scenarios.latestRevisionNumber},
      ${scenarios.updatedAt}, ${scenarios.createdAt},
      coalesce(${scenarioRevisions.blockCount}, json_array_length(${scenarioRevisions.content}, '$.blocks'), 0),
      coalesce(${scenarioRevisions.portNames}, (select json_group_array(json_extract(p.value, '$.name')) from json_each(${scenarioRevisions.content}, '$.ports') as p)),
      coalesce(json_array_length(${scenarioRevisions.warnings}), 0),
      ${users.name}
    from ${scenarios}
    left join ${scenarioRevisions} on ${scenarioRevisions.id} = ${scenarios.latestRevisionId}
    left join ${users} on ${users.id} = ${scenarioRevisions.authorId}
    where ${scenarios.projectId} = ${projectId}
    order by ${scenarios.name} asc`);
  // only a project with a part of version 2 or later can have blocks behind: others pay no JSON scan
  const behind = (await hasPartVersions(projectId)) ? await blocksBehindByScenario({ projectId }) : new Map<string, number>();
  // libSQL rows are array-like (indexable, not iterable)
  return rows.map((row) => ({
    id: row[0],
    name: row[1],
    latestRevisionId: row[2],
    revisionNumber: Number(row[3]),
    updatedAt: new Date(Number(row[4])),
    createdAt: new Date(Number(row[5])),
    blockCount: Number(row[6]),
    portNames: row[7] ? (JSON.parse(row[7]) as (string | null)[]).filter((n): n is string => typeof n === "string") : [],
    warningCount: Number(row[8]),
    updatedByName: row[9],
    blocksBehind: behind.get(row[0]) ?? 0,
  }));
}

async function hasPartVersions(projectId: string): Promise<boolean> {
  const [row] = await db.select({ id: parts.id }).from(parts).where(and(eq(parts.projectId, projectId), gt(parts.partVersion, 1))).limit(1);
  return row !== undefined;
}

/** A scenario with its latest revision (or the revision asked for) and the viewer's role. */
export async function getScenario({
  userId,
  projectId,
  scenarioId,
  revisionId,
}: {
  userId: string;
  projectId: string;
  scenarioId: string;
  revisionId?: string;
}): Promise<{ scenario: ScenarioInfo; revision: RevisionDetail; role: Role }> {
  return loadScenario(await resolveAccess({ userId, projectId }), { scenarioId, revisionId });
}

/** As getScenario, with the caller's access already resolved (scenario.read is checked against it). */
export async function loadScenario(
  access: ProjectAccess,
  { scenarioId, revisionId }: { scenarioId: string; revisionId?: string },
): Promise<{ scenario: ScenarioInfo; revision: RevisionDetail; role: Role }> {
  const role = allow(access, "scenario.read");
  const row = await requireScenarioRow(db, { projectId: access.projectId, scenarioId });
  const revision = await loadRevision(db, { scenarioId, revisionId: revisionId ?? row.latestRevisionId ?? "" });
  return { scenario: info(row), revision: { ...revision, content: { ...revision.content, name: row.name } }, role };
}

/** Each scenario's latest content, by name (anyone in the project): what the Rules page reads overrides from. */
export async function latestScenarioContents({
  userId,
  projectId,
}: {
  userId: string;
  projectId: string;
}): Promise<{ id: string; name: string; revisionId: string; revisionNumber: number; content: Scenario }[]> {
  await authorize({ userId, projectId, action: "scenario.read" });
  const rows = await db
    .select({ id: scenarios.id, name: scenarios.name, revisionId: scenarioRevisions.id, revisionNumber: scenarios.latestRevisionNumber, content: scenarioRevisions.content })
    .from(scenarios)
    .innerJoin(scenarioRevisions, eq(scenarioRevisions.id, scenarios.latestRevisionId))
    .where(eq(scenarios.projectId, projectId))
    .orderBy(asc(scenarios.name));
  return rows.map((r) => ({ ...r, content: r.content as unknown as Scenario }));
}

/** Create a scenario from a template or from given content (revision 1). Engineers and owners. */
export async function createScenario({
  actor,
  projectId,
  name,
  template = "blank",
  content,
}: {
  actor: SessionUser;
  projectId: string;
  name: string;
  template?: ScenarioTemplate;
  content?: DraftScenario;
}): Promise<{ scenario: ScenarioInfo; revision: RevisionDetail }> {
  return runInTransaction(async (tx) => {
    await authorize({ userId: actor.id, projectId, action: "scenario.create", executor: tx });
    const id = randomUUID();
    await tx.insert(scenarios).values({ id, projectId, name, createdBy: actor.id });
    const revision = await insertRevision(tx, {
      scenarioId: id,
      projectId,
      content: content ?? scenarioFromTemplate(template, name),
      authorId: actor.id,
      origin: "create",
    });
    await recordAudit(tx, { actor, projectId, action: "scenario.create", target: name, detail: { scenarioId: id, template: content ? "content" : template } });
    const [row] = await tx.select().from(scenarios).where(eq(scenarios.id, id));
    return { scenario: info(row), revision };
  });
}

/** Rename (no new revision: the name belongs to the scenario, and the file's `name` follows it). */
export async function renameScenario({ actor, projectId, scenarioId, name }: { actor: SessionUser; projectId: string; scenarioId: string; name: string }): Promise<ScenarioInfo> {
  return runInTransaction(async (tx) => {
    await authorize({ userId: actor.id, projectId, action: "scenario.edit", executor: tx });
    const before = await requireScenarioRow(tx, { projectId, scenarioId });
    await tx.update(scenarios).set({ name, updatedAt: new Date() }).where(eq(scenarios.id, scenarioId));
    await recordAudit(tx, { actor, projectId, action: "scenario.rename", target: name, detail: { scenarioId, from: before.name, to: name } });
    return info(await requireScenarioRow(tx, { projectId, scenarioId }));
  });
}

/** A new scenario whose revision 1 is the latest content of another. */
export async function duplicateScenario({
  actor,
  projectId,
  scenarioId,
  name,
}: {
  actor: SessionUser;
  projectId: string;
  scenarioId: string;
  name?: string;
}): Promise<{ scenario: ScenarioInfo; revision: RevisionDetail }> {
  return runInTransaction(async (tx) => {
    await authorize({ userId: actor.id, projectId, action: "scenario.create", executor: tx });
    const source = await requireScenarioRow(tx, { projectId, scenarioId });
    const latest = await loadRevision(tx, { scenarioId, revisionId: source.latestRevisionId ?? "" });
    const id = randomUUID();
    const newName = name ?? `${source.name} (copy)`;
    await tx.insert(scenarios).values({ id, projectId, name: newName, createdBy: actor.id });
    const revision = await insertRevision(tx, { scenarioId: id, projectId, content: latest.content, authorId: actor.id, origin: "duplicate" });
    await recordAudit(tx, { actor, projectId, action: "scenario.duplicate", target: newName, detail: { scenarioId: id, from: scenarioId, fromRevision: latest.number } });
    const [row] = await tx.select().from(scenarios).where(eq(scenarios.id, id));
    return { scenario: info(row), revision };
  });
}

/** Delete a scenario with its revisions (engineers, owners). */
export async function deleteScenario({ actor, projectId, scenarioId }: { actor: SessionUser; projectId: string; scenarioId: string }): Promise<void> {
  await runInTransaction(async (tx) => {
    await authorize({ userId: actor.id, projectId, action: "scenario.delete", executor: tx });
    const row = await requireScenarioRow(tx, { projectId, scenarioId });
    await tx.delete(scenarios).where(eq(scenarios.id, scenarioId));
    await recordAudit(tx, { actor, projectId, action: "scenario.delete", target: row.name, detail: { scenarioId, revisions: row.latestRevisionNumber } });
  });
}
