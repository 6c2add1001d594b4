import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { call, countRows, createAccount, makeRequest, sessionCookieFrom, setUpDatabase, startMailCatcher, waitFor, type ErrorJson } from "./helpers";
import { POST as createProjectRoute } from "@/app/api/projects/route";
import { POST as inviteRoute } from "@/app/api/projects/[projectId]/invitations/route";
import { GET as membersRoute } from "@/app/api/projects/[projectId]/members/route";
import { POST as acceptRoute } from "@/app/api/invitations/accept/route";
import { GET as auditRoute } from "@/app/api/projects/[projectId]/audit/route";
import { GET as sessionRoute } from "@/app/api/auth/session/route";
import { db } from "@/db/client";
import { invitations, memberships, outboxMessages } from "@/db/schema";

let mail: Awaited<ReturnType<typeof startMailCatcher>>;
let owner: Awaited<ReturnType<typeof createAccount>>;
let projectId: string;

beforeAll(async () => {
  await setUpDatabase();
  mail = await startMailCatcher();
  owner = await createAccount({ email: "olga@example.test", name: "Olga" });
  const response = await call(createProjectRoute, makeRequest("POST", "/api/projects", { cookie: owner.cookie, body: { name: "Heron radar", description: "S-band" } }));
  expect(response.status).toBe(201);
  projectId = ((await response.json()) as { project: { id: string } }).project.id;
});

afterAll(async () => {
  await mail.close();
});

/** Invite, then read the link out of the message the fake SMTP server received. */
async function inviteAndReadLink(email: string, role: string): Promise<string> {
  const before = await countRows(outboxMessages);
  const response = await call(inviteRoute, makeRequest("POST", `/api/projects/${projectId}/invitations`, { cookie: owner.cookie, body: { email, role } }), { projectId });
  expect(response.status).toBe(201);
  expect(((await response.json()) as { invitation: { emailSent: boolean } }).invitation.emailSent).toBe(true);
  const message = await waitFor(async () => {
    const rows = await db.select().from(outboxMessages);
    return rows.length > before ? rows[rows.length - 1] : null;
  });
  expect(message.toAddress).toContain(email);
  expect(message.subject).toBe("Olga invited you to Heron radar on Portolan");
  // The message really went over SMTP: the raw source has MIME headers written by the mailer.
  expect(message.raw).toMatch(/^Content-Type: multipart\/alternative/m);
  const match = /(http:\/\/localhost:3000\/invite\/([A-Za-z0-9_-]+))/.exec(message.text ?? "");
  expect(match).not.toBeNull();
  // The HTML part carries the same link.
  expect(message.html).toContain(match![1]);
  return match![1];
}

function tokenOf(link: string): string {
  return new URL(link).pathname.split("/").pop()!;
}

describe("invitations", () => {
  it("a new person follows the e-mailed link, creates an account and becomes a member with the invited role", async () => {
    const link = await inviteAndReadLink("nell@example.test", "engineer");
    const token = tokenOf(link);
    // Only the hash is stored.
    expect((await db.select().from(invitations)).some((row) => row.tokenHash === token)).toBe(false);

    const accept = await call(acceptRoute, makeRequest("POST", "/api/invitations/accept", { body: { token, name: "Nell", password: "nell's password" } }));
    expect(accept.status).toBe(200);
    const accepted = (await accept.json()) as { projectId: string; role: string; user: { id: string; email: string } };
    expect(accepted).toMatchObject({ projectId, role: "engineer", user: { email: "nell@example.test" } });

    const cookie = sessionCookieFrom(accept);
    expect(cookie).not.toBeNull();
    const me = await call(sessionRoute, makeRequest("GET", "/api/auth/session", { cookie }));
    expect(((await me.json()) as { user: { email: string; isSiteAdmin: boolean } }).user).toMatchObject({ email: "nell@example.test", isSiteAdmin: false });

    const members = await call(membersRoute, makeRequest("GET", `/api/projects/${projectId}/members`, { cookie }), { projectId });
    const list = ((await members.json()) as { members: { email: string; role: string }[] }).members;
    expect(list.map((m) => [m.email, m.role]).sort()).toEqual([
      ["nell@example.test", "engineer"],
      ["olga@example.test", "owner"],
    ]);

    // The link works once.
    const again = await call(acceptRoute, makeRequest("POST", "/api/invitations/accept", { body: { token, name: "Eve", password: "eve's password" } }));
    expect(again.status).toBe(422);

    // Owners see the acceptance in the audit log.
    const audit = await call(auditRoute, makeRequest("GET", `/api/projects/${projectId}/audit`, { cookie: owner.cookie }), { projectId });
    const actions = ((await audit.json()) as { events: { action: string }[] }).events.map((e) => e.action);
    expect(actions).toEqual(expect.arrayContaining(["project.create", "invitation.create", "invitation.accept"]));
  });

  it("a signed-in person with an account links it by accepting", async () => {
    const pat = await createAccount({ email: "pat@example.test", name: "Pat" });
    const token = tokenOf(await inviteAndReadLink("pat@example.test", "reviewer"));
    // Without signing in, an existing account is asked to sign in first.
    const anonymous = await call(acceptRoute, makeRequest("POST", "/api/invitations/accept", { body: { token, name: "Mallory", password: "taking over" } }));
    expect(anonymous.status).toBe(401);
    expect(((await anonymous.json()) as ErrorJson).error.message).toBe("Sign in as pat@example.test to accept this invitation.");

    const accept = await call(acceptRoute, makeRequest("POST", "/api/invitations/accept", { cookie: pat.cookie, body: { token } }));
    expect(accept.status).toBe(200);
    const [membership] = await db
      .select()
      .from(memberships)
      .where(and(eq(memberships.projectId, projectId), eq(memberships.userId, pat.user.id)));
    expect(membership.role).toBe("reviewer");
  });

  it("an engineer cannot invite (403), and the invitation is not written", async () => {
    const ed = await createAccount({ email: "ed@example.test", name: "Ed" });
    const engineerCookie = ed.cookie;
    await db.insert(memberships).values({ projectId, userId: ed.user.id, role: "engineer" });
    const before = await countRows(invitations);
    const response = await call(inviteRoute, makeRequest("POST", `/api/projects/${projectId}/invitations`, { cookie: engineerCookie, body: { email: "x@example.test", role: "owner" } }), { projectId });
    expect(response.status).toBe(403);
    expect(await countRows(invitations)).toBe(before);
  });

  it("an expired invitation cannot be accepted", async () => {
    const token = tokenOf(await inviteAndReadLink("late@example.test", "reviewer"));
    await db.update(invitations).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(invitations.email, "late@example.test"));
    const before = await countRows(memberships);
    const response = await call(acceptRoute, makeRequest("POST", "/api/invitations/accept", { body: { token, name: "Late", password: "late password" } }));
    expect(response.status).toBe(422);
    expect(await countRows(memberships)).toBe(before);
  });
});
