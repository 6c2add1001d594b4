import { afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { call, createAccount, makeRequest, sessionCookieFrom, setUpDatabase, type ErrorJson } from "./helpers";
import { POST as signInRoute } from "@/app/api/auth/sign-in/route";
import { ACCOUNT_BASE_LOCK_MS, ACCOUNT_FAILURE_LIMIT, BASE_LOCK_MS, IP_FAILURE_LIMIT, PAIR_FAILURE_LIMIT, THROTTLE_WINDOW_MS } from "@/lib/server/auth/throttle";

// Policy under test (lib/server/auth/throttle.ts), behind one trusted proxy (TRUST_PROXY=1, so the client
// address is the last X-Forwarded-For entry, the one the proxy appended): 5 failures of one account from
// one client lock that pair for 60 s, doubling with each lock in a row; 20 failures from one address
// lock the address; 10 failures of one account from all clients hold back only clients that are failing.
// A fixed limit with exponential back-off is common practice (OWASP Authentication Cheat Sheet, "Account
// lockout"); keeping the lock away from clients that have not failed follows the same sheet's advice
// that lockouts must not let an attacker deny service to the real user.
process.env.TRUST_PROXY = "1";

const START = new Date("2026-03-02T09:00:00Z").getTime();
let now = START;

/** A request through the trusted proxy: whatever the client wrote, then the address the proxy saw. */
function signIn(email: string, password: string, ip = "203.0.113.7", extra: { clientWrote?: string; cookie?: string } = {}) {
  const forwarded = extra.clientWrote ? `${extra.clientWrote}, ${ip}` : ip;
  return call(signInRoute, makeRequest("POST", "/api/auth/sign-in", { body: { email, password }, cookie: extra.cookie, headers: { "x-forwarded-for": forwarded } }));
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

function startAt(offset: number) {
  vi.useFakeTimers({ toFake: ["Date"] });
  now = START + offset;
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

describe("sign-in throttle behind a trusted proxy", () => {
  it("locks an account+client pair after 5 failures and says how many seconds to wait", async () => {
    startAt(0);
    expect(PAIR_FAILURE_LIMIT).toBe(5);
    const statuses = await failTimes(PAIR_FAILURE_LIMIT, "ada@example.test", "198.51.100.1");
    expect(statuses.slice(0, 4)).toEqual([401, 401, 401, 401]);
    expect(statuses[4]).toBe(429);

    // Even the right password is refused from that client while the pair is locked...
    advance(15_000);
    const locked = await signIn("ada@example.test", "right password 1", "198.51.100.1");
    expect(locked.status).toBe(429);
    const body = (await locked.json()) as ErrorJson;
    expect(body.error.code).toBe("too_many_requests");
    expect(body.error.message).toBe(`Too many attempts. Try again in ${BASE_LOCK_MS / 1000 - 15} s.`);
    expect(locked.headers.get("retry-after")).toBe(String(BASE_LOCK_MS / 1000 - 15));
    expect(sessionCookieFrom(locked)).toBeNull();

    // ...but a client that has not been failing gets in with it.
    const other = await signIn("ada@example.test", "right password 1", "198.51.100.2");
    expect(other.status).toBe(200);

    // After the lock the right password works from the first client too, and success clears its count.
    advance(BASE_LOCK_MS);
    expect((await signIn("ada@example.test", "right password 1", "198.51.100.1")).status).toBe(200);
    expect(await failTimes(4, "ada@example.test", "198.51.100.1")).toEqual([401, 401, 401, 401]);
    expect((await signIn("ada@example.test", "right password 1", "198.51.100.1")).status).toBe(200);
  });

  it("doubles the pair lock when it is locked again soon after", async () => {
    startAt(10 * THROTTLE_WINDOW_MS);
    expect((await failTimes(5, "bob@example.test", "198.51.100.10"))[4]).toBe(429);
    advance(BASE_LOCK_MS + 1000);
    const second = await failTimes(5, "bob@example.test", "198.51.100.10");
    expect(second[4]).toBe(429);
    const body = (await (await signIn("bob@example.test", "right password 2", "198.51.100.10")).json()) as ErrorJson;
    expect(body.error.message).toBe(`Too many attempts. Try again in ${(2 * BASE_LOCK_MS) / 1000} s.`);
  });

  it("forgets failures older than the 15-minute window", async () => {
    startAt(40 * THROTTLE_WINDOW_MS);
    await createAccount({ email: "cy@example.test", password: "right password 3" });
    expect(await failTimes(4, "cy@example.test", "198.51.100.20")).toEqual([401, 401, 401, 401]);
    advance(THROTTLE_WINDOW_MS + 1000);
    expect(await failTimes(4, "cy@example.test", "198.51.100.20")).toEqual([401, 401, 401, 401]);
    expect((await signIn("cy@example.test", "right password 3", "198.51.100.20")).status).toBe(200);
  });

  it("locks a client address after 20 failures across many accounts, including unknown ones", async () => {
    startAt(80 * THROTTLE_WINDOW_MS);
    const ip = "192.0.2.99";
    const statuses: number[] = [];
    for (let i = 0; i < IP_FAILURE_LIMIT; i++) statuses.push((await signIn(`nobody${i}@example.test`, "guess", ip)).status);
    expect(statuses.slice(0, IP_FAILURE_LIMIT - 1).every((s) => s === 401)).toBe(true);
    expect(statuses[IP_FAILURE_LIMIT - 1]).toBe(429);
    await createAccount({ email: "dee@example.test", password: "right password 4" });
    const fromLocked = await signIn("dee@example.test", "right password 4", ip);
    expect(fromLocked.status).toBe(429);
    expect(((await fromLocked.json()) as ErrorJson).error.message).toMatch(/^Too many attempts\. Try again in \d+ s\.$/);
    expect((await signIn("dee@example.test", "right password 4", "192.0.2.100")).status).toBe(200);
  });

  it("30 failures with a rotating X-Forwarded-For written by the client: the proxy's entry counts, so the pair locks at 5", async () => {
    startAt(120 * THROTTLE_WINDOW_MS);
    await createAccount({ email: "eve-target@example.test", password: "right password 5" });
    const statuses: number[] = [];
    for (let i = 0; i < 30; i++) {
      statuses.push((await signIn("eve-target@example.test", `guess ${i}`, "192.0.2.200", { clientWrote: `10.0.${i}.${i}` })).status);
    }
    expect(statuses.slice(0, 4)).toEqual([401, 401, 401, 401]);
    expect(statuses.slice(4).every((s) => s === 429)).toBe(true);
    // The owner, from their own address, is not locked out by it.
    expect((await signIn("eve-target@example.test", "right password 5", "198.51.100.77")).status).toBe(200);
  });

  it("many addresses failing on one account hold back failing clients only, with a short capped lock", async () => {
    startAt(160 * THROTTLE_WINDOW_MS);
    await createAccount({ email: "fay@example.test", password: "right password 6" });
    expect(ACCOUNT_FAILURE_LIMIT).toBe(10);
    // Ten attackers, one failure each: the tenth failure locks the account for failing clients.
    const statuses: number[] = [];
    for (let i = 0; i < ACCOUNT_FAILURE_LIMIT; i++) statuses.push((await signIn("fay@example.test", "guess", `198.18.0.${i + 1}`)).status);
    expect(statuses.slice(0, ACCOUNT_FAILURE_LIMIT - 1).every((s) => s === 401)).toBe(true);
    expect(statuses[ACCOUNT_FAILURE_LIMIT - 1]).toBe(429);
    // An attacker that already failed is held back, even with the right password...
    const attacker = await signIn("fay@example.test", "right password 6", "198.18.0.3");
    expect(attacker.status).toBe(429);
    expect(((await attacker.json()) as ErrorJson).error.message).toBe(`Too many attempts. Try again in ${ACCOUNT_BASE_LOCK_MS / 1000} s.`);
    // ...while Fay, from an address that has not been failing, gets in.
    expect((await signIn("fay@example.test", "right password 6", "203.0.113.200")).status).toBe(200);
  });
});
