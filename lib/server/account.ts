import "server-only";
import { createHash } from "node:crypto";
import { and, asc, eq, ne } from "drizzle-orm";
import { db, runInTransaction } from "@/db/client";
import { sessions, users } from "@/db/schema";
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
