import "server-only";
import { inArray } from "drizzle-orm";
import { runInTransaction } from "@/db/client";
import { mailRateLimits } from "@/db/schema";

/** Mail is counted in fixed windows of one hour. */
export const MAIL_WINDOW_MS = 60 * 60 * 1000;

/**
 * Messages allowed per window. Per recipient, so nobody's inbox can be flooded through Portolan; per
 * sender account, so one account cannot spray many addresses. Resets and sign-up notices have no sender
 * account (anyone may ask), so they are limited per recipient only.
 */
export const MAIL_LIMITS = {
  resetPerRecipient: 5,
  signupNoticePerRecipient: 5,
  invitationPerRecipient: 5,
  invitationPerSender: 30,
  signoffPerRecipient: 30,
  signoffPerSender: 60,
} as const;

export type MailAllowanceKey = { key: string; limit: number };

export const mailKeys = {
  reset: (to: string): MailAllowanceKey[] => [{ key: `reset:to:${to.toLowerCase()}`, limit: MAIL_LIMITS.resetPerRecipient }],
  signupNotice: (to: string): MailAllowanceKey[] => [{ key: `signup:to:${to.toLowerCase()}`, limit: MAIL_LIMITS.signupNoticePerRecipient }],
  invitation: (to: string, senderId: string): MailAllowanceKey[] => [
    { key: `invitation:to:${to.toLowerCase()}`, limit: MAIL_LIMITS.invitationPerRecipient },
    { key: `invitation:from:${senderId}`, limit: MAIL_LIMITS.invitationPerSender },
  ],
  signoff: (to: string, senderId: string): MailAllowanceKey[] => [
    { key: `signoff:to:${to.toLowerCase()}`, limit: MAIL_LIMITS.signoffPerRecipient },
    { key: `signoff:from:${senderId}`, limit: MAIL_LIMITS.signoffPerSender },
  ],
};

/**
 * Take one message from every key's allowance, or none if any key is used up in its current window.
 * The counts live in the database (one transaction), so every app instance on it shares them.
 * Returns whether the message may be sent.
 */
export async function takeMailAllowance(keys: MailAllowanceKey[], now: number = Date.now()): Promise<boolean> {
  if (keys.length === 0) return true;
  return runInTransaction(async (tx) => {
    const rows = await tx
      .select()
      .from(mailRateLimits)
      .where(inArray(mailRateLimits.key, keys.map((k) => k.key)));
    const byKey = new Map(rows.map((row) => [row.key, row]));
    const next = keys.map(({ key, limit }) => {
      const row = byKey.get(key);
      const fresh = !row || now - row.windowStart.getTime() >= MAIL_WINDOW_MS;
      return { key, limit, count: fresh ? 0 : row.count, windowStart: fresh ? new Date(now) : row.windowStart };
    });
    if (next.some((k) => k.count >= k.limit)) return false;
    for (const k of next) {
      await tx
        .insert(mailRateLimits)
        .values({ key: k.key, count: k.count + 1, windowStart: k.windowStart })
        .onConflictDoUpdate({ target: mailRateLimits.key, set: { count: k.count + 1, windowStart: k.windowStart } });
    }
    return true;
  });
}
