import "server-only";
import { createHash, randomUUID } from "node:crypto";
import { and, asc, eq, ne } from "drizzle-orm";
import { db, runInTransaction } from "@/db/client";
import { emailChanges, sessions, users } from "@/db/schema";
import { normaliseEmail } from "@/db/queries/users";
import { sendMail } from "@/lib/server/mail/send";
import { emailChangeMail } from "@/lib/server/mail/templates";
import { MAIL_LIMITS, takeMailAllowance } from "@/lib/server/mail/rate-limit";
import { generateToken, hashToken } from "@/lib/server/auth/tokens";
import { AppError } from "@/lib/base/errors";
import { recordAudit } from "@/lib/server/audit";
import { hashPassword, verifyPassword } from "@/lib/server/auth/password";
import type { SessionUser } from "@/lib/server/auth/session";

/**
 * The signed-in person's own account (password, name, sessions) and the site admin's account
 * controls (deactivate, reactivate). Every change is audited, in the transaction that makes it.
 */

/** A session as shown to its owner: a public handle (not the stored id, itself a token hash). */
export type SessionView = { handle: string; createdAt: string | null; expiresAt: string; current: boolean };

export function sessionHandle(sessionId: string): string {
  return createHash("sha256").update(`session-handle:${sessionId}`).digest("hex").slice(0, 24);
}

/** Change one's password: the current one is required; every other session of the account ends. */
export async function changePassword({ actor, sessionId, currentPassword, newPassword }: { actor: SessionUser; sessionId: string; currentPassword: string; newPassword: string }): Promise<{ endedSessions: number }> {
  const [row] = await db.select({ passwordHash: users.passwordHash }).from(users).where(eq(users.id, actor.id));
  if (!row) throw new AppError("not_found", 404, "Account not found.");
  if (!(await verifyPassword(row.passwordHash, currentPassword))) {
    throw new AppError("validation_failed", 400, "The current password is not right.", { currentPassword: "The current password is not right." });
  }
  const passwordHash = await hashPassword(newPassword);
  return runInTransaction(async (tx) => {
    await tx.update(users).set({ passwordHash }).where(eq(users.id, actor.id));
    const ended = await tx.delete(sessions).where(and(eq(sessions.userId, actor.id), ne(sessions.id, sessionId))).returning({ id: sessions.id });
    await recordAudit(tx, { actor, action: "user.password_change", target: actor.email, detail: { endedSessions: ended.length } });
    return { endedSessions: ended.length };
  });
}

/** Change one's display name. */
export async function renameAccount({ actor, name }: { actor: SessionUser; name: string }): Promise<{ name: string }> {
  return runInTransaction(async (tx) => {
    await tx.update(users).set({ name }).where(eq(users.id, actor.id));
    await recordAudit(tx, { actor, action: "user.rename", target: actor.email, detail: { from: actor.name, to: name } });
    return { name };
  });
}

export async function listOwnSessions({ userId, currentSessionId, now = new Date() }: { userId: string; currentSessionId: string | null; now?: Date }): Promise<SessionView[]> {
  const rows = await db.select().from(sessions).where(eq(sessions.userId, userId)).orderBy(asc(sessions.createdAt));
  // the session library stores expires_at in whole seconds (Unix time)
  return rows
    .filter((s) => s.expiresAt * 1000 > now.getTime())
    .map((s) => ({
      handle: sessionHandle(s.id),
      createdAt: s.createdAt ? s.createdAt.toISOString() : null,
      expiresAt: new Date(s.expiresAt * 1000).toISOString(),
      current: s.id === currentSessionId,
    }));
}

/** End one of one's own sessions by its handle (404 for a handle that is not one of them). */
export async function revokeOwnSession({ actor, handle }: { actor: SessionUser; handle: string }): Promise<void> {
  await runInTransaction(async (tx) => {
    const rows = await tx.select({ id: sessions.id }).from(sessions).where(eq(sessions.userId, actor.id));
    const match = rows.find((s) => sessionHandle(s.id) === handle);
    if (!match) throw new AppError("not_found", 404, "No such session of yours.");
    await tx.delete(sessions).where(eq(sessions.id, match.id));
    await recordAudit(tx, { actor, action: "user.session_revoke", target: actor.email });
  });
}

/**
 * Site admin: deactivate (the account's sessions end at once; sign-in and API tokens are refused) or
 * reactivate an account. An admin cannot deactivate their own account (someone must stay able to undo it).
 */
