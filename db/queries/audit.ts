import "server-only";
import { and, asc, desc, eq, gte, isNull, lt, sql, type SQL } from "drizzle-orm";
import { db } from "@/db/client";
import { auditEvents, users } from "@/db/schema";
import { authorize } from "@/lib/server/permissions";
import type { SessionUser } from "@/lib/server/auth/session";

export type AuditEntry = {
  id: string;
  action: string;
  target: string | null;
  detail: Record<string, unknown> | null;
  actorId: string | null;
  actorEmail: string | null;
  actorName: string | null;
  createdAt: Date;
};

/** Filters of an audit log: who, what kind (action prefix), which days (inclusive, UTC), which page. */
export type AuditFilter = { actorId?: string; kind?: string; from?: Date; to?: Date; limit?: number; offset?: number };

function filterConditions(filter: AuditFilter): SQL[] {
  const conditions: SQL[] = [];
  if (filter.actorId) conditions.push(eq(auditEvents.actorId, filter.actorId));
  if (filter.kind) {
    // an exact prefix (LIKE would read the _ of api_token as a wildcard)
    const prefix = `${filter.kind}.`;
    conditions.push(sql`substr(${auditEvents.action}, 1, ${prefix.length}) = ${prefix}`);
  }
  if (filter.from) conditions.push(gte(auditEvents.createdAt, filter.from));
  if (filter.to) conditions.push(lt(auditEvents.createdAt, filter.to));
  return conditions;
}

function selectEntries() {
  return db
    .select({
      id: auditEvents.id,
      action: auditEvents.action,
      target: auditEvents.target,
      detail: auditEvents.detail,
      actorId: auditEvents.actorId,
      actorEmail: auditEvents.actorEmail,
      actorName: users.name,
      createdAt: auditEvents.createdAt,
    })
    .from(auditEvents)
    .leftJoin(users, eq(users.id, auditEvents.actorId));
}

/** A project's audit log, newest first (owners), filtered and paged. */
export async function listAuditEvents({ actor, projectId, limit = 200, offset = 0, ...filter }: { actor: SessionUser; projectId: string } & AuditFilter): Promise<AuditEntry[]> {
  await authorize({ userId: actor.id, projectId, action: "audit.read" });
  return selectEntries()
    .where(and(eq(auditEvents.projectId, projectId), ...filterConditions(filter)))
    .orderBy(desc(auditEvents.createdAt), desc(sql`${auditEvents}.rowid`))
    .limit(limit)
    .offset(offset);
}

/**
 * The admin audit log: events outside any project (accounts, site admin, settings), newest first. The
 * caller checks that the viewer is a site admin.
 */
export async function listSiteAuditEvents({ limit = 200, offset = 0, ...filter }: AuditFilter = {}): Promise<AuditEntry[]> {
  return selectEntries()
    .where(and(isNull(auditEvents.projectId), ...filterConditions(filter)))
    .orderBy(desc(auditEvents.createdAt), desc(sql`${auditEvents}.rowid`))
    .limit(limit)
    .offset(offset);
}

/** The people who appear in a log (for its "person" filter). */
export async function listAuditActors({ projectId }: { projectId: string | null }): Promise<{ id: string; name: string }[]> {
  const rows = await db
    .selectDistinct({ id: users.id, name: users.name })
    .from(auditEvents)
    .innerJoin(users, eq(users.id, auditEvents.actorId))
    .where(projectId === null ? isNull(auditEvents.projectId) : eq(auditEvents.projectId, projectId))
    .orderBy(asc(users.name));
  return rows;
}
