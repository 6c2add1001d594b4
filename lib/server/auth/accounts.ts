import "server-only";
import { runInTransaction } from "@/db/client";
import { getUserWithPasswordByEmail, hasSiteAdmin, insertUser, type PublicUser } from "@/db/queries/users";
import { getSignupMode } from "@/db/queries/settings";
import { AppError } from "@/lib/base/errors";
import { hashPassword, verifyAgainstDummy, verifyPassword } from "./password";
import { createSessionForUser, type SessionUser } from "./session";
import { assertNotThrottled, clearSignInFailures, recordFailedSignIn, tooManyAttempts } from "./throttle";
import type { Cookie } from "lucia";

export type SignedIn = { user: SessionUser; token: string; cookie: Cookie };

function toSessionUser(user: PublicUser): SessionUser {
  return { id: user.id, email: user.email, name: user.name, isSiteAdmin: user.isSiteAdmin };
}

/**
 * Create an account and sign it in. The first account becomes site admin; after that, sign-up must
 * be open (setting) unless `viaInvitation` is true.
 */
export async function signUp({
  email,
  name,
  password,
  viaInvitation = false,
}: {
  email: string;
  name: string;
  password: string;
  viaInvitation?: boolean;
}): Promise<SignedIn> {
  const passwordHash = await hashPassword(password);
  const user = await runInTransaction(async (tx) => {
    // Until a real account exists (demo accounts are never site admins) anyone may sign up: that account becomes site admin.
    if (!viaInvitation && (await hasSiteAdmin({ executor: tx })) && (await getSignupMode({ executor: tx })) === "invite") {
      throw new AppError("forbidden", 403, "Sign-up is by invitation only. Ask a project owner to invite you.");
    }
    return insertUser({ email, name, passwordHash, executor: tx });
  });
  const { token, cookie } = await createSessionForUser(user.id);
  return { user: toSessionUser(user), token, cookie };
}

/**
 * Check e-mail and password, throttled per account and per client address. Unknown e-mails take the
 * same time as wrong passwords. Throws 401 on bad credentials and 429 while locked.
 */
export async function signIn({ email, password, ip, now = Date.now() }: { email: string; password: string; ip: string; now?: number }): Promise<SignedIn> {
  const keys = { email, ip };
  await assertNotThrottled(keys, now);
  const user = await getUserWithPasswordByEmail({ email });
  const ok = user ? await verifyPassword(user.passwordHash, password) : await verifyAgainstDummy(password);
  if (!user || !ok) {
    const lockedUntil = await recordFailedSignIn(keys, now);
    if (lockedUntil !== null) throw tooManyAttempts(lockedUntil, now);
    throw new AppError("unauthenticated", 401, "Wrong e-mail or password.", { email: "Wrong e-mail or password." });
  }
  await clearSignInFailures(keys);
  const { token, cookie } = await createSessionForUser(user.id);
  return { user: toSessionUser(user), token, cookie };
}

/** The client address for throttling: first X-Forwarded-For hop, X-Real-IP, or "unknown". */
export function clientAddress(headers: Headers): string {
  const forwarded = headers.get("x-forwarded-for");
  if (forwarded) return forwarded.split(",")[0].trim().slice(0, 100) || "unknown";
  return headers.get("x-real-ip")?.trim().slice(0, 100) || "unknown";
}
