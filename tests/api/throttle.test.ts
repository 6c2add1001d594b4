import { afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { call, createAccount, makeRequest, sessionCookieFrom, setUpDatabase, type ErrorJson } from "./helpers";
import { POST as signInRoute } from "@/app/api/auth/sign-in/route";
import { ACCOUNT_FAILURE_LIMIT, BASE_LOCK_MS, IP_FAILURE_LIMIT, THROTTLE_WINDOW_MS } from "@/lib/server/auth/throttle";

// Policy under test (lib/server/auth/throttle.ts): 5 failures per account or 20 per client address within
// 15 minutes lock further attempts for 60 s, doubling with each lock in a row; success clears the count.
// A fixed limit with exponential back-off is common practice (OWASP Authentication Cheat Sheet, "Account lockout").

const START = new Date("2026-03-02T09:00:00Z").getTime();
let now = START;

function signIn(email: string, password: string, ip = "203.0.113.7") {
  return call(signInRoute, makeRequest("POST", "/api/auth/sign-in", { body: { email, password }, headers: { "x-forwarded-for": ip } }));
}

async function failTimes(n: number, email: string, ip?: string) {
  const statuses: number[] = [];
  for (let i = 0; i < n; i++) statuses.push((await signIn(email, "wrong password", ip)).status);
  return statuses;
}

function advance(ms: number) {
  now += ms;
  vi.setSystemTime(now);
}

beforeAll(async () => {
  await setUpDatabase();
  await createAccount({ email: "ada@example.test", password: "right password 1" });
  await createAccount({ email: "bob@example.test", password: "right password 2" });
});

afterEach(() => {
  vi.useRealTimers();
});

describe("sign-in throttle", () => {
  it("locks an account after 5 failures and says how many seconds to wait", async () => {
    vi.useFakeTimers({ toFake: ["Date"] });
    now = START;
    vi.setSystemTime(now);
    expect(ACCOUNT_FAILURE_LIMIT).toBe(5);
    const statuses = await failTimes(ACCOUNT_FAILURE_LIMIT, "ada@example.test", "198.51.100.1");
    expect(statuses.slice(0, 4)).toEqual([401, 401, 401, 401]);
    expect(statuses[4]).toBe(429);

    // Even the right password is refused while locked, with the remaining time in the message.
    advance(15_000);
    const locked = await signIn("ada@example.test", "right password 1", "198.51.100.2");
    expect(locked.status).toBe(429);
    const body = (await locked.json()) as ErrorJson;
    expect(body.error.code).toBe("too_many_requests");
    expect(body.error.message).toBe(`Too many attempts. Try again in ${BASE_LOCK_MS / 1000 - 15} s.`);
    expect(locked.headers.get("retry-after")).toBe(String(BASE_LOCK_MS / 1000 - 15));
    expect(sessionCookieFrom(locked)).toBeNull();

    // After the lock the right password works, and success clears the count.
    advance(BASE_LOCK_MS);
    const ok = await signIn("ada@example.test", "right password 1", "198.51.100.2");
    expect(ok.status).toBe(200);
    expect(sessionCookieFrom(ok)).not.toBeNull();
    expect(await failTimes(4, "ada@example.test", "198.51.100.3")).toEqual([401, 401, 401, 401]);
    expect((await signIn("ada@example.test", "right password 1", "198.51.100.3")).status).toBe(200);
  });

  it("doubles the lock when the account is locked again soon after", async () => {
    vi.useFakeTimers({ toFake: ["Date"] });
    now = START + 10 * THROTTLE_WINDOW_MS;
    vi.setSystemTime(now);
    expect((await failTimes(5, "bob@example.test", "198.51.100.10"))[4]).toBe(429);
    advance(BASE_LOCK_MS + 1000);
    const second = await failTimes(5, "bob@example.test", "198.51.100.11");
    expect(second[4]).toBe(429);
    const body = (await (await signIn("bob@example.test", "right password 2", "198.51.100.12")).json()) as ErrorJson;
    expect(body.error.message).toBe(`Too many attempts. Try again in ${(2 * BASE_LOCK_MS) / 1000} s.`);
  });

  it("forgets failures older than the 15-minute window", async () => {
    vi.useFakeTimers({ toFake: ["Date"] });
    now = START + 40 * THROTTLE_WINDOW_MS;
    vi.setSystemTime(now);
    await createAccount({ email: "cy@example.test", password: "right password 3" });
    expect(await failTimes(4, "cy@example.test", "198.51.100.20")).toEqual([401, 401, 401, 401]);
    advance(THROTTLE_WINDOW_MS + 1000);
    expect(await failTimes(4, "cy@example.test", "198.51.100.20")).toEqual([401, 401, 401, 401]);
    expect((await signIn("cy@example.test", "right password 3", "198.51.100.20")).status).toBe(200);
  });

  it("locks a client address after 20 failures across many accounts, including unknown ones", async () => {
    vi.useFakeTimers({ toFake: ["Date"] });
    now = START + 80 * THROTTLE_WINDOW_MS;
    vi.setSystemTime(now);
    const ip = "192.0.2.99";
    const statuses: number[] = [];
    for (let i = 0; i < IP_FAILURE_LIMIT; i++) statuses.push((await signIn(`nobody${i}@example.test`, "guess", ip)).status);
    expect(statuses.slice(0, IP_FAILURE_LIMIT - 1).every((s) => s === 401)).toBe(true);
    expect(statuses[IP_FAILURE_LIMIT - 1]).toBe(429);
    // A real account from that address is refused while the address is locked...
    await createAccount({ email: "dee@example.test", password: "right password 4" });
    const fromLocked = await signIn("dee@example.test", "right password 4", ip);
    expect(fromLocked.status).toBe(429);
    expect(((await fromLocked.json()) as ErrorJson).error.message).toMatch(/^Too many attempts\. Try again in \d+ s\.$/);
    // ...but works from another address.
    expect((await signIn("dee@example.test", "right password 4", "192.0.2.100")).status).toBe(200);
  });

  it("answers an unknown account and a wrong password with the same status and message", async () => {
    vi.useFakeTimers({ toFake: ["Date"] });
    now = START + 120 * THROTTLE_WINDOW_MS;
    vi.setSystemTime(now);
    const unknown = await signIn("ghost@example.test", "whatever", "192.0.2.150");
    const wrong = await signIn("ada@example.test", "whatever", "192.0.2.151");
    expect(unknown.status).toBe(401);
    expect(wrong.status).toBe(401);
    expect(await unknown.json()).toEqual(await wrong.json());
  });
});
