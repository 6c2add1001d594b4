import "server-only";
import { randomUUID } from "node:crypto";
import { and, eq, isNull } from "drizzle-orm";
import { db, type Executor } from "@/db/client";
import { invitations, memberships, projects, type Invitation, type Role } from "@/db/schema";

export type InvitationWithProject = Invitation & { projectName: string };

export async function insertInvitation({
  projectId,
  email,
  role,
  tokenHash,
  invitedBy,
  expiresAt,
  executor,
}: {
  projectId: string;
  email: string;
  role: Role;
  tokenHash: string;
  invitedBy: string;
  expiresAt: Date;
  executor: Executor;
}): Promise<Invitation> {
  const id = randomUUID();
  // A new invitation to the same address replaces any open one.
  await executor.delete(invitations).where(and(eq(invitations.projectId, projectId), eq(invitations.email, email), isNull(invitations.acceptedAt)));
  await executor.insert(invitations).values({ id, projectId, email, role, tokenHash, invitedBy, expiresAt });
  const [row] = await executor.select().from(invitations).where(eq(invitations.id, id));
  return row;
}

export async function getInvitationByTokenHash({ tokenHash, executor = db }: { tokenHash: string; executor?: Executor }): Promise<InvitationWithProject | null> {
  const [row] = await executor
    .select({ invitation: invitations, projectName: projects.name })
    .from(invitations)
    .innerJoin(projects, eq(projects.id, invitations.projectId))
    .where(eq(invitations.tokenHash, tokenHash));
  return row ? { ...row.invitation, projectName: row.projectName } : null;
}

/** Mark accepted (once) and add the membership unless the user already has one. Returns false if already accepted. */
export async function markInvitationAccepted({ invitation, userId, now, executor }: { invitation: Invitation; userId: string; now: Date; executor: Executor }): Promise<{ accepted: boolean; role: Role }> {
  const updated = await executor
    .update(invitations)
    .set({ acceptedAt: now, acceptedBy: userId })
    .where(and(eq(invitations.id, invitation.id), isNull(invitations.acceptedAt)))
    .returning({ id: invitations.id });
  if (updated.length === 0) return { accepted: false, role: invitation.role };
  const [existing] = await executor
    .select({ role: memberships.role })
    .from(memberships)
    .where(and(eq(memberships.projectId, invitation.projectId), eq(memberships.userId, userId)));
  if (existing) return { accepted: true, role: existing.role };
  await executor.insert(memberships).values({ projectId: invitation.projectId, userId, role: invitation.role });
  return { accepted: true, role: invitation.role };
}
