import "server-only";
import { desc, eq, isNull, sql } from "drizzle-orm";
import { db } from "@/db/client";
import { auditEvents, users } from "@/db/schema";
import { authorize } from "@/lib/server/permissions";
import type { SessionUser } from "@/lib/server/auth/session";

export type AuditEntry = {
  id: string;
  action: string;
  target: string | null;
  detail: Record<string, unknown> | null;
  actorEmail: string | null;
  actorName: string | null;
  createdAt: Date;
};

/** A project's audit log, newest first (owners). */
export async function listAuditEvents({ actor, projectId, limit = 200 }: { actor: SessionUser; projectId: string; limit?: number }): Promise<AuditEntry[]> {
  await authorize({ userId: actor.id, projectId, action: "audit.read" });
  return db
    .select({
      id: auditEvents.id,
      action: auditEvents.action,
      target: auditEvents.target,
      detail: auditEvents.detail,
      actorEmail: auditEvents.actorEmail,
      actorName: users.name,
      createdAt: auditEvents.createdAt,
    })
    .from(auditEvents)
    .leftJoin(users, eq(users.id, auditEvents.actorId))
    .where(eq(auditEvents.projectId, projectId))
    .orderBy(desc(auditEvents.createdAt), desc(sql`${auditEvents}.rowid`))
    .limit(limit);
}

/**
 * The admin audit log: events outside any project (accounts, site admin, settings), newest first. The
 * caller checks that the viewer is a site admin.
 */
export async function listSiteAuditEvents({ limit = 200, offset = 0 }: { limit?: number; offset?: number } = {}): Promise<AuditEntry[]> {
  return db
    .select({
      id: auditEvents.id,
      action: auditEvents.action,
      target: auditEvents.target,
      detail: auditEvents.detail,
      actorEmail: auditEvents.actorEmail,
      actorName: users.name,
      createdAt: auditEvents.createdAt,
    })
    .from(auditEvents)
    .leftJoin(users, eq(users.id, auditEvents.actorId))
    .where(isNull(auditEvents.projectId))
    .orderBy(desc(auditEvents.createdAt), desc(sql`${auditEvents}.rowid`))
    .limit(limit)
    .offset(offset);
}
