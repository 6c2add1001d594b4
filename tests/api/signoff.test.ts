// Sign-off end to end through the route handlers, with e-mail over SMTP to the fake server of lib/server/mail.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq, gt } from "drizzle-orm";
import { call, createAccount, makeRequest, setUpDatabase, startMailCatcher, waitFor, type ErrorJson } from "./helpers";
import * as projectsRoute from "@/app/api/projects/route";
import * as scenariosRoute from "@/app/api/projects/[projectId]/scenarios/route";
import * as revisionsRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/revisions/route";
import * as signoffsRoute from "@/app/api/projects/[projectId]/signoffs/route";
import * as decideRoute from "@/app/api/projects/[projectId]/signoffs/[signoffId]/decide/route";
import * as notificationsRoute from "@/app/api/account/notifications/route";
import { db } from "@/db/client";
import { auditEvents, checkRuns, memberships, outboxMessages, type OutboxMessage } from "@/db/schema";
import type { Scenario } from "@/engine/types";

type Account = Awaited<ReturnType<typeof createAccount>>;
let mail: Awaited<ReturnType<typeof startMailCatcher>>;
let owner: Account;
let engineer: Account;
let reviewer: Account;
let quietReviewer: Account;
let projectId: string;
let scenarioId: string;
let revisionId: string;

type SignoffJson = { id: string; state: string; stale: boolean; displayState: string; revisionNumber: number; comment: string; reviewer: { email: string } };
type MailJson = { sent: string[]; skipped: string[]; failed: string[] };

function pads(lossDb: number): Scenario {
  return {
    format: "portolan.scenario/1",
    name: "Receive chain",
    z0: 50,
    frequency: { start: 1e9, stop: 2e9, points: 3 },
    blocks: [
      { id: "PAD1", kind: "attenuator", params: { loss_db: lossDb } },
      { id: "PAD2", kind: "attenuator", params: { loss_db: 3 } },
    ],
    links: [["PAD1:2", "PAD2:1"]],
    ports: [
      { name: "IN", at: "PAD1:1" },
      { name: "OUT", at: "PAD2:2" },
    ],
  };
}

const base = () => `/api/projects/${projectId}/signoffs`;

async function request(cookie: string, body: unknown): Promise<Response> {
  return call(signoffsRoute.POST, makeRequest("POST", base(), { cookie, body }), { projectId });
}

async function decide(cookie: string, signoffId: string, body: unknown): Promise<Response> {
  return call(decideRoute.POST, makeRequest("POST", `${base()}/${signoffId}/decide`, { cookie, body }), { projectId, signoffId });
}

async function list(cookie: string, query = ""): Promise<SignoffJson[]> {
  const response = await call(signoffsRoute.GET, makeRequest("GET", `${base()}${query}`, { cookie }), { projectId });
  expect(response.status).toBe(200);
  return ((await response.json()) as { signoffs: SignoffJson[] }).signoffs;
}

/** The next message to `to` received by the fake SMTP server after `since`. */
async function mailTo(to: string, since: Date): Promise<OutboxMessage> {
  return waitFor(async () => {
    const rows = await db.select().from(outboxMessages).where(gt(outboxMessages.receivedAt, since));
    return rows.find((m) => m.toAddress.includes(to)) ?? null;
  });
}

async function messagesTo(to: string, since: Date): Promise<OutboxMessage[]> {
  const rows = await db.select().from(outboxMessages).where(gt(outboxMessages.receivedAt, since));
  return rows.filter((m) => m.toAddress.includes(to));
}

