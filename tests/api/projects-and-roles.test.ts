import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { call, countRows, createAccount, makeRequest, sessionCookieFrom, setUpDatabase, type ErrorJson } from "./helpers";
import * as signUp from "@/app/api/auth/sign-up/route";
import * as signIn from "@/app/api/auth/sign-in/route";
import * as signOut from "@/app/api/auth/sign-out/route";
import * as sessionRoute from "@/app/api/auth/session/route";
import * as projectsRoute from "@/app/api/projects/route";
import * as projectRoute from "@/app/api/projects/[projectId]/route";
import * as memberRoute from "@/app/api/projects/[projectId]/members/[userId]/route";
import * as auditRoute from "@/app/api/projects/[projectId]/audit/route";
import * as adminSettings from "@/app/api/admin/settings/route";
import * as adminUser from "@/app/api/admin/users/[userId]/route";
import * as outboxRoute from "@/app/api/dev/outbox/route";
import { db } from "@/db/client";
import { auditEvents, memberships, projects, sessions, users } from "@/db/schema";

let first: { cookie: string; id: string };
let engineer: Awaited<ReturnType<typeof createAccount>>;
let reviewer: Awaited<ReturnType<typeof createAccount>>;
let stranger: Awaited<ReturnType<typeof createAccount>>;
let projectId: string;

beforeAll(async () => {
  await setUpDatabase();
  // The first account is created through the API and becomes site admin; sign-up does not sign in (issue 12).
  const response = await call(signUp.POST, makeRequest("POST", "/api/auth/sign-up", { body: { name: "First", email: "first@example.test", password: "first password" } }));
  expect(response.status).toBe(202);
  expect(sessionCookieFrom(response)).toBeNull();
  const signedIn = await call(signIn.POST, makeRequest("POST", "/api/auth/sign-in", { body: { email: "first@example.test", password: "first password" } }));
  const body = (await signedIn.json()) as { user: { id: string; isSiteAdmin: boolean } };
  expect(body.user.isSiteAdmin).toBe(true);
  first = { cookie: sessionCookieFrom(signedIn)!, id: body.user.id };
  engineer = await createAccount({ email: "eng@example.test" });
  reviewer = await createAccount({ email: "rev@example.test" });
  stranger = await createAccount({ email: "stranger@example.test" });
  const created = await call(projectsRoute.POST, makeRequest("POST", "/api/projects", { cookie: first.cookie, body: { name: "Osprey link", description: "L-band" } }));
  projectId = ((await created.json()) as { project: { id: string } }).project.id;
  await db.insert(memberships).values([
    { projectId, userId: engineer.user.id, role: "engineer" },
    { projectId, userId: reviewer.user.id, role: "reviewer" },
  ]);
});

const patch = (cookie: string, body: unknown) => call(projectRoute.PATCH, makeRequest("PATCH", `/api/projects/${projectId}`, { cookie, body }), { projectId });

