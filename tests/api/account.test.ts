import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { call, createAccount, makeRequest, sessionCookieFrom, setUpDatabase, startMailCatcher, waitFor, type ErrorJson } from "./helpers";
import * as signUp from "@/app/api/auth/sign-up/route";
import * as signIn from "@/app/api/auth/sign-in/route";
import * as sessionRoute from "@/app/api/auth/session/route";
import * as passwordRoute from "@/app/api/account/password/route";
import * as profileRoute from "@/app/api/account/profile/route";
import * as sessionsRoute from "@/app/api/account/sessions/route";
import * as sessionHandleRoute from "@/app/api/account/sessions/[handle]/route";
import * as activeRoute from "@/app/api/admin/users/[userId]/active/route";
import * as userProjectsRoute from "@/app/api/admin/users/[userId]/projects/route";
import * as adminAuditRoute from "@/app/api/admin/audit/route";
import * as projectsRoute from "@/app/api/projects/route";
import { db } from "@/db/client";
import { auditEvents, outboxMessages, sessions, users } from "@/db/schema";
import * as emailRoute from "@/app/api/account/email/route";
import * as confirmEmailRoute from "@/app/api/auth/email-change/confirm/route";

// Issue 18 item 4: one's own account (password, name, sessions) and the site admin's account controls.
// Expected behaviour follows the issue text and common practice for account security (OWASP ASVS 4.0
// V2.1.5/V3.3: changing a password needs the current one and ends the other sessions; a disabled account
// has no live sessions).

let admin: { cookie: string; id: string };
let mail: Awaited<ReturnType<typeof startMailCatcher>>;

async function signInCookie(email: string, password: string): Promise<string> {
  const response = await call(signIn.POST, makeRequest("POST", "/api/auth/sign-in", { body: { email, password } }));
  expect(response.status).toBe(200);
  return sessionCookieFrom(response)!;
}

const whoAmI = async (cookie: string) => (await call(sessionRoute.GET, makeRequest("GET", "/api/auth/session", { cookie }))).status;

afterAll(async () => {
  await mail.close();
});

beforeAll(async () => {
  await setUpDatabase();
  mail = await startMailCatcher();
  await call(signUp.POST, makeRequest("POST", "/api/auth/sign-up", { body: { name: "Ada Admin", email: "admin@example.test", password: "admin password" } }));
  const response = await call(signIn.POST, makeRequest("POST", "/api/auth/sign-in", { body: { email: "admin@example.test", password: "admin password" } }));
  admin = { cookie: sessionCookieFrom(response)!, id: ((await response.json()) as { user: { id: string } }).user.id };
});