beforeAll(async () => {
  await setUpDatabase();
  mail = await startMailCatcher();
  owner = await createAccount({ email: "olga@example.test", name: "Olga Owner" });
  engineer = await createAccount({ email: "ezra@example.test", name: "Ezra Engineer" });
  reviewer = await createAccount({ email: "rita@example.test", name: "Rita Reviewer" });
  quietReviewer = await createAccount({ email: "quinn@example.test", name: "Quinn Reviewer" });
  const created = await call(projectsRoute.POST, makeRequest("POST", "/api/projects", { cookie: owner.cookie, body: { name: "Kestrel" } }));
  projectId = ((await created.json()) as { project: { id: string } }).project.id;
  await db.insert(memberships).values([
    { projectId, userId: engineer.user.id, role: "engineer" },
    { projectId, userId: reviewer.user.id, role: "reviewer" },
    { projectId, userId: quietReviewer.user.id, role: "reviewer" },
  ]);
  const scenario = await call(scenariosRoute.POST, makeRequest("POST", `/api/projects/${projectId}/scenarios`, { cookie: engineer.cookie, body: { name: "Receive chain", scenario: pads(3) } }), { projectId });
  const body = (await scenario.json()) as { scenario: { id: string }; revision: { id: string } };
  scenarioId = body.scenario.id;
  revisionId = body.revision.id;
  // Quinn turns sign-off e-mails off in the account settings
  const off = await call(notificationsRoute.PATCH, makeRequest("PATCH", "/api/account/notifications", { cookie: quietReviewer.cookie, body: { notifySignoff: false } }));
  expect(off.status).toBe(200);
  expect(await off.json()).toEqual({ notifySignoff: false });
});

afterAll(async () => {
  await mail.close();
});

