import "server-only";
import { eq, inArray } from "drizzle-orm";
import { getDb, runInTransaction } from "@/db/client";
import { loginThrottle } from "@/db/schema";
import { AppError } from "@/lib/base/errors";

/** Failed sign-ins counted within this window. */
export const THROTTLE_WINDOW_MS = 15 * 60 * 1000;
/** Failures per e-mail address before it is locked. */
export const ACCOUNT_FAILURE_LIMIT = 5;
/** Failures per client address before it is locked (higher: many people may share one address). */
export const IP_FAILURE_LIMIT = 20;
/** First lock lasts this long; each further lock in a row doubles it, up to the cap. */
export const BASE_LOCK_MS = 60 * 1000;
export const MAX_LOCK_MS = 60 * 60 * 1000;

export type ThrottleKeys = { email: string; ip: string };

function keysFor({ email, ip }: ThrottleKeys): { key: string; limit: number }[] {
  return [
    { key: `account:${email.trim().toLowerCase()}`, limit: ACCOUNT_FAILURE_LIMIT },
    { key: `ip:${ip}`, limit: IP_FAILURE_LIMIT },
  ];
}

export function tooManyAttempts(lockedUntil: number, now: number): AppError {
  const seconds = Math.max(1, Math.ceil((lockedUntil - now) / 1000));
  return new AppError("too_many_requests", 429, `Too many attempts. Try again in ${seconds} s.`, undefined, {
    retryAfterSeconds: seconds,
  });
}

/** Throw 429 if the account or the address is locked at `now`. */
export async function assertNotThrottled(keys: ThrottleKeys, now: number = Date.now()): Promise<void> {
  const wanted = keysFor(keys).map((k) => k.key);
  const rows = await getDb().select().from(loginThrottle).where(inArray(loginThrottle.key, wanted));
  const latest = rows.reduce((max, row) => Math.max(max, row.lockedUntil?.getTime() ?? 0), 0);
  if (latest > now) throw tooManyAttempts(latest, now);
}

/**
 * Count one failed sign-in for the account and the address. Returns the time until which either is
 * now locked (ms since epoch), or null if neither is.
 */
export async function recordFailedSignIn(keys: ThrottleKeys, now: number = Date.now()): Promise<number | null> {
  return runInTransaction(async (tx) => {
    let lockedUntil: number | null = null;
    for (const { key, limit } of keysFor(keys)) {
      const [row] = await tx.select().from(loginThrottle).where(eq(loginThrottle.key, key));
      const windowExpired = !row || now - row.windowStart.getTime() > THROTTLE_WINDOW_MS;
      // A lock in the previous window still counts towards the backoff; a quiet window forgives it.
      const lockCount = !row ? 0 : windowExpired && (row.lockedUntil?.getTime() ?? 0) + THROTTLE_WINDOW_MS < now ? 0 : row.lockCount;
      const failures = windowExpired ? 1 : row.failures + 1;
      const windowStart = windowExpired ? new Date(now) : row.windowStart;
      let nextLockedUntil = row?.lockedUntil ?? null;
      let nextLockCount = lockCount;
      let nextFailures = failures;
      if (failures >= limit) {
        const lockMs = Math.min(MAX_LOCK_MS, BASE_LOCK_MS * 2 ** lockCount);
        nextLockedUntil = new Date(now + lockMs);
        nextLockCount = lockCount + 1;
        nextFailures = 0;
        lockedUntil = Math.max(lockedUntil ?? 0, nextLockedUntil.getTime());
      }
      await tx
        .insert(loginThrottle)
        .values({ key, failures: nextFailures, windowStart, lockedUntil: nextLockedUntil, lockCount: nextLockCount })
        .onConflictDoUpdate({
          target: loginThrottle.key,
          set: { failures: nextFailures, windowStart, lockedUntil: nextLockedUntil, lockCount: nextLockCount },
        });
    }
    return lockedUntil;
  });
}

/** A successful sign-in clears the counters of the account and the address. */
export async function clearSignInFailures(keys: ThrottleKeys): Promise<void> {
  const wanted = keysFor(keys).map((k) => k.key);
  await runInTransaction((tx) => tx.delete(loginThrottle).where(inArray(loginThrottle.key, wanted)));
}
