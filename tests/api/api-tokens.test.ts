import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { call, makeRequest, setUpDatabase, type ErrorJson } from "./helpers";
import * as tokensRoute from "@/app/api/account/tokens/route";
import * as tokenRoute from "@/app/api/account/tokens/[tokenId]/route";
import * as notificationsRoute from "@/app/api/account/notifications/route";
import * as sessionRoute from "@/app/api/auth/session/route";
import * as projectsRoute from "@/app/api/projects/route";
import * as projectRoute from "@/app/api/projects/[projectId]/route";
import * as scenariosRoute from "@/app/api/projects/[projectId]/scenarios/route";
import * as scenarioRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/route";
import * as runsRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/check-runs/route";
import * as adminUsersRoute from "@/app/api/admin/users/route";
import { db } from "@/db/client";
import { apiTokens, memberships, scenarios, users } from "@/db/schema";
import { DEMO_USERS, seedDemo } from "@/db/seed";
import { createSessionForUser } from "@/lib/server/auth/session";
import { hashToken } from "@/lib/server/auth/tokens";

// Personal API tokens (issue 12, item 9): shown once, stored as SHA-256, expiring, limited to chosen
// projects and to min(token ceiling, the owner's role there), read-only possible; never for account or
// token management. The permission table is the one in lib/base/permission-table.ts.

let demoProjectId: string;
let otherProjectId: string;
let scenarioId: string;
const cookies: Record<"owner" | "engineer" | "reviewer", string> = { owner: "", engineer: "", reviewer: "" };

const ISOLATION = { check: "isolation", inputs: { from: "TX", to: "RX", band: [2.4e9, 2.48e9], min_db: 30 } };

beforeAll(async () => {
  await setUpDatabase();
  demoProjectId = (await seedDemo()).projectId!;
  for (const demo of DEMO_USERS) {
    const [row] = await db.select({ id: users.id }).from(users).where(eq(users.email, demo.email));
    cookies[demo.role] = `portolan_session=${(await createSessionForUser(row.id)).token}`;
  }
  const [scenario] = await db.select().from(scenarios).where(eq(scenarios.projectId, demoProjectId));
  scenarioId = scenario.id;
  // A second project Olive owns, for the scope checks.
  const created = await call(projectsRoute.POST, makeRequest("POST", "/api/projects", { cookie: cookies.owner, body: { name: "Second project" } }));
  otherProjectId = ((await created.json()) as { project: { id: string } }).project.id;
});

async function createToken(cookie: string, body: Record<string, unknown>): Promise<{ status: number; token: string; id: string; json: unknown }> {
  const response = await call(tokensRoute.POST, makeRequest("POST", "/api/account/tokens", { cookie, body: { name: "CI", expiresInDays: 30, ...body } }));
  const json = (await response.json()) as { token: string; apiToken: { id: string } };
  return { status: response.status, token: json.token, id: json.apiToken?.id, json };
}

/** A request as a script sends it: the bearer token, no cookie, no Origin. */
function bearer(method: string, path: string, token: string, body?: unknown): Request {
  return makeRequest(method, path, { origin: null, body, headers: { authorization: `Bearer ${token}` } });
}

const scenarioPath = () => `/api/projects/${demoProjectId}/scenarios/${scenarioId}`;

