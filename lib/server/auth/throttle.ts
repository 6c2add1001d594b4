import "server-only";
import { eq, inArray } from "drizzle-orm";
import { getDb, runInTransaction } from "@/db/client";
import { loginThrottle } from "@/db/schema";
import { AppError } from "@/lib/base/errors";

/** Failed sign-ins counted within this window. */
export const THROTTLE_WINDOW_MS = 15 * 60 * 1000;
/** Failures of one account from one client before that pair is locked. */
export const PAIR_FAILURE_LIMIT = 5;
/** Failures per client address across accounts before the address is locked (many people may share one). */
export const IP_FAILURE_LIMIT = 20;
/** Failures of one account from all clients together before failing clients are held back. */
export const ACCOUNT_FAILURE_LIMIT = 10;
/** Pair and address locks: the first lasts a minute, each further lock in a row doubles it, up to an hour. */
export const BASE_LOCK_MS = 60 * 1000;
export const MAX_LOCK_MS = 60 * 60 * 1000;
/** The account lock is slower to grow and capped low: it must not become a way to shut someone out. */
export const ACCOUNT_BASE_LOCK_MS = 30 * 1000;
export const ACCOUNT_MAX_LOCK_MS = 5 * 60 * 1000;

/**
 * Who is signing in: the account's e-mail and what we can tell about the client. `address` is the client
 * address only when it comes from trusted proxies (TRUST_PROXY); `device` is the id of a valid device
 * cookie for this account (lib/server/auth/device.ts). A client with neither counts as "anonymous".
 */
export type ThrottleKeys = { email: string; address: string | null; device: string | null };

type Key = { key: string; limit: number; baseMs: number; maxMs: number };

function clientId({ address, device }: ThrottleKeys): string {
  if (device) return `device:${device}`;
  if (address) return `ip:${address}`;
  return "anonymous";
}

function pairKey(keys: ThrottleKeys): Key {
  const client = clientId(keys);
  // Clients we cannot tell apart share one pair per account, which makes it a per-account lock: it gets
  // the account's slower, capped back-off, so failing on purpose shuts a new browser out for minutes at most.
  const anonymous = client === "anonymous";
  return {
    key: `pair:${keys.email.trim().toLowerCase()}|${client}`,
    limit: PAIR_FAILURE_LIMIT,
    baseMs: anonymous ? ACCOUNT_BASE_LOCK_MS : BASE_LOCK_MS,
    maxMs: anonymous ? ACCOUNT_MAX_LOCK_MS : MAX_LOCK_MS,
  };
}

function accountKey(keys: ThrottleKeys): Key {
  return { key: `account:${keys.email.trim().toLowerCase()}`, limit: ACCOUNT_FAILURE_LIMIT, baseMs: ACCOUNT_BASE_LOCK_MS, maxMs: ACCOUNT_MAX_LOCK_MS };
}

function addressKey(keys: ThrottleKeys): Key | null {
  // A device cookie proves the browser signed in before; its address's failures do not hold it back.
  if (!keys.address || keys.device) return null;
  return { key: `ip:${keys.address}`, limit: IP_FAILURE_LIMIT, baseMs: BASE_LOCK_MS, maxMs: MAX_LOCK_MS };
}

function keysFor(keys: ThrottleKeys): Key[] {
  return [pairKey(keys), accountKey(keys), addressKey(keys)].filter((k): k is Key => k !== null);
}

export function tooManyAttempts(lockedUntil: number, now: number): AppError {
  const seconds = Math.max(1, Math.ceil((lockedUntil - now) / 1000));
  return new AppError("too_many_requests", 429, `Too many attempts. Try again in ${seconds} s.`, undefined, {
    retryAfterSeconds: seconds,
  });
}

/**
 * Throw 429 if this client may not try now: its pair (account + client) or its address is locked, or the
 * account is locked and this client has itself been failing. A client that has not failed on this
 * account in the window (a device cookie, or a trusted address) still gets in with the right password,
 * so strangers cannot lock someone out by failing on purpose.
 */
export async function assertNotThrottled(keys: ThrottleKeys, now: number = Date.now()): Promise<void> {
  const pair = pairKey(keys);
  const account = accountKey(keys);
  const address = addressKey(keys);
  const wanted = [pair.key, account.key, ...(address ? [address.key] : [])];
  const rows = new Map((await getDb().select().from(loginThrottle).where(inArray(loginThrottle.key, wanted))).map((row) => [row.key, row]));
  const lockOf = (key: string) => rows.get(key)?.lockedUntil?.getTime() ?? 0;
  const pairRow = rows.get(pair.key);
  const pairFailing = Boolean(pairRow && now - pairRow.windowStart.getTime() <= THROTTLE_WINDOW_MS && (pairRow.failures > 0 || lockOf(pair.key) > 0));
  // An anonymous client cannot be told apart from the others, so it always counts as failing.
  const heldByAccount = pairFailing || clientId(keys) === "anonymous";
  let latest = Math.max(lockOf(pair.key), address ? lockOf(address.key) : 0);
  if (heldByAccount) latest = Math.max(latest, lockOf(account.key));
  if (latest > now) throw tooManyAttempts(latest, now);
}

/**
 * Count one failed sign-in for the pair, the account and the address. Returns the time until which this
 * client is now locked (ms since epoch), or null.
 */
export async function recordFailedSignIn(keys: ThrottleKeys, now: number = Date.now()): Promise<number | null> {
  return runInTransaction(async (tx) => {
    let lockedUntil: number | null = null;
    for (const { key, limit, baseMs, maxMs } of keysFor(keys)) {
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
        const lockMs = Math.min(maxMs, baseMs * 2 ** lockCount);
        nextLockedUntil = new Date(now + lockMs);
        nextLockCount = lockCount + 1;
        nextFailures = 0;
        // This client is failing, so the account lock holds it back too.
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

/**
 * A successful sign-in clears the pair and the address. The account's count stays: other clients that
 * were failing are still held back.
 */
export async function clearSignInFailures(keys: ThrottleKeys): Promise<void> {
  const wanted = [pairKey(keys).key, ...(addressKey(keys) ? [addressKey(keys)!.key] : [])];
  await runInTransaction((tx) => tx.delete(loginThrottle).where(inArray(loginThrottle.key, wanted)));
}