describe("sign-off from request to decision", () => {
  let ritaSignoff: string;
  let quinnSignoff: string;

  it("an engineer asks two reviewers; the one with e-mails on gets a message over SMTP with a link to the scenario", async () => {
    const since = new Date(Date.now() - 1);
    const response = await request(engineer.cookie, { scenarioId, reviewerIds: [reviewer.user.id, quietReviewer.user.id], note: "Ready for the gate review" });
    expect(response.status).toBe(201);
    const body = (await response.json()) as { signoffs: SignoffJson[]; mail: MailJson };
    expect(body.mail).toEqual({ sent: ["rita@example.test"], skipped: ["quinn@example.test"], failed: [] });
    expect(body.signoffs.map((s) => [s.reviewer.email, s.state, s.stale, s.revisionNumber])).toEqual([
      ["rita@example.test", "requested", false, 1],
      ["quinn@example.test", "requested", false, 1],
    ]);
    ritaSignoff = body.signoffs[0].id;
    quinnSignoff = body.signoffs[1].id;
    const message = await mailTo("rita@example.test", since);
    expect(message.subject).toBe("Sign-off requested: Receive chain, revision 1 (Kestrel)");
    expect(message.raw).toMatch(/^Content-Type: multipart\/alternative/m);
    expect(message.text).toContain(`http://localhost:3000/projects/${projectId}/scenarios/${scenarioId}`);
    expect(message.text).toContain("Note: Ready for the gate review");
    expect(await messagesTo("quinn@example.test", since)).toEqual([]);
  });

  it("only reviewers and owners can be asked, and the same open request is not made twice", async () => {
    const engineerAsked = await request(owner.cookie, { scenarioId, reviewerIds: [engineer.user.id] });
    expect(engineerAsked.status).toBe(422);
    expect(((await engineerAsked.json()) as ErrorJson).error.message).toBe("Ezra Engineer is an engineer; only reviewers and owners can sign off.");
    const again = await request(engineer.cookie, { scenarioId, reviewerIds: [reviewer.user.id] });
    expect(again.status).toBe(409);
  });

  it("a reviewer cannot request sign-off, and cannot edit the scenario (403)", async () => {
    expect((await request(reviewer.cookie, { scenarioId, reviewerIds: [owner.user.id] })).status).toBe(403);
    const save = await call(revisionsRoute.POST, makeRequest("POST", `/api/projects/${projectId}/scenarios/${scenarioId}/revisions`, { cookie: reviewer.cookie, body: { baseRevisionId: revisionId, scenario: pads(4) } }), { projectId, scenarioId });
    expect(save.status).toBe(403);
  });

  it("an engineer cannot approve (403), nor can another reviewer decide someone else's request", async () => {
    const byEngineer = await decide(engineer.cookie, ritaSignoff, { decision: "approved", comment: "looks fine to me" });
    expect(byEngineer.status).toBe(403);
    expect(((await byEngineer.json()) as ErrorJson).error.message).toBe("Your role (engineer) does not allow this (signoff.decide).");
    const byQuinn = await decide(quietReviewer.cookie, ritaSignoff, { decision: "approved", comment: "" });
    expect(byQuinn.status).toBe(403);
    expect((await list(owner.cookie)).find((s) => s.id === ritaSignoff)?.state).toBe("requested");
  });

  it("the reviewer approves with a comment and the requester is e-mailed", async () => {
    const since = new Date(Date.now() - 1);
    const response = await decide(reviewer.cookie, ritaSignoff, { decision: "approved", comment: "Isolation margins checked against the bundle." });
    expect(response.status).toBe(200);
    const body = (await response.json()) as { signoff: SignoffJson; mail: MailJson };
    expect(body.signoff).toMatchObject({ state: "approved", stale: false, displayState: "approved", comment: "Isolation margins checked against the bundle." });
    expect(body.mail.sent).toEqual(["ezra@example.test"]);
    const message = await mailTo("ezra@example.test", since);
    expect(message.subject).toBe("Approved: Receive chain, revision 1 (Kestrel)");
    expect(message.text).toContain("Rita Reviewer approved");
    expect(message.text).toContain("Comment: Isolation margins checked against the bundle.");
    expect(message.text).toContain(`http://localhost:3000/projects/${projectId}/scenarios/${scenarioId}`);
    expect((await decide(reviewer.cookie, ritaSignoff, { decision: "changes_requested", comment: "changed my mind" })).status).toBe(409);
  });

  it("a later edit marks the sign-offs of the old content stale, and a stale request can no longer be decided", async () => {
    const save = await call(revisionsRoute.POST, makeRequest("POST", `/api/projects/${projectId}/scenarios/${scenarioId}/revisions`, { cookie: engineer.cookie, body: { baseRevisionId: revisionId, scenario: pads(6) } }), { projectId, scenarioId });
    expect(save.status).toBe(201);
    const signoffs = await list(owner.cookie, `?scenarioId=${scenarioId}`);
    expect(signoffs.find((s) => s.id === ritaSignoff)).toMatchObject({ state: "approved", stale: true, displayState: "stale" });
    expect(signoffs.find((s) => s.id === quinnSignoff)).toMatchObject({ state: "requested", stale: true });
    const late = await decide(quietReviewer.cookie, quinnSignoff, { decision: "approved", comment: "" });
    expect(late.status).toBe(409);
    expect(((await late.json()) as ErrorJson).error.message).toMatch(/stale/);
  });

  it("changes requested on the new revision reach the requester, unless they turned sign-off e-mails off", async () => {
    const asked = await request(engineer.cookie, { scenarioId, reviewerIds: [reviewer.user.id] });
    const signoff = ((await asked.json()) as { signoffs: SignoffJson[] }).signoffs[0];
    expect(signoff.revisionNumber).toBe(2);
    let since = new Date(Date.now() - 1);
    const decided = await decide(reviewer.cookie, signoff.id, { decision: "changes_requested", comment: "PAD1 at 6 dB eats the link budget." });
    expect(((await decided.json()) as { signoff: SignoffJson }).signoff.displayState).toBe("changes_requested");
    const message = await mailTo("ezra@example.test", since);
    expect(message.subject).toBe("Changes requested: Receive chain, revision 2 (Kestrel)");
    expect(message.text).toContain("Comment: PAD1 at 6 dB eats the link budget.");

    const off = await call(notificationsRoute.PATCH, makeRequest("PATCH", "/api/account/notifications", { cookie: engineer.cookie, body: { notifySignoff: false } }));
    expect(off.status).toBe(200);
    const current = await call(notificationsRoute.GET, makeRequest("GET", "/api/account/notifications", { cookie: engineer.cookie }));
    expect(await current.json()).toEqual({ notifySignoff: false });
    const again = await request(engineer.cookie, { scenarioId, reviewerIds: [owner.user.id] });
    const ownerSignoff = ((await again.json()) as { signoffs: SignoffJson[] }).signoffs[0];
    since = new Date(Date.now() - 1);
    const approved = await decide(owner.cookie, ownerSignoff.id, { decision: "approved", comment: "" });
    expect(((await approved.json()) as { mail: MailJson }).mail).toEqual({ sent: [], skipped: ["ezra@example.test"], failed: [] });
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(await messagesTo("ezra@example.test", since)).toEqual([]);
  });

  it("every step is in the audit log", async () => {
    const events = await db.select().from(auditEvents).where(eq(auditEvents.projectId, projectId));
    const actions = events.map((e) => e.action);
    expect(actions.filter((a) => a === "signoff.request")).toHaveLength(4);
    expect(actions.filter((a) => a === "signoff.approve")).toHaveLength(2);
    expect(actions.filter((a) => a === "signoff.request_changes")).toHaveLength(1);
    const settings = await db.select().from(auditEvents).where(and(eq(auditEvents.action, "account.notifications"), eq(auditEvents.actorEmail, "ezra@example.test")));
    expect(settings[0].detail).toEqual({ notifySignoff: false });
  });

  it("bad input names the field", async () => {
    const empty = await request(engineer.cookie, { scenarioId, reviewerIds: [] });
    expect(empty.status).toBe(400);
    expect(((await empty.json()) as ErrorJson).error.fields?.reviewerIds).toBe("Choose at least one reviewer.");
    const badDecision = await decide(reviewer.cookie, "x", { decision: "maybe" });
    expect(badDecision.status).toBe(400);
    const stranger = await createAccount({ email: "stranger@example.test" });
    expect((await call(signoffsRoute.GET, makeRequest("GET", base(), { cookie: stranger.cookie }), { projectId })).status).toBe(404);
  });
});