describe("personal API tokens", () => {
  it("is shown once, stored only as its SHA-256, and listed without the secret", async () => {
    const created = await createToken(cookies.owner, { projectIds: [demoProjectId], roleCeiling: "read" });
    expect(created.status).toBe(201);
    expect(created.token).toMatch(/^ptl_[A-Za-z0-9_-]{43}$/);
    const [row] = await db.select().from(apiTokens).where(eq(apiTokens.id, created.id));
    expect(row.tokenHash).toBe(hashToken(created.token));
    expect(JSON.stringify(row)).not.toContain(created.token);
    const list = await call(tokensRoute.GET, makeRequest("GET", "/api/account/tokens", { cookie: cookies.owner }));
    const text = await list.text();
    expect(text).not.toContain(created.token);
    expect(text).not.toContain(row.tokenHash);
    expect(JSON.parse(text).tokens[0]).toMatchObject({ id: created.id, name: "CI", roleCeiling: "read", projects: [{ id: demoProjectId }] });
  });

  it("reads the latest revision of a scenario in its project with Authorization: Bearer", async () => {
    const { token } = await createToken(cookies.owner, { projectIds: [demoProjectId], roleCeiling: "read" });
    const response = await call(scenarioRoute.GET, bearer("GET", scenarioPath(), token), { projectId: demoProjectId, scenarioId });
    expect(response.status).toBe(200);
    const body = (await response.json()) as { revision: { content: { blocks: unknown[] } } };
    expect(Array.isArray(body.revision.content.blocks)).toBe(true);
  });

  it("reaches only the projects it names (404 elsewhere, as for a non-member)", async () => {
    const { token } = await createToken(cookies.owner, { projectIds: [demoProjectId], roleCeiling: "owner" });
    const other = await call(projectRoute.GET, bearer("GET", `/api/projects/${otherProjectId}`, token), { projectId: otherProjectId });
    expect(other.status).toBe(404);
    const otherScenarios = await call(scenariosRoute.GET, bearer("GET", `/api/projects/${otherProjectId}/scenarios`, token), { projectId: otherProjectId });
    expect(otherScenarios.status).toBe(404);
    // With a session, Olive does reach it: the token is what limits.
    expect((await call(projectRoute.GET, makeRequest("GET", `/api/projects/${otherProjectId}`, { cookie: cookies.owner }), { projectId: otherProjectId })).status).toBe(200);
  });

  it("cannot name projects its owner is not a member of", async () => {
    const created = await createToken(cookies.engineer, { projectIds: [otherProjectId], roleCeiling: "read" });
    expect(created.status).toBe(400);
    expect((created.json as ErrorJson).error.fields?.projectIds).toBeTypeOf("string");
  });

  it("a read-only token reads but does not run checks or edit (403)", async () => {
    const { token } = await createToken(cookies.owner, { projectIds: [demoProjectId], roleCeiling: "read" });
    const run = await call(runsRoute.POST, bearer("POST", `${scenarioPath()}/check-runs`, token, ISOLATION), { projectId: demoProjectId, scenarioId });
    expect(run.status).toBe(403);
    expect(((await run.json()) as ErrorJson).error.message).toMatch(/read-only/);
    const rename = await call(scenarioRoute.PATCH, bearer("PATCH", scenarioPath(), token, { name: "Renamed by token" }), { projectId: demoProjectId, scenarioId });
    expect(rename.status).toBe(403);
  });

  it("the effective role is the lower of the ceiling and the owner's role", async () => {
    // Olive (owner) with a reviewer ceiling: runs checks, may not rename.
    const capped = (await createToken(cookies.owner, { projectIds: [demoProjectId], roleCeiling: "reviewer" })).token;
    const run = await call(runsRoute.POST, bearer("POST", `${scenarioPath()}/check-runs`, capped, ISOLATION), { projectId: demoProjectId, scenarioId });
    expect(run.status).toBe(201);
    expect((await call(scenarioRoute.PATCH, bearer("PATCH", scenarioPath(), capped, { name: "Nope" }), { projectId: demoProjectId, scenarioId })).status).toBe(403);
    const project = await call(projectRoute.GET, bearer("GET", `/api/projects/${demoProjectId}`, capped), { projectId: demoProjectId });
    expect(((await project.json()) as { project: { role: string } }).project.role).toBe("reviewer");

    // Rhea (reviewer) with an owner ceiling is still a reviewer: may not rename the project.
    const rhea = (await createToken(cookies.reviewer, { projectIds: [demoProjectId], roleCeiling: "owner" })).token;
    const renameProject = await call(projectRoute.PATCH, bearer("PATCH", `/api/projects/${demoProjectId}`, rhea, { name: "Taken over" }), { projectId: demoProjectId });
    expect(renameProject.status).toBe(403);

    // Emil (engineer) with an engineer ceiling edits; his token stops at engineer even if he is made owner later.
    const emil = (await createToken(cookies.engineer, { projectIds: [demoProjectId], roleCeiling: "engineer" })).token;
    const created = await call(scenariosRoute.POST, bearer("POST", `/api/projects/${demoProjectId}/scenarios`, emil, { name: "From CI", template: "pad-chain" }), { projectId: demoProjectId });
    expect(created.status).toBe(201);
    const [emilRow] = await db.select().from(users).where(eq(users.email, "emil@portolan.example"));
    await db.update(memberships).set({ role: "owner" }).where(eq(memberships.userId, emilRow.id));
    try {
      expect((await call(projectRoute.PATCH, bearer("PATCH", `/api/projects/${demoProjectId}`, emil, { name: "Renamed" }), { projectId: demoProjectId })).status).toBe(403);
    } finally {
      await db.update(memberships).set({ role: "engineer" }).where(eq(memberships.userId, emilRow.id));
    }
  });

  it("stops working when it expires or is revoked (401)", async () => {
    const expiring = await createToken(cookies.owner, { projectIds: [demoProjectId], roleCeiling: "read" });
    await db.update(apiTokens).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(apiTokens.id, expiring.id));
    const expired = await call(scenarioRoute.GET, bearer("GET", scenarioPath(), expiring.token), { projectId: demoProjectId, scenarioId });
    expect(expired.status).toBe(401);

    const revoking = await createToken(cookies.owner, { projectIds: [demoProjectId], roleCeiling: "read" });
    expect((await call(scenarioRoute.GET, bearer("GET", scenarioPath(), revoking.token), { projectId: demoProjectId, scenarioId })).status).toBe(200);
    // Someone else cannot revoke it (404), its owner can (204).
    const foreign = await call(tokenRoute.DELETE, makeRequest("DELETE", `/api/account/tokens/${revoking.id}`, { cookie: cookies.engineer }), { tokenId: revoking.id });
    expect(foreign.status).toBe(404);
    const revoked = await call(tokenRoute.DELETE, makeRequest("DELETE", `/api/account/tokens/${revoking.id}`, { cookie: cookies.owner }), { tokenId: revoking.id });
    expect(revoked.status).toBe(204);
    expect((await call(scenarioRoute.GET, bearer("GET", scenarioPath(), revoking.token), { projectId: demoProjectId, scenarioId })).status).toBe(401);
    // A made-up token of the right shape is refused the same way.
    expect((await call(scenarioRoute.GET, bearer("GET", scenarioPath(), `ptl_${"A".repeat(43)}`), { projectId: demoProjectId, scenarioId })).status).toBe(401);
  });

  it("never works for token or account management, sign-in state, the project list or site administration (403)", async () => {
    const { token } = await createToken(cookies.owner, { projectIds: [demoProjectId], roleCeiling: "owner" });
    const before = await db.select().from(apiTokens);
    const refused = [
      await call(tokensRoute.GET, bearer("GET", "/api/account/tokens", token)),
      await call(tokensRoute.POST, bearer("POST", "/api/account/tokens", token, { name: "Escalate", expiresInDays: 365, projectIds: [demoProjectId, otherProjectId], roleCeiling: "owner" })),
      await call(tokenRoute.DELETE, bearer("DELETE", `/api/account/tokens/${before[0].id}`, token), { tokenId: before[0].id }),
      await call(notificationsRoute.PATCH, bearer("PATCH", "/api/account/notifications", token, { notifySignoff: false })),
      await call(sessionRoute.GET, bearer("GET", "/api/auth/session", token)),
      await call(projectsRoute.GET, bearer("GET", "/api/projects", token)),
      await call(adminUsersRoute.GET, bearer("GET", "/api/admin/users", token)),
    ];
    for (const response of refused) {
      expect(response.status).toBe(403);
      expect(((await response.json()) as ErrorJson).error.message).toMatch(/API tokens work only on the project API/);
    }
    expect(await db.select().from(apiTokens)).toEqual(before);
  });

  it("another Authorization scheme (a proxy's Basic login) is ignored: the session cookie still counts", async () => {
    const withBasic = makeRequest("GET", "/api/account/tokens", { cookie: cookies.owner, headers: { authorization: "Basic dXNlcjpwYXNz" } });
    expect((await call(tokensRoute.GET, withBasic)).status).toBe(200);
    const emptyBearer = makeRequest("GET", scenarioPath(), { origin: null, headers: { authorization: "Bearer " } });
    expect((await call(scenarioRoute.GET, emptyBearer, { projectId: demoProjectId, scenarioId })).status).toBe(401);
  });

  it("refuses bad input with the field named, and needs a session to create", async () => {
    const bad = await createToken(cookies.owner, { name: "bad\u202Ename", projectIds: [], roleCeiling: "admin", expiresInDays: 9999 });
    expect(bad.status).toBe(400);
    const fields = (bad.json as ErrorJson).error.fields ?? {};
    expect(Object.keys(fields).sort()).toEqual(["expiresInDays", "name", "projectIds", "roleCeiling"]);
    const anonymous = await call(tokensRoute.POST, makeRequest("POST", "/api/account/tokens", { body: { name: "x", expiresInDays: 1, projectIds: [demoProjectId], roleCeiling: "read" } }));
    expect(anonymous.status).toBe(401);
  });
});
