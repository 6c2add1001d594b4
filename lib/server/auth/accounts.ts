import "server-only";
import { runInTransaction } from "@/db/client";
import { getUserByEmail, getUserWithPasswordByEmail, hasSiteAdmin, insertUser, type PublicUser } from "@/db/queries/users";
import { getSignupMode } from "@/db/queries/settings";
import { AppError } from "@/lib/base/errors";
import { hashPassword, verifyAgainstDummy, verifyPassword } from "./password";
import { createSessionForUser, type SessionUser } from "./session";
import { assertNotThrottled, clearSignInFailures, recordFailedSignIn, tooManyAttempts } from "./throttle";
import type { Cookie } from "lucia";
import { getEnv } from "@/lib/base/env";
import { forwardedClientAddress } from "@/lib/base/origins";
import { issueDeviceCookie, verifyDeviceCookie } from "./device";
import { sendMail } from "@/lib/server/mail/send";
import { signUpExistingAccountMail, welcomeMail } from "@/lib/server/mail/templates";
import { mailKeys, takeMailAllowance } from "@/lib/server/mail/rate-limit";

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

/** The one answer to a sign-up, whether or not the address already had an account. */
export const SIGN_UP_REQUESTED_MESSAGE =
  "Thanks. We sent a message to that address. If it had no Portolan account, your account is ready: sign in with the password you chose.";

/**
 * Sign-up that does not reveal which addresses have accounts: a new address gets its account (and a
 * welcome message), an address that already has one gets a message to its owner instead, and both
 * answer the same. Nobody is signed in here; the new person signs in next. Invitation-only sign-up
 * refuses everyone alike (403).
 */
export async function requestSignUp({ email, name, password }: { email: string; name: string; password: string }): Promise<{ delivery: Promise<void> }> {
  // Hash in both cases so the response time does not tell them apart.
  const passwordHash = await hashPassword(password);
  const created = await runInTransaction(async (tx) => {
    if ((await hasSiteAdmin({ executor: tx })) && (await getSignupMode({ executor: tx })) === "invite") {
      throw new AppError("forbidden", 403, "Sign-up is by invitation only. Ask a project owner to invite you.");
    }
    if (await getUserByEmail({ email, executor: tx })) return null;
    return insertUser({ email, name, passwordHash, executor: tx });
  });
  const to = created?.email ?? email.trim().toLowerCase();
  const mail = created ? welcomeMail({ to, name: created.name }) : signUpExistingAccountMail({ to });
  const delivery = (async () => {
    if (!(await takeMailAllowance(mailKeys.signupNotice(to)))) return;
    await sendMail(mail);
  })().catch((error: unknown) => {
    console.error("[mail] sign-up e-mail failed:", error instanceof Error ? error.message : String(error));
  });
  return { delivery };
}

/** What sign-in knows about the client: a trusted address (or null) and the device cookie sent, if any. */
export type SignInClient = { address: string | null; deviceCookie: string | null };

/**
 * Check e-mail and password, throttled per account+client pair, per trusted client address and (for
 * failing clients only) per account; see lib/server/auth/throttle.ts. Unknown e-mails take the same time
 * as wrong passwords. Throws 401 on bad credentials and 429 while locked. A successful sign-in also
 * returns a fresh device cookie for this account.
 */
export async function signIn({
  email,
  password,
  client,
  now = Date.now(),
}: {
  email: string;
  password: string;
  client: SignInClient;
  now?: number;
}): Promise<SignedIn & { deviceCookie: Cookie }> {
  const keys = { email, address: client.address, device: await verifyDeviceCookie(client.deviceCookie, email) };
  await assertNotThrottled(keys, now);
  const user = await getUserWithPasswordByEmail({ email });
  const ok = user ? await verifyPassword(user.passwordHash, password) : await verifyAgainstDummy(password);
  if (!user || !ok) {
    const lockedUntil = await recordFailedSignIn(keys, now);
    if (lockedUntil !== null) throw tooManyAttempts(lockedUntil, now);
    throw new AppError("unauthenticated", 401, "Wrong e-mail or password.", { email: "Wrong e-mail or password." });
  }
  await clearSignInFailures(keys);
  if (user.deactivatedAt) throw new AppError("forbidden", 403, "This account has been deactivated by a site admin.", { email: "This account has been deactivated by a site admin." });
  const { token, cookie } = await createSessionForUser(user.id);
  return { user: toSessionUser(user), token, cookie, deviceCookie: await issueDeviceCookie(user.email) };
}

/**
 * The client address for throttling, from X-Forwarded-For only when TRUST_PROXY names the proxies in
 * front of the app; otherwise null (a client may write any X-Forwarded-For it likes).
 */
export function clientAddress(headers: Headers): string | null {
  return forwardedClientAddress(headers, getEnv().trustProxyHops);
}
