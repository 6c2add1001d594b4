import "server-only";
import { and, asc, count, eq, gt, isNull } from "drizzle-orm";
import { db, runInTransaction, type Executor } from "@/db/client";
import { invitations, memberships, users, type Role } from "@/db/schema";
import { recordAudit } from "@/lib/server/audit";
import { AppError } from "@/lib/base/errors";
import { authorize } from "@/lib/server/permissions";
import type { SessionUser } from "@/lib/server/auth/session";

export type Member = { userId: string; email: string; name: string; role: Role; joinedAt: Date };
export type PendingInvitation = { id: string; email: string; role: Role; expiresAt: Date; createdAt: Date };

/** Members of a project (any member may list them). */
export async function listMembers({ actor, projectId }: { actor: SessionUser; projectId: string }): Promise<Member[]> {
  await authorize({ userId: actor.id, projectId, action: "members.read" });
  return db
    .select({ userId: users.id, email: users.email, name: users.name, role: memberships.role, joinedAt: memberships.createdAt })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.projectId, projectId))
    .orderBy(asc(users.name));
}

/** Invitations not yet accepted and not expired (owners). */
export async function listPendingInvitations({ actor, projectId, now = new Date() }: { actor: SessionUser; projectId: string; now?: Date }): Promise<PendingInvitation[]> {
  await authorize({ userId: actor.id, projectId, action: "members.manage" });
  return db
    .select({ id: invitations.id, email: invitations.email, role: invitations.role, expiresAt: invitations.expiresAt, createdAt: invitations.createdAt })
    .from(invitations)
    .where(and(eq(invitations.projectId, projectId), isNull(invitations.acceptedAt), gt(invitations.expiresAt, now)))
    .orderBy(asc(invitations.email));
}

async function countOwners(executor: Executor, projectId: string): Promise<number> {
  const [row] = await executor
    .select({ n: count() })
    .from(memberships)
    .where(and(eq(memberships.projectId, projectId), eq(memberships.role, "owner")));
  return row?.n ?? 0;
}

async function getMembership(executor: Executor, projectId: string, userId: string) {
  const [row] = await executor
    .select({ role: memberships.role, email: users.email })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.projectId, projectId), eq(memberships.userId, userId)));
  return row ?? null;
}

/** Change a member's role (owners). Never leaves a project without an owner (409). */
export async function changeMemberRole({ actor, projectId, userId, role }: { actor: SessionUser; projectId: string; userId: string; role: Role }): Promise<Member> {
  return runInTransaction(async (tx) => {
    await authorize({ userId: actor.id, projectId, action: "members.manage", executor: tx });
    const current = await getMembership(tx, projectId, userId);
    if (!current) throw new AppError("not_found", 404, "That person is not a member of this project.");
    if (current.role === "owner" && role !== "owner" && (await countOwners(tx, projectId)) <= 1) {
      throw new AppError("conflict", 409, "A project needs at least one owner. Make someone else owner first.");
    }
    if (current.role !== role) {
      await tx.update(memberships).set({ role }).where(and(eq(memberships.projectId, projectId), eq(memberships.userId, userId)));
      await recordAudit(tx, { actor, projectId, action: "member.role_change", target: current.email, detail: { from: current.role, to: role } });
    }
    const [member] = await tx
      .select({ userId: users.id, email: users.email, name: users.name, role: memberships.role, joinedAt: memberships.createdAt })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(and(eq(memberships.projectId, projectId), eq(memberships.userId, userId)));
    return member;
  });
}

/** Remove a member (owners; anyone may remove themselves). Never the last owner (409). */
export async function removeMember({ actor, projectId, userId }: { actor: SessionUser; projectId: string; userId: string }): Promise<void> {
  await runInTransaction(async (tx) => {
    if (userId === actor.id) {
      await authorize({ userId: actor.id, projectId, action: "project.read", executor: tx });
    } else {
      await authorize({ userId: actor.id, projectId, action: "members.manage", executor: tx });
    }
    const current = await getMembership(tx, projectId, userId);
    if (!current) throw new AppError("not_found", 404, "That person is not a member of this project.");
    if (current.role === "owner" && (await countOwners(tx, projectId)) <= 1) {
      throw new AppError("conflict", 409, "A project needs at least one owner. Make someone else owner first.");
    }
    await tx.delete(memberships).where(and(eq(memberships.projectId, projectId), eq(memberships.userId, userId)));
    await recordAudit(tx, { actor, projectId, action: userId === actor.id ? "member.leave" : "member.remove", target: current.email, detail: { role: current.role } });
  });
}

/** Revoke a pending invitation (owners). */
export async function revokeInvitation({ actor, projectId, invitationId }: { actor: SessionUser; projectId: string; invitationId: string }): Promise<void> {
  await runInTransaction(async (tx) => {
    await authorize({ userId: actor.id, projectId, action: "members.manage", executor: tx });
    const [invitation] = await tx
      .select({ email: invitations.email })
      .from(invitations)
      .where(and(eq(invitations.id, invitationId), eq(invitations.projectId, projectId), isNull(invitations.acceptedAt)));
    if (!invitation) throw new AppError("not_found", 404, "Invitation not found.");
    await tx.delete(invitations).where(eq(invitations.id, invitationId));
    await recordAudit(tx, { actor, projectId, action: "invitation.revoke", target: invitation.email });
  });
}
