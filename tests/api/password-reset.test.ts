import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import { call, countRows, createAccount, makeRequest, setUpDatabase, startMailCatcher, waitFor, type ErrorJson } from "./helpers";
import { POST as requestReset } from "@/app/api/auth/password-reset/route";
import { POST as confirmReset } from "@/app/api/auth/password-reset/confirm/route";
import { POST as signInRoute } from "@/app/api/auth/sign-in/route";
import { GET as sessionRoute } from "@/app/api/auth/session/route";
import { db } from "@/db/client";
import { outboxMessages, passwordResets } from "@/db/schema";
import { hashToken } from "@/lib/server/auth/tokens";
import { RESET_TOKEN_LIFETIME_MS } from "@/lib/server/auth/password-reset";

let mail: Awaited<ReturnType<typeof startMailCatcher>>;

beforeAll(async () => {
  await setUpDatabase();
  mail = await startMailCatcher();
  await createAccount({ email: "quinn@example.test", name: "Quinn", password: "original password" });
});

afterAll(async () => {
  await mail.close();
});

afterEach(() => {
  vi.useRealTimers();
});

/** Ask for a reset and read the token from the e-mail that arrives over SMTP. */
async function requestAndReadToken(email: string): Promise<string> {
  const before = await countRows(outboxMessages);
  const response = await call(requestReset, makeRequest("POST", "/api/auth/password-reset", { body: { email } }));
  expect(response.status).toBe(202);
  const message = await waitFor(async () => {
    const rows = await db.select().from(outboxMessages);
    return rows.length > before ? rows[rows.length - 1] : null;
  });
  expect(message.toAddress).toContain(email);
  expect(message.subject).toBe("Reset your Portolan password");
  const match = /http:\/\/localhost:3000\/reset-password\/([A-Za-z0-9_-]+)/.exec(message.text ?? "");
  expect(match).not.toBeNull();
  return match![1];
}

function confirm(token: string, password: string) {
  return call(confirmReset, makeRequest("POST", "/api/auth/password-reset/confirm", { body: { token, password } }));
}

function signIn(password: string) {
  return call(signInRoute, makeRequest("POST", "/api/auth/sign-in", { body: { email: "quinn@example.test", password }, headers: { "x-forwarded-for": "192.0.2.1" } }));
}

describe("password reset", () => {
  it("answers the same for unknown and known addresses, and mails only real accounts", async () => {
    const unknown = await call(requestReset, makeRequest("POST", "/api/auth/password-reset", { body: { email: "nobody@example.test" } }));
    const known = await call(requestReset, makeRequest("POST", "/api/auth/password-reset", { body: { email: "Quinn@Example.test" } }));
    expect(unknown.status).toBe(202);
    expect(known.status).toBe(202);
    expect(await unknown.json()).toEqual(await known.json());
    await waitFor(async () => (await countRows(outboxMessages)) >= 1);
    // Give a stray message for the unknown address time to arrive, then check none did.
    await new Promise((resolve) => setTimeout(resolve, 200));
    const recipients = (await db.select().from(outboxMessages)).map((m) => m.toAddress);
    expect(recipients.some((to) => to.includes("nobody@example.test"))).toBe(false);
  });

  it("stores only the hash of the token", async () => {
    const token = await requestAndReadToken("quinn@example.test");
    const rows = await db.select().from(passwordResets);
    expect(rows.some((row) => row.tokenHash === token)).toBe(false);
    expect(rows.some((row) => row.tokenHash === hashToken(token))).toBe(true);
  });

  it("works once: sets the password, ends old sessions, and refuses the same link again", async () => {
    const oldSession = await signIn("original password");
    expect(oldSession.status).toBe(200);
    const oldCookie = oldSession.headers.getSetCookie()[0].split(";")[0];

    const token = await requestAndReadToken("quinn@example.test");
    const first = await confirm(token, "brand new password");
    expect(first.status).toBe(200);

    const again = await confirm(token, "another new password");
    expect(again.status).toBe(422);
    expect(((await again.json()) as ErrorJson).error.code).toBe("unprocessable");

    expect((await signIn("original password")).status).toBe(401);
    expect((await signIn("another new password")).status).toBe(401);
    expect((await signIn("brand new password")).status).toBe(200);
    // The session that existed before the reset is gone.
    expect((await call(sessionRoute, makeRequest("GET", "/api/auth/session", { cookie: oldCookie }))).status).toBe(401);
  });

  it("expires after one hour", async () => {
    const token = await requestAndReadToken("quinn@example.test");
    const [row] = await db.select().from(passwordResets).where(eq(passwordResets.tokenHash, hashToken(token)));
    expect(row.expiresAt.getTime() - row.createdAt.getTime()).toBeGreaterThan(RESET_TOKEN_LIFETIME_MS - 5000);
    expect(RESET_TOKEN_LIFETIME_MS).toBe(60 * 60 * 1000);

    vi.useFakeTimers({ toFake: ["Date"] });
    vi.setSystemTime(row.expiresAt.getTime() + 1000);
    const late = await confirm(token, "too late password");
    expect(late.status).toBe(422);
    vi.useRealTimers();
    expect((await signIn("too late password")).status).toBe(401);
  });

  it("a token just before expiry still works", async () => {
    const token = await requestAndReadToken("quinn@example.test");
    const [row] = await db.select().from(passwordResets).where(eq(passwordResets.tokenHash, hashToken(token)));
    vi.useFakeTimers({ toFake: ["Date"] });
    vi.setSystemTime(row.expiresAt.getTime() - 1000);
    expect((await confirm(token, "just in time password")).status).toBe(200);
    vi.useRealTimers();
    expect((await signIn("just in time password")).status).toBe(200);
  });
});
