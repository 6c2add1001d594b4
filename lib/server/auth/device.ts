import "server-only";
import { createHmac, randomBytes, timingSafeEqual } from "node:crypto";
import { eq } from "drizzle-orm";
import { Cookie } from "lucia";
import { db } from "@/db/client";
import { settings } from "@/db/schema";
import { getEnv } from "@/lib/base/env";

/**
 * Device cookies (OWASP "Slow down online guessing attacks with device cookies"): after a successful
 * sign-in the browser gets a cookie that proves it signed in to that account before. Sign-in throttling
 * counts such a browser on its own, so failures elsewhere (a stranger guessing passwords) never lock it out.
 * The cookie is an HMAC over the account's e-mail and a random id, keyed by a secret kept in the settings
 * table (made on first use, shared by every instance on the database).
 */
export const DEVICE_COOKIE_NAME = "portolan_device";
const SECRET_KEY = "device_cookie_secret";
const DEVICE_COOKIE_MAX_AGE_S = 365 * 24 * 60 * 60;

let cachedSecret: { db: unknown; secret: Buffer } | null = null;

async function deviceSecret(): Promise<Buffer> {
  if (cachedSecret && cachedSecret.db === db) return cachedSecret.secret;
  // Insert-or-ignore, then read: two instances starting together agree on one secret.
  await db.insert(settings).values({ key: SECRET_KEY, value: randomBytes(32).toString("base64url") }).onConflictDoNothing();
  const [row] = await db.select().from(settings).where(eq(settings.key, SECRET_KEY));
  const secret = Buffer.from(row.value, "base64url");
  cachedSecret = { db, secret };
  return secret;
}

function mac(secret: Buffer, email: string, id: string): string {
  return createHmac("sha256", secret).update(`${email.trim().toLowerCase()}|${id}`).digest("base64url");
}

/** A new device cookie for a browser that just signed in to `email`. */
export async function issueDeviceCookie(email: string): Promise<Cookie> {
  const id = randomBytes(16).toString("base64url");
  const value = `${id}.${mac(await deviceSecret(), email, id)}`;
  return new Cookie(DEVICE_COOKIE_NAME, value, {
    httpOnly: true,
    sameSite: "lax",
    secure: getEnv().cookieSecure,
    path: "/",
    maxAge: DEVICE_COOKIE_MAX_AGE_S,
  });
}

/** The device id if `value` is a device cookie issued for `email`, else null. */
export async function verifyDeviceCookie(value: string | null | undefined, email: string): Promise<string | null> {
  if (!value) return null;
  const match = /^([A-Za-z0-9_-]{16,64})\.([A-Za-z0-9_-]{43})$/.exec(value);
  if (!match) return null;
  const expected = Buffer.from(mac(await deviceSecret(), email, match[1]));
  const given = Buffer.from(match[2]);
  return expected.length === given.length && timingSafeEqual(expected, given) ? match[1] : null;
}

/** The device cookie's value from a Cookie header. */
export function readDeviceCookie(cookieHeader: string | null): string | null {
  if (!cookieHeader) return null;
  for (const part of cookieHeader.split(";")) {
    const [name, ...rest] = part.trim().split("=");
    if (name === DEVICE_COOKIE_NAME) return rest.join("=");
  }
  return null;
}
