import "server-only";
import { and, eq } from "drizzle-orm";
import { runInTransaction } from "@/db/client";
import { getInvitationByTokenHash, insertInvitation, markInvitationAccepted, type InvitationWithProject } from "@/db/queries/invitations";
import { getUserByEmail } from "@/db/queries/users";
import { memberships, projects, users, type Role } from "@/db/schema";
import { recordAudit } from "@/lib/server/audit";
import { signUp, type SignedIn } from "@/lib/server/auth/accounts";
import { createSessionForUser, type SessionUser } from "@/lib/server/auth/session";
import { generateToken, hashToken } from "@/lib/server/auth/tokens";
import { AppError } from "@/lib/base/errors";
import { sendMail } from "@/lib/server/mail/send";
import { invitationMail } from "@/lib/server/mail/templates";
import { mailKeys, takeMailAllowance } from "@/lib/server/mail/rate-limit";
import { authorize } from "@/lib/server/permissions";

export const INVITATION_LIFETIME_MS = 7 * 24 * 60 * 60 * 1000;

export type InviteResult = { invitationId: string; email: string; role: Role; expiresAt: Date; emailSent: boolean };

/** Owners invite someone by e-mail with a role; the e-mail carries a single-use link /invite/<token>. */
export async function inviteMember({
  actor,
  projectId,
  email,
  role,
  now = new Date(),
}: {
  actor: SessionUser;
  projectId: string;
  email: string;
  role: Role;
  now?: Date;
}): Promise<InviteResult> {
  const token = generateToken();
  const { invitation, projectName } = await runInTransaction(async (tx) => {
    await authorize({ userId: actor.id, projectId, action: "members.manage", executor: tx });
    const [already] = await tx
      .select({ userId: users.id })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(and(eq(memberships.projectId, projectId), eq(users.email, email)));
    if (already) throw new AppError("conflict", 409, "That person is already a member of this project.", { email: "Already a member." });
    const [project] = await tx.select({ name: projects.name }).from(projects).where(eq(projects.id, projectId));
    const created = await insertInvitation({
      projectId,
      email,
      role,
      tokenHash: hashToken(token),
      invitedBy: actor.id,
      expiresAt: new Date(now.getTime() + INVITATION_LIFETIME_MS),
      executor: tx,
    });
    await recordAudit(tx, { actor, projectId, action: "invitation.create", target: email, detail: { role } });
    return { invitation: created, projectName: project?.name ?? "a project" };
  });
  let emailSent = true;
  try {
    // Over the hourly limit (per invited address, per inviting account) the invitation stands but no mail goes out.
    if (await takeMailAllowance(mailKeys.invitation(email, actor.id), now.getTime())) {
      await sendMail(invitationMail({ to: email, token, projectName, role, inviterName: actor.name }));
    } else {
      emailSent = false;
    }
  } catch (error) {
    emailSent = false;
    console.error("[mail] invitation e-mail failed:", error instanceof Error ? error.message : String(error));
  }
  return { invitationId: invitation.id, email, role, expiresAt: invitation.expiresAt, emailSent };
}

const LINK_INVALID = "This invitation has expired or was already used. Ask the project owner for a new one.";

/** An invitation that can still be accepted, or null. */
export async function findUsableInvitation({ token, now = new Date() }: { token: string; now?: Date }): Promise<InvitationWithProject | null> {
  const invitation = await getInvitationByTokenHash({ tokenHash: hashToken(token) });
  if (!invitation || invitation.acceptedAt || invitation.expiresAt.getTime() <= now.getTime()) return null;
  return invitation;
}

export type AcceptResult = { projectId: string; role: Role; user: SessionUser; signedIn: SignedIn | null };

/**
 * Accept an invitation. A signed-in person links their own account, only if its e-mail is the invited one
 * (case-insensitive; otherwise 403). Otherwise a person whose e-mail
 * has no account signs up with a name and password (allowed even when sign-up is invitation-only);
 * an e-mail that already has an account must sign in first (401).
 */
export async function acceptInvitation({
  token,
  currentUser,
  name,
  password,
  now = new Date(),
}: {
  token: string;
  currentUser: SessionUser | null;
  name?: string;
  password?: string;
  now?: Date;
}): Promise<AcceptResult> {
  const invitation = await findUsableInvitation({ token, now });
  if (!invitation) throw new AppError("unprocessable", 422, LINK_INVALID, { token: LINK_INVALID });

  // The link is bound to the invited address: a forwarded or leaked link does not let another account in.
  if (currentUser && currentUser.email.trim().toLowerCase() !== invitation.email.trim().toLowerCase()) {
    throw new AppError(
      "forbidden",
      403,
      `This invitation is for ${invitation.email}. You are signed in as ${currentUser.email}: sign out, then sign in as ${invitation.email} (or create that account) to accept it.`,
    );
  }

  let user = currentUser;
  let signedIn: SignedIn | null = null;
  if (!user) {
    if (await getUserByEmail({ email: invitation.email })) {
      throw new AppError("unauthenticated", 401, `Sign in as ${invitation.email} to accept this invitation.`);
    }
    const fields: Record<string, string> = {};
    if (!name) fields.name = "Enter your name.";
    if (!password) fields.password = "Choose a password of at least 10 characters.";
    if (Object.keys(fields).length > 0) throw new AppError("validation_failed", 400, "Choose a name and a password to create your account.", fields);
    signedIn = await signUp({ email: invitation.email, name: name as string, password: password as string, viaInvitation: true });
    user = signedIn.user;
  }

  const accepter = user;
  const role = await runInTransaction(async (tx) => {
    const result = await markInvitationAccepted({ invitation, userId: accepter.id, now, executor: tx });
    if (!result.accepted) throw new AppError("unprocessable", 422, LINK_INVALID, { token: LINK_INVALID });
    await recordAudit(tx, { actor: accepter, projectId: invitation.projectId, action: "invitation.accept", target: accepter.email, detail: { role: result.role } });
    return result.role;
  });
  if (!signedIn && !currentUser) signedIn = { user: accepter, ...(await createSessionForUser(accepter.id)) };
  return { projectId: invitation.projectId, role, user: accepter, signedIn };
}