describe("own account", () => {
  it("changing the password needs the current one, ends the other sessions and keeps this one", async () => {
    const person = await createAccount({ email: "pat@example.test", password: "first long password" });
    const here = await signInCookie("pat@example.test", "first long password");
    const elsewhere = await signInCookie("pat@example.test", "first long password");

    const wrong = await call(passwordRoute.POST, makeRequest("POST", "/api/account/password", { cookie: here, body: { currentPassword: "not it at all", newPassword: "second long password" } }));
    expect(wrong.status).toBe(400);
    expect(((await wrong.json()) as ErrorJson).error.fields?.currentPassword).toBeDefined();
    const missing = await call(passwordRoute.POST, makeRequest("POST", "/api/account/password", { cookie: here, body: { newPassword: "second long password" } }));
    expect(missing.status).toBe(400);
    expect(((await missing.json()) as ErrorJson).error.fields?.currentPassword).toBeDefined();
    expect(await whoAmI(elsewhere)).toBe(200); // nothing changed by the refusals

    const ok = await call(passwordRoute.POST, makeRequest("POST", "/api/account/password", { cookie: here, body: { currentPassword: "first long password", newPassword: "second long password" } }));
    expect(ok.status).toBe(200);
    expect(((await ok.json()) as { endedSessions: number }).endedSessions).toBeGreaterThanOrEqual(2); // the other sign-in and createAccount's
    expect(await whoAmI(here)).toBe(200);
    expect(await whoAmI(elsewhere)).toBe(401);
    expect((await call(signIn.POST, makeRequest("POST", "/api/auth/sign-in", { body: { email: "pat@example.test", password: "first long password" } }))).status).toBe(401);
    await signInCookie("pat@example.test", "second long password");
    const events = await db.select().from(auditEvents).where(eq(auditEvents.actorId, person.user.id));
    expect(events.map((e) => e.action)).toContain("user.password_change");
  });

  it("renames the account, refusing an empty name and writing nothing", async () => {
    const person = await createAccount({ email: "quin@example.test" });
    const bad = await call(profileRoute.PATCH, makeRequest("PATCH", "/api/account/profile", { cookie: person.cookie, body: { name: "   " } }));
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as ErrorJson).error.fields?.name).toBeDefined();
    const ok = await call(profileRoute.PATCH, makeRequest("PATCH", "/api/account/profile", { cookie: person.cookie, body: { name: "Quinn Q." } }));
    expect(ok.status).toBe(200);
    const [row] = await db.select().from(users).where(eq(users.id, person.user.id));
    expect(row.name).toBe("Quinn Q.");
  });

  it("lists one's own sessions without ids or hashes, and revokes one by its handle", async () => {
    await createAccount({ email: "rae@example.test", password: "rae long password" });
    const here = await signInCookie("rae@example.test", "rae long password");
    const other = await signInCookie("rae@example.test", "rae long password");
    const listed = await call(sessionsRoute.GET, makeRequest("GET", "/api/account/sessions", { cookie: here }));
    const text = await listed.text();
    const stored = await db.select({ id: sessions.id }).from(sessions);
    for (const s of stored) expect(text).not.toContain(s.id);
    const { sessions: mine } = JSON.parse(text) as { sessions: { handle: string; current: boolean; createdAt: string | null }[] };
    expect(mine.filter((s) => s.current)).toHaveLength(1);
    expect(mine.length).toBeGreaterThanOrEqual(2);
    expect(mine.every((s) => s.createdAt !== null)).toBe(true);

    // someone else's handle is not found
    const adminList = (await (await call(sessionsRoute.GET, makeRequest("GET", "/api/account/sessions", { cookie: admin.cookie }))).json()) as { sessions: { handle: string }[] };
    const foreign = await call(sessionHandleRoute.DELETE, makeRequest("DELETE", `/api/account/sessions/${adminList.sessions[0].handle}`, { cookie: here }), { handle: adminList.sessions[0].handle });
    expect(foreign.status).toBe(404);
    expect(await whoAmI(admin.cookie)).toBe(200);

    const otherHandle = (await (await call(sessionsRoute.GET, makeRequest("GET", "/api/account/sessions", { cookie: other }))).json()) as { sessions: { handle: string; current: boolean }[] };
    const target = otherHandle.sessions.find((s) => s.current)!.handle;
    const revoked = await call(sessionHandleRoute.DELETE, makeRequest("DELETE", `/api/account/sessions/${target}`, { cookie: here }), { handle: target });
    expect(revoked.status).toBe(204);
    expect(await whoAmI(other)).toBe(401);
    expect(await whoAmI(here)).toBe(200);
  });
});