export async function setAccountActive({ actor, userId, active, now = new Date() }: { actor: SessionUser; userId: string; active: boolean; now?: Date }): Promise<{ id: string; email: string; active: boolean; endedSessions: number }> {
  if (!active && userId === actor.id) throw new AppError("conflict", 409, "You cannot deactivate your own account.");
  return runInTransaction(async (tx) => {
    const [target] = await tx.select({ id: users.id, email: users.email, deactivatedAt: users.deactivatedAt }).from(users).where(eq(users.id, userId));
    if (!target) throw new AppError("not_found", 404, "User not found.");
    await tx.update(users).set({ deactivatedAt: active ? null : (target.deactivatedAt ?? now) }).where(eq(users.id, userId));
    const ended = active ? [] : await tx.delete(sessions).where(eq(sessions.userId, userId)).returning({ id: sessions.id });
    await recordAudit(tx, { actor, action: active ? "user.reactivate" : "user.deactivate", target: target.email, detail: active ? {} : { endedSessions: ended.length } });
    return { id: target.id, email: target.email, active, endedSessions: ended.length };
  });
}

export const EMAIL_CHANGE_LIFETIME_MS = 24 * 60 * 60 * 1000;

/**
 * Ask to move the account to a new address: the current password is required (a borrowed session
 * cannot take the account over), and nothing changes until the link mailed to the new address is used.
 * `delivery` settles when the mail has been handed to SMTP.
 */
export async function requestEmailChange({ actor, newEmail, currentPassword, now = new Date() }: { actor: SessionUser; newEmail: string; currentPassword: string; now?: Date }): Promise<{ delivery: Promise<void> }> {
  const to = normaliseEmail(newEmail);
  const [row] = await db.select({ passwordHash: users.passwordHash }).from(users).where(eq(users.id, actor.id));
  if (!row || !(await verifyPassword(row.passwordHash, currentPassword))) {
    throw new AppError("validation_failed", 400, "The current password is not right.", { currentPassword: "The current password is not right." });
  }
  if (to === actor.email) throw new AppError("validation_failed", 400, "That is already your address.", { newEmail: "That is already your address." });
  const [taken] = await db.select({ id: users.id }).from(users).where(eq(users.email, to));
  if (taken) throw new AppError("conflict", 409, "Another account uses that address.", { newEmail: "Another account uses that address." });
  if (!(await takeMailAllowance([{ key: `email_change:to:${to}`, limit: MAIL_LIMITS.resetPerRecipient }], now.getTime()))) {
    throw new AppError("too_many_requests", 429, "Too many confirmation e-mails to that address this hour. Try again later.");
  }
  const token = generateToken();
  await runInTransaction(async (tx) => {
    await tx.insert(emailChanges).values({ id: randomUUID(), userId: actor.id, newEmail: to, tokenHash: hashToken(token), expiresAt: new Date(now.getTime() + EMAIL_CHANGE_LIFETIME_MS) });
    await recordAudit(tx, { actor, action: "user.email_change_request", target: actor.email, detail: { to } });
  });
  const delivery = sendMail(emailChangeMail({ to, name: actor.name, token })).catch((error: unknown) => {
    console.error("[mail] e-mail change confirmation failed:", error instanceof Error ? error.message : String(error));
  });
  return { delivery };
}

const EMAIL_LINK_INVALID = "This confirmation link has expired or was already used. Ask for a new one on your account page.";

/** Use an e-mail change link: single use, expiring; the address must still be free. */
export async function confirmEmailChange({ token, now = new Date() }: { token: string; now?: Date }): Promise<{ userId: string; email: string }> {
  return runInTransaction(async (tx) => {
    const [row] = await tx.select().from(emailChanges).where(eq(emailChanges.tokenHash, hashToken(token)));
    if (!row || row.usedAt || row.expiresAt.getTime() <= now.getTime()) throw new AppError("unprocessable", 422, EMAIL_LINK_INVALID, { token: EMAIL_LINK_INVALID });
    const [taken] = await tx.select({ id: users.id }).from(users).where(eq(users.email, row.newEmail));
    if (taken) throw new AppError("conflict", 409, "Another account uses that address now.", { token: "Another account uses that address now." });
    const [user] = await tx.select({ email: users.email }).from(users).where(eq(users.id, row.userId));
    if (!user) throw new AppError("unprocessable", 422, EMAIL_LINK_INVALID, { token: EMAIL_LINK_INVALID });
    await tx.update(emailChanges).set({ usedAt: now }).where(eq(emailChanges.id, row.id));
    await tx.update(users).set({ email: row.newEmail }).where(eq(users.id, row.userId));
    await recordAudit(tx, { actor: { id: row.userId, email: row.newEmail }, action: "user.email_change", target: row.newEmail, detail: { from: user.email, to: row.newEmail } });
    return { userId: row.userId, email: row.newEmail };
  });
}