describe("the verdicts a request was made on (issue 18)", () => {
  it("a request stores the latest run of each check on that revision, and later runs do not change it", async () => {
    // a fresh revision, so no reviewer has an open request for this content
    const latest = (await (await call(revisionsRoute.GET, makeRequest("GET", `/api/projects/${projectId}/scenarios/${scenarioId}/revisions`, { cookie: engineer.cookie }), { projectId, scenarioId })).json()) as { revisions: { id: string }[] };
    const saved = await call(
      revisionsRoute.POST,
      makeRequest("POST", `/api/projects/${projectId}/scenarios/${scenarioId}/revisions`, { cookie: engineer.cookie, body: { baseRevisionId: latest.revisions[0].id, scenario: pads(4.5) } }),
      { projectId, scenarioId },
    );
    expect(saved.status).toBe(201);
    const rev = ((await saved.json()) as { revision: { id: string } }).revision.id;
    // two isolation runs (the later one counts) and one match run, as the check-runs route stores them
    const at = (s: number) => new Date(Date.UTC(2026, 11, 4, 3, 0, s));
    await db.insert(checkRuns).values([
      { id: "run-iso-1", scenarioId, revisionId: rev, userId: engineer.user.id, check: "isolation", verdict: "fail", figures: { headline: "old", result: null } as never, createdAt: at(1) },
      { id: "run-iso-2", scenarioId, revisionId: rev, userId: engineer.user.id, check: "isolation", verdict: "pass", figures: { headline: "isolation 41.2 dB ≥ 30 dB", result: null } as never, createdAt: at(2) },
      { id: "run-match", scenarioId, revisionId: rev, userId: owner.user.id, check: "match", verdict: "warn", figures: { headline: "return loss 9.8 dB", result: null } as never, createdAt: at(3) },
    ]);
    const response = await request(engineer.cookie, { scenarioId, reviewerIds: [reviewer.user.id] });
    expect(response.status).toBe(201);
    const [created] = ((await response.json()) as { signoffs: { verdictSnapshot: { check: string; verdict: string; headline: string; runBy: string | null }[] }[] }).signoffs;
    expect(created.verdictSnapshot).toEqual([
      { check: "match", verdict: "warn", headline: "return loss 9.8 dB", runAt: at(3).toISOString(), runBy: owner.user.name },
      { check: "isolation", verdict: "pass", headline: "isolation 41.2 dB ≥ 30 dB", runAt: at(2).toISOString(), runBy: engineer.user.name },
    ]);
    await db.insert(checkRuns).values({ id: "run-iso-3", scenarioId, revisionId: rev, userId: engineer.user.id, check: "isolation", verdict: "fail", figures: { headline: "later", result: null } as never, createdAt: at(9) });
    const again = (await list(engineer.cookie)) as unknown as { revisionNumber: number; verdictSnapshot: { headline: string }[] | null }[];
    const snapshot = again.find((s) => s.verdictSnapshot && s.verdictSnapshot.length === 2)!.verdictSnapshot!;
    expect(snapshot.map((e) => e.headline)).toEqual(["return loss 9.8 dB", "isolation 41.2 dB ≥ 30 dB"]);
  });
});
