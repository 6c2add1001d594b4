import "server-only";
import { runInTransaction } from "@/db/client";
import { getPasswordResetByTokenHash, insertPasswordReset, markPasswordResetUsed } from "@/db/queries/password-resets";
import { getUserByEmail, getUserById, updatePasswordHash } from "@/db/queries/users";
import { recordAudit } from "@/lib/server/audit";
import { AppError } from "@/lib/base/errors";
import { sendMail } from "@/lib/server/mail/send";
import { passwordResetMail } from "@/lib/server/mail/templates";
import { mailKeys, takeMailAllowance } from "@/lib/server/mail/rate-limit";
import { hashPassword } from "./password";
import { invalidateUserSessions } from "./session";
import { generateToken, hashToken } from "./tokens";

export const RESET_TOKEN_LIFETIME_MS = 60 * 60 * 1000;

/** The one message shown whether or not the address has an account. */
export const RESET_REQUESTED_MESSAGE = "If an account uses that address, we sent it a link to choose a new password. The link expires in 1 hour.";

/**
 * Start a password reset. Always resolves the same way; `delivery` settles when the e-mail (if any)
 * has been handed to SMTP, so callers can answer without waiting and without revealing the account.
 */
export async function requestPasswordReset({ email, now = new Date() }: { email: string; now?: Date }): Promise<{ delivery: Promise<void> }> {
  const user = await getUserByEmail({ email });
  if (!user) return { delivery: Promise.resolve() };
  // Over the hourly limit for this address nothing is written or sent, and the caller answers as usual.
  if (!(await takeMailAllowance(mailKeys.reset(user.email), now.getTime()))) return { delivery: Promise.resolve() };
  const token = generateToken();
  await runInTransaction(async (tx) => {
    await insertPasswordReset({ userId: user.id, tokenHash: hashToken(token), expiresAt: new Date(now.getTime() + RESET_TOKEN_LIFETIME_MS), executor: tx });
    await recordAudit(tx, { actor: { id: user.id, email: user.email }, action: "user.password_reset_request", target: user.email });
  });
  const delivery = sendMail(passwordResetMail({ to: user.email, token })).catch((error: unknown) => {
    console.error("[mail] password reset e-mail failed:", error instanceof Error ? error.message : String(error));
  });
  return { delivery };
}

const LINK_INVALID = "This reset link has expired or was already used. Ask for a new one.";

/** Whether a reset token can still be used (for the reset page). */
export async function isResetTokenUsable({ token, now = new Date() }: { token: string; now?: Date }): Promise<boolean> {
  const row = await getPasswordResetByTokenHash({ tokenHash: hashToken(token) });
  return Boolean(row && !row.usedAt && row.expiresAt.getTime() > now.getTime());
}

/** Set a new password with a reset token: single use, expiring; ends every session of the account. */
export async function confirmPasswordReset({ token, password, now = new Date() }: { token: string; password: string; now?: Date }): Promise<{ userId: string }> {
  const row = await getPasswordResetByTokenHash({ tokenHash: hashToken(token) });
  if (!row || row.usedAt || row.expiresAt.getTime() <= now.getTime()) {
    throw new AppError("unprocessable", 422, LINK_INVALID, { token: LINK_INVALID });
  }
  const passwordHash = await hashPassword(password);
  await runInTransaction(async (tx) => {
    const fresh = await markPasswordResetUsed({ id: row.id, userId: row.userId, now, executor: tx });
    if (!fresh) throw new AppError("unprocessable", 422, LINK_INVALID, { token: LINK_INVALID });
    await updatePasswordHash({ userId: row.userId, passwordHash, executor: tx });
    const user = await getUserById({ userId: row.userId, executor: tx });
    await recordAudit(tx, { actor: user ? { id: user.id, email: user.email } : null, action: "user.password_reset", target: user?.email ?? null });
  });
  await invalidateUserSessions(row.userId);
  return { userId: row.userId };
}
