import "server-only";
import { cache } from "react";
import { cookies, headers } from "next/headers";
import { redirect } from "next/navigation";
import type { Cookie, Session, User } from "lucia";
import { AppError } from "@/lib/base/errors";
import { getEnv } from "@/lib/base/env";
import { REQUEST_PATH_HEADER, signInPathFor } from "@/lib/base/origins";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { sessions } from "@/db/schema";
import { getLucia, SESSION_COOKIE_NAME } from "./lucia";
import { generateToken, hashToken } from "./tokens";

export type SessionUser = { id: string; email: string; name: string; isSiteAdmin: boolean };
export type SessionInfo = { id: string; expiresAt: Date };
export type CurrentSession = { user: SessionUser; session: SessionInfo } | { user: null; session: null };
/** A validated session, plus a cookie to send back when the expiry slid forward. */
export type ValidatedSession = CurrentSession & { refreshCookie: Cookie | null };

function toSessionUser(user: User): SessionUser {
  return { id: user.id, email: user.email, name: user.name, isSiteAdmin: user.isSiteAdmin };
}

function toSessionInfo(session: Session): SessionInfo {
  return { id: session.id, expiresAt: session.expiresAt };
}

/**
 * Start a session: the cookie carries a random token and the database keeps only its SHA-256 as the
 * session id, so a leaked sessions table cannot be replayed.
 */
export async function createSessionForUser(userId: string): Promise<{ token: string; cookie: Cookie }> {
  const lucia = getLucia();
  const token = generateToken();
  const sessionId = hashToken(token);
  await lucia.createSession(userId, {}, { sessionId });
  await getDb().update(sessions).set({ createdAt: new Date() }).where(eq(sessions.id, sessionId));
  return { token, cookie: lucia.createSessionCookie(token) };
}

/** Look a cookie token up. Expired or unknown tokens give `{ user: null }`. */
export async function validateSessionToken(token: string | null | undefined): Promise<ValidatedSession> {
  if (!token) return { user: null, session: null, refreshCookie: null };
  const lucia = getLucia();
  const result = await lucia.validateSession(hashToken(token));
  if (!result.session || !result.user) return { user: null, session: null, refreshCookie: null };
  return {
    user: toSessionUser(result.user),
    session: toSessionInfo(result.session),
    refreshCookie: result.session.fresh ? lucia.createSessionCookie(token) : null,
  };
}

/** End the session a cookie token belongs to (no-op for unknown tokens). */
export async function invalidateSessionToken(token: string | null | undefined): Promise<void> {
  if (!token) return;
  await getLucia().invalidateSession(hashToken(token));
}

/** End every session of a user (after a password reset). */
export async function invalidateUserSessions(userId: string): Promise<void> {
  await getLucia().invalidateUserSessions(userId);
}

export function blankSessionCookie(): Cookie {
  return getLucia().createBlankSessionCookie();
}

/** The session token from a Cookie header, if any. */
export function readSessionToken(cookieHeader: string | null): string | null {
  if (!cookieHeader) return null;
  return getLucia().readSessionCookie(cookieHeader);
}

/** Route handlers: the signed-in user or AppError 401. */
export async function authenticateRequest(request: Request): Promise<ValidatedSession & { user: SessionUser; session: SessionInfo }> {
  const result = await validateSessionToken(readSessionToken(request.headers.get("cookie")));
  if (!result.user) throw new AppError("unauthenticated", 401, "Sign in to continue.");
  return result;
}

/** Pages, layouts and server actions: the current session, looked up once per request. */
export const getCurrentSession = cache(async (): Promise<CurrentSession> => {
  const store = await cookies();
  const token = store.get(SESSION_COOKIE_NAME)?.value;
  const result = await validateSessionToken(token);
  if (result.refreshCookie) {
    try {
      store.set(result.refreshCookie.name, result.refreshCookie.value, result.refreshCookie.attributes);
    } catch {
      // Server components cannot set cookies; the next action or route handler refreshes it.
    }
  }
  if (!result.user) return { user: null, session: null };
  return { user: result.user, session: result.session };
});

/**
 * Pages and server actions: the signed-in user, or a redirect to the sign-in page with the page asked
 * for as `next` (a same-origin path only, checked again where it is used), so that a link from an
 * e-mail lands where it points after sign-in.
 */
export async function requireUser(): Promise<SessionUser> {
  const { user } = await getCurrentSession();
  if (!user) redirect(signInPathFor((await headers()).get(REQUEST_PATH_HEADER), getEnv().originPolicy.appOrigin));
  return user;
}

/** Pages: the signed-in site admin, or a redirect. */
export async function requireSiteAdmin(): Promise<SessionUser> {
  const user = await requireUser();
  if (!user.isSiteAdmin) redirect("/projects");
  return user;
}

/** Server actions: write a session cookie. */
export async function setSessionCookie(cookie: Cookie): Promise<void> {
  const store = await cookies();
  store.set(cookie.name, cookie.value, cookie.attributes);
}

/** Server actions: the raw token of the current request's cookie. */
export async function readSessionTokenFromCookies(): Promise<string | null> {
  const store = await cookies();
  return store.get(SESSION_COOKIE_NAME)?.value ?? null;
}