describe("accounts", () => {
  it("later accounts are not site admins, and no response carries a password hash", async () => {
    const response = await call(signUp.POST, makeRequest("POST", "/api/auth/sign-up", { body: { name: "Second", email: "second@example.test", password: "second password" } }));
    expect(response.status).toBe(202);
    expect(await response.text()).not.toMatch(/argon2/i);
    const signedIn = await call(signIn.POST, makeRequest("POST", "/api/auth/sign-in", { body: { email: "second@example.test", password: "second password" } }));
    const text = await signedIn.text();
    expect(JSON.parse(text).user.isSiteAdmin).toBe(false);
    expect(text).not.toMatch(/argon2|password/i);
    const [row] = await db.select().from(users).where(eq(users.email, "second@example.test"));
    expect(row.passwordHash).toMatch(/^\$argon2id\$/);
  });

  it("a taken e-mail gets the same answer as a new one (202) and creates nothing", async () => {
    const before = await countRows(users);
    const response = await call(signUp.POST, makeRequest("POST", "/api/auth/sign-up", { body: { name: "Again", email: "FIRST@example.test", password: "whatever long" } }));
    expect(response.status).toBe(202);
    expect(await countRows(users)).toBe(before);
  });

  it("invitation-only sign-up refuses new accounts (403) until switched back by a site admin", async () => {
    const nonAdmin = await call(adminSettings.PATCH, makeRequest("PATCH", "/api/admin/settings", { cookie: engineer.cookie, body: { signupMode: "invite" } }));
    expect(nonAdmin.status).toBe(403);
    expect((await call(adminSettings.PATCH, makeRequest("PATCH", "/api/admin/settings", { cookie: first.cookie, body: { signupMode: "invite" } }))).status).toBe(200);
    const before = await countRows(users);
    const refused = await call(signUp.POST, makeRequest("POST", "/api/auth/sign-up", { body: { name: "Late", email: "late@example.test", password: "late password" } }));
    expect(refused.status).toBe(403);
    expect(await countRows(users)).toBe(before);
    expect((await call(adminSettings.PATCH, makeRequest("PATCH", "/api/admin/settings", { cookie: first.cookie, body: { signupMode: "open" } }))).status).toBe(200);
    expect((await call(signUp.POST, makeRequest("POST", "/api/auth/sign-up", { body: { name: "Late", email: "late@example.test", password: "late password" } }))).status).toBe(202);
    expect(await countRows(users)).toBe(before + 1);
  });

  it("the last site admin cannot be demoted (409)", async () => {
    const response = await call(adminUser.PATCH, makeRequest("PATCH", `/api/admin/users/${first.id}`, { cookie: first.cookie, body: { isSiteAdmin: false } }), { userId: first.id });
    expect(response.status).toBe(409);
  });

  it("the sessions table holds a hash, never the cookie token", async () => {
    const token = first.cookie.split("=")[1];
    const rows = await db.select().from(sessions);
    expect(rows.some((row) => row.id === token)).toBe(false);
    expect(rows.some((row) => /^[0-9a-f]{64}$/.test(row.id))).toBe(true);
  });
});