describe("site admin", () => {
  it("deactivating ends the account's sessions at once and refuses sign-in; reactivating allows it again", async () => {
    const person = await createAccount({ email: "sam@example.test", password: "sam long password" });
    const nonAdmin = await call(activeRoute.PUT, makeRequest("PUT", `/api/admin/users/${admin.id}/active`, { cookie: person.cookie, body: { active: false } }), { userId: admin.id });
    expect(nonAdmin.status).toBe(403);
    const badBody = await call(activeRoute.PUT, makeRequest("PUT", `/api/admin/users/${person.user.id}/active`, { cookie: admin.cookie, body: { active: "no" } }), { userId: person.user.id });
    expect(badBody.status).toBe(400);
    expect(((await badBody.json()) as ErrorJson).error.fields?.active).toBeDefined();
    expect(await whoAmI(person.cookie)).toBe(200);

    const off = await call(activeRoute.PUT, makeRequest("PUT", `/api/admin/users/${person.user.id}/active`, { cookie: admin.cookie, body: { active: false } }), { userId: person.user.id });
    expect(off.status).toBe(200);
    expect(await whoAmI(person.cookie)).toBe(401);
    const refused = await call(signIn.POST, makeRequest("POST", "/api/auth/sign-in", { body: { email: "sam@example.test", password: "sam long password" } }));
    expect(refused.status).toBe(403);
    expect(sessionCookieFrom(refused)).toBeNull();

    const on = await call(activeRoute.PUT, makeRequest("PUT", `/api/admin/users/${person.user.id}/active`, { cookie: admin.cookie, body: { active: true } }), { userId: person.user.id });
    expect(on.status).toBe(200);
    await signInCookie("sam@example.test", "sam long password");

    const self = await call(activeRoute.PUT, makeRequest("PUT", `/api/admin/users/${admin.id}/active`, { cookie: admin.cookie, body: { active: false } }), { userId: admin.id });
    expect(self.status).toBe(409);
  });

  it("sees a person's projects, and every admin action is in the admin audit log with names", async () => {
    const person = await createAccount({ email: "tia@example.test" });
    await call(projectsRoute.POST, makeRequest("POST", "/api/projects", { cookie: person.cookie, body: { name: "Tern uplink" } }));
    const listed = await call(userProjectsRoute.GET, makeRequest("GET", `/api/admin/users/${person.user.id}/projects`, { cookie: admin.cookie }), { userId: person.user.id });
    expect(listed.status).toBe(200);
    expect(((await listed.json()) as { projects: { name: string; role: string }[] }).projects).toEqual([expect.objectContaining({ name: "Tern uplink", role: "owner" })]);
    const forbidden = await call(userProjectsRoute.GET, makeRequest("GET", `/api/admin/users/${person.user.id}/projects`, { cookie: person.cookie }), { userId: person.user.id });
    expect(forbidden.status).toBe(403);

    await call(activeRoute.PUT, makeRequest("PUT", `/api/admin/users/${person.user.id}/active`, { cookie: admin.cookie, body: { active: false } }), { userId: person.user.id });
    const log = await call(adminAuditRoute.GET, makeRequest("GET", "/api/admin/audit?kind=user", { cookie: admin.cookie }));
    expect(log.status).toBe(200);
    const { events } = (await log.json()) as { events: { action: string; target: string; actorName: string }[] };
    expect(events[0]).toMatchObject({ action: "user.deactivate", target: "tia@example.test", actorName: "Ada Admin" });
    expect(events.every((e) => e.action.startsWith("user."))).toBe(true);
    // the person's own project is not in the admin log (project events stay in the project's log)
    expect(events.some((e) => e.target === "Tern uplink")).toBe(false);
    const plain = await createAccount({ email: "uma@example.test" });
    expect((await call(adminAuditRoute.GET, makeRequest("GET", "/api/admin/audit", { cookie: plain.cookie }))).status).toBe(403);
    const bad = await call(adminAuditRoute.GET, makeRequest("GET", "/api/admin/audit?page=0&from=2026-13-01", { cookie: admin.cookie }));
    expect(bad.status).toBe(400);
    expect(Object.keys(((await bad.json()) as ErrorJson).error.fields ?? {}).sort()).toEqual(["from", "page"]);
  });
});

describe("e-mail address change", () => {
  it("needs the current password, changes nothing until the link mailed to the new address is used, and the link works once", async () => {
    const person = await createAccount({ email: "vic@example.test", password: "vic long password" });
    const post = (body: unknown) => call(emailRoute.POST, makeRequest("POST", "/api/account/email", { cookie: person.cookie, body }));
    const wrong = await post({ newEmail: "victor@example.test", currentPassword: "nope nope nope" });
    expect(wrong.status).toBe(400);
    expect(((await wrong.json()) as ErrorJson).error.fields?.currentPassword).toBeDefined();
    const taken = await post({ newEmail: "admin@example.test", currentPassword: "vic long password" });
    expect(taken.status).toBe(409);
    const bad = await post({ newEmail: "not an address", currentPassword: "vic long password" });
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as ErrorJson).error.fields?.newEmail).toBeDefined();

    const ok = await post({ newEmail: "Victor@Example.test", currentPassword: "vic long password" });
    expect(ok.status).toBe(202);
    const [before] = await db.select().from(users).where(eq(users.id, person.user.id));
    expect(before.email).toBe("vic@example.test");
    const message = await waitFor(async () => (await db.select().from(outboxMessages)).find((m) => m.toAddress.includes("victor@example.test")) ?? null);
    const token = /\/confirm-email\/([A-Za-z0-9_-]+)/.exec(message.text ?? "")?.[1];
    expect(token).toBeDefined();

    const confirm = () => call(confirmEmailRoute.POST, makeRequest("POST", "/api/auth/email-change/confirm", { body: { token } }));
    const done = await confirm();
    expect(done.status).toBe(200);
    expect(((await done.json()) as { email: string }).email).toBe("victor@example.test");
    const [after] = await db.select().from(users).where(eq(users.id, person.user.id));
    expect(after.email).toBe("victor@example.test");
    expect((await confirm()).status).toBe(422);
    await signInCookie("victor@example.test", "vic long password");
    const events = await db.select().from(auditEvents).where(eq(auditEvents.action, "user.email_change"));
    expect(events[0].detail).toEqual({ from: "vic@example.test", to: "victor@example.test" });
  });
});
