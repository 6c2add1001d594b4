import { afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { call, createAccount, makeRequest, setUpDatabase } from "./helpers";
import { POST as signInRoute } from "@/app/api/auth/sign-in/route";
import { ACCOUNT_BASE_LOCK_MS, ACCOUNT_MAX_LOCK_MS, PAIR_FAILURE_LIMIT } from "@/lib/server/auth/throttle";

// Without TRUST_PROXY (the default: the app faces clients directly) X-Forwarded-For is whatever the client
// wrote, so it is ignored: rotating it gains nothing. Clients are told apart only by the device cookie a
// browser gets when it signs in (OWASP Authentication Cheat Sheet, "device cookies"), so the account's
// owner, on a browser that signed in before, is not locked out by a stranger's failures.

function signIn(email: string, password: string, forwardedFor: string, cookie?: string) {
  return call(signInRoute, makeRequest("POST", "/api/auth/sign-in", { body: { email, password }, cookie, headers: { "x-forwarded-for": forwardedFor } }));
}

function deviceCookieFrom(response: Response): string | null {
  for (const header of response.headers.getSetCookie()) {
    const pair = header.split(";")[0];
    if (pair.startsWith("portolan_device=")) return pair;
  }
  return null;
}

beforeAll(async () => {
  delete process.env.TRUST_PROXY;
  await setUpDatabase();
  await createAccount({ email: "gil@example.test", password: "gil's right password" });
  await createAccount({ email: "hal@example.test", password: "hal's right password" });
});

afterEach(() => {
  vi.useRealTimers();
});

describe("sign-in throttle without a trusted proxy", () => {
  it("30 failures with rotating X-Forwarded-For: locked after 5; the owner's signed-in browser still gets in", async () => {
    vi.useFakeTimers({ toFake: ["Date"] });
    vi.setSystemTime(new Date("2026-03-02T09:00:00Z"));
    // The owner signed in once before on this browser and kept its device cookie.
    const earlier = await signIn("gil@example.test", "gil's right password", "192.0.2.1");
    expect(earlier.status).toBe(200);
    const device = deviceCookieFrom(earlier);
    expect(device).toMatch(/^portolan_device=[A-Za-z0-9_-]+\.[A-Za-z0-9_-]{43}$/);
    // Another person's browser, for the check that a device cookie is bound to its account.
    const hal = await signIn("hal@example.test", "hal's right password", "192.0.2.3");
    expect(hal.status).toBe(200);
    const halDevice = deviceCookieFrom(hal)!;

    const statuses: number[] = [];
    for (let i = 0; i < 30; i++) statuses.push((await signIn("gil@example.test", `guess ${i}`, `10.${i}.0.1`)).status);
    expect(statuses.slice(0, PAIR_FAILURE_LIMIT - 1).every((s) => s === 401)).toBe(true);
    expect(statuses.slice(PAIR_FAILURE_LIMIT - 1).every((s) => s === 429)).toBe(true);

    // A stranger without the cookie is refused even with the right password (they cannot be told apart),
    // but only for the account's short, capped lock: 30 s, doubling per lock in a row, at most 5 min.
    const stranger = await signIn("gil@example.test", "gil's right password", "10.99.0.1");
    expect(stranger.status).toBe(429);
    expect(Number(stranger.headers.get("retry-after")) * 1000).toBeLessThanOrEqual(ACCOUNT_MAX_LOCK_MS);
    expect(ACCOUNT_BASE_LOCK_MS).toBe(30_000);
    // ...and a forged device cookie is no better...
    expect((await signIn("gil@example.test", "gil's right password", "10.99.0.1", "portolan_device=AAAAAAAAAAAAAAAAAAAAAA.AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA")).status).toBe(429);
    // ...nor is the device cookie of another account...
    expect((await signIn("gil@example.test", "gil's right password", "10.99.0.1", halDevice)).status).toBe(429);
    // ...but the owner's browser signs in.
    expect((await signIn("gil@example.test", "gil's right password", "10.99.0.1", device!)).status).toBe(200);
    // And half a minute later a new browser does too: the shared lock was short.
    vi.setSystemTime(new Date(Date.now() + ACCOUNT_BASE_LOCK_MS + 1000));
    expect((await signIn("gil@example.test", "gil's right password", "10.99.0.2")).status).toBe(200);
  });
});