describe("project roles on the server", () => {
  it("lists each person's projects with their role", async () => {
    const response = await call(projectsRoute.GET, makeRequest("GET", "/api/projects", { cookie: reviewer.cookie }));
    const list = ((await response.json()) as { projects: { id: string; role: string }[] }).projects;
    expect(list).toEqual([expect.objectContaining({ id: projectId, role: "reviewer" })]);
    const none = await call(projectsRoute.GET, makeRequest("GET", "/api/projects", { cookie: stranger.cookie }));
    expect(((await none.json()) as { projects: unknown[] }).projects).toEqual([]);
  });

  it("a reviewer or engineer cannot rename (403); the owner can; a stranger gets 404", async () => {
    expect((await patch(reviewer.cookie, { name: "Hacked" })).status).toBe(403);
    expect((await patch(engineer.cookie, { name: "Hacked" })).status).toBe(403);
    const strangerResponse = await patch(stranger.cookie, { name: "Hacked" });
    expect(strangerResponse.status).toBe(404);
    expect(((await strangerResponse.json()) as ErrorJson).error.message).toBe("Project not found.");
    const [unchanged] = await db.select().from(projects).where(eq(projects.id, projectId));
    expect(unchanged.name).toBe("Osprey link");
    const ok = await patch(first.cookie, { name: "Osprey link B" });
    expect(ok.status).toBe(200);
    expect(((await ok.json()) as { project: { name: string } }).project.name).toBe("Osprey link B");
  });

  it("only owners read the audit log", async () => {
    expect((await call(auditRoute.GET, makeRequest("GET", `/api/projects/${projectId}/audit`, { cookie: engineer.cookie }), { projectId })).status).toBe(403);
    const response = await call(auditRoute.GET, makeRequest("GET", `/api/projects/${projectId}/audit`, { cookie: first.cookie }), { projectId });
    const events = ((await response.json()) as { events: { action: string; detail: Record<string, unknown> | null }[] }).events;
    expect(events[0]).toMatchObject({ action: "project.update", detail: { from: "Osprey link", to: "Osprey link B" } });
  });

  it("an engineer cannot change roles (403); the last owner cannot step down or leave (409)", async () => {
    const byEngineer = await call(memberRoute.PATCH, makeRequest("PATCH", `/api/projects/${projectId}/members/${reviewer.user.id}`, { cookie: engineer.cookie, body: { role: "owner" } }), {
      projectId,
      userId: reviewer.user.id,
    });
    expect(byEngineer.status).toBe(403);
    const auditBefore = await countRows(auditEvents);
    const stepDown = await call(memberRoute.PATCH, makeRequest("PATCH", `/api/projects/${projectId}/members/${first.id}`, { cookie: first.cookie, body: { role: "engineer" } }), { projectId, userId: first.id });
    expect(stepDown.status).toBe(409);
    const leave = await call(memberRoute.DELETE, makeRequest("DELETE", `/api/projects/${projectId}/members/${first.id}`, { cookie: first.cookie }), { projectId, userId: first.id });
    expect(leave.status).toBe(409);
    expect(await countRows(auditEvents)).toBe(auditBefore);

    // With a second owner, the first may step down.
    const promote = await call(memberRoute.PATCH, makeRequest("PATCH", `/api/projects/${projectId}/members/${engineer.user.id}`, { cookie: first.cookie, body: { role: "owner" } }), {
      projectId,
      userId: engineer.user.id,
    });
    expect(promote.status).toBe(200);
    const stepDownNow = await call(memberRoute.PATCH, makeRequest("PATCH", `/api/projects/${projectId}/members/${first.id}`, { cookie: first.cookie, body: { role: "engineer" } }), { projectId, userId: first.id });
    expect(stepDownNow.status).toBe(200);
    expect(await countRows(auditEvents)).toBe(auditBefore + 2);
  });

  it("a site admin without a membership cannot see the project (404)", async () => {
    await db.delete(memberships).where(eq(memberships.userId, first.id));
    expect((await call(projectRoute.GET, makeRequest("GET", `/api/projects/${projectId}`, { cookie: first.cookie }), { projectId })).status).toBe(404);
  });

  it("a reviewer cannot delete (403); the owner can, and the project and memberships are gone", async () => {
    expect((await call(projectRoute.DELETE, makeRequest("DELETE", `/api/projects/${projectId}`, { cookie: reviewer.cookie }), { projectId })).status).toBe(403);
    const response = await call(projectRoute.DELETE, makeRequest("DELETE", `/api/projects/${projectId}`, { cookie: engineer.cookie }), { projectId });
    expect(response.status).toBe(204);
    expect(await db.select().from(projects).where(eq(projects.id, projectId))).toEqual([]);
    expect(await db.select().from(memberships).where(eq(memberships.projectId, projectId))).toEqual([]);
    const [deleted] = await db.select().from(auditEvents).where(eq(auditEvents.action, "project.delete"));
    expect(deleted).toMatchObject({ target: "Osprey link B", projectId: null });
  });

  it("the outbox API is for site admins only", async () => {
    expect((await call(outboxRoute.GET, makeRequest("GET", "/api/dev/outbox", { cookie: reviewer.cookie }))).status).toBe(403);
    expect((await call(outboxRoute.GET, makeRequest("GET", "/api/dev/outbox", { cookie: first.cookie }))).status).toBe(200);
  });
});

describe("sign-out", () => {
  it("ends the session in the database and clears the cookie", async () => {
    expect((await call(sessionRoute.GET, makeRequest("GET", "/api/auth/session", { cookie: reviewer.cookie }))).status).toBe(200);
    const response = await call(signOut.POST, makeRequest("POST", "/api/auth/sign-out", { cookie: reviewer.cookie }));
    expect(response.status).toBe(204);
    expect(response.headers.getSetCookie()[0]).toMatch(/^portolan_session=;.*Max-Age=0/i);
    expect((await call(sessionRoute.GET, makeRequest("GET", "/api/auth/session", { cookie: reviewer.cookie }))).status).toBe(401);
  });
});
