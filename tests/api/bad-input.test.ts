import { beforeAll, describe, expect, it } from "vitest";
import { call, countRows, createAccount, makeRequest, setUpDatabase, type ErrorJson } from "./helpers";
import * as signUp from "@/app/api/auth/sign-up/route";
import * as signIn from "@/app/api/auth/sign-in/route";
import * as signOut from "@/app/api/auth/sign-out/route";
import * as resetRequest from "@/app/api/auth/password-reset/route";
import * as resetConfirm from "@/app/api/auth/password-reset/confirm/route";
import * as projectsRoute from "@/app/api/projects/route";
import * as projectRoute from "@/app/api/projects/[projectId]/route";
import * as membersRoute from "@/app/api/projects/[projectId]/members/route";
import * as memberRoute from "@/app/api/projects/[projectId]/members/[userId]/route";
import * as invitationsRoute from "@/app/api/projects/[projectId]/invitations/route";
import * as acceptRoute from "@/app/api/invitations/accept/route";
import * as adminUserRoute from "@/app/api/admin/users/[userId]/route";
import * as adminSettingsRoute from "@/app/api/admin/settings/route";
import * as schema from "@/db/schema";

// Documented answers (lib/server/api.ts): body over 64 KiB → 413 payload_too_large; not JSON or not an
// object → 400 bad_request; JSON that fails the schema (wrong type, missing field) → 400
// validation_failed with `fields`; no Origin on a write → 403. In every case nothing is written.

type Handler = (request: Request, context?: { params: Promise<Record<string, string>> }) => Promise<Response>;
type Case = {
  name: string;
  handler: Handler;
  method: string;
  path: string;
  params?: Record<string, string>;
  /** A body of the right shape but wrong types. */
  wrongTypes: unknown;
  /** The fields that must be reported for `{}`. */
  required: string[];
};

let cookie: string;
let projectId: string;
let memberId: string;

const tables = [
  schema.users,
  schema.sessions,
  schema.projects,
  schema.memberships,
  schema.invitations,
  schema.passwordResets,
  schema.auditEvents,
  schema.settings,
  schema.loginThrottle,
  schema.outboxMessages,
];

async function snapshot(): Promise<number[]> {
  return Promise.all(tables.map((table) => countRows(table)));
}

beforeAll(async () => {
  await setUpDatabase();
  const admin = await createAccount({ email: "root@example.test", name: "Root" });
  cookie = admin.cookie;
  memberId = admin.user.id;
  const response = await call(projectsRoute.POST, makeRequest("POST", "/api/projects", { cookie, body: { name: "Egret" } }));
  projectId = ((await response.json()) as { project: { id: string } }).project.id;
});

function cases(): Case[] {
  const p = { projectId };
  return [
    { name: "sign-up", handler: signUp.POST, method: "POST", path: "/api/auth/sign-up", wrongTypes: { name: 1, email: true, password: 12345678 }, required: ["name", "email", "password"] },
    { name: "sign-in", handler: signIn.POST, method: "POST", path: "/api/auth/sign-in", wrongTypes: { email: ["a@b.c"], password: 5 }, required: ["email", "password"] },
    { name: "password reset request", handler: resetRequest.POST, method: "POST", path: "/api/auth/password-reset", wrongTypes: { email: 7 }, required: ["email"] },
    { name: "password reset confirm", handler: resetConfirm.POST, method: "POST", path: "/api/auth/password-reset/confirm", wrongTypes: { token: 1, password: false }, required: ["token", "password"] },
    { name: "create project", handler: projectsRoute.POST, method: "POST", path: "/api/projects", wrongTypes: { name: 42, description: {} }, required: ["name"] },
    { name: "update project", handler: projectRoute.PATCH, method: "PATCH", path: `/api/projects/${projectId}`, params: p, wrongTypes: { name: 5, description: 3 }, required: ["_"] },
    { name: "add member", handler: membersRoute.POST, method: "POST", path: `/api/projects/${projectId}/members`, params: p, wrongTypes: { email: 5, role: "admin" }, required: ["email", "role"] },
    { name: "invite", handler: invitationsRoute.POST, method: "POST", path: `/api/projects/${projectId}/invitations`, params: p, wrongTypes: { email: "not an address", role: 1 }, required: ["email", "role"] },
    {
      name: "change role",
      handler: memberRoute.PATCH,
      method: "PATCH",
      path: `/api/projects/${projectId}/members/${memberId}`,
      params: { projectId, userId: memberId },
      wrongTypes: { role: ["owner"] },
      required: ["role"],
    },
    { name: "accept invitation", handler: acceptRoute.POST, method: "POST", path: "/api/invitations/accept", wrongTypes: { token: 99, name: 1, password: 2 }, required: ["token"] },
    { name: "admin user", handler: adminUserRoute.PATCH, method: "PATCH", path: `/api/admin/users/${memberId}`, params: { userId: memberId }, wrongTypes: { isSiteAdmin: "yes" }, required: ["isSiteAdmin"] },
    { name: "admin settings", handler: adminSettingsRoute.PATCH, method: "PATCH", path: "/api/admin/settings", wrongTypes: { signupMode: "closed" }, required: ["signupMode"] },
  ];
}

describe("bad input to every route that takes a body", () => {
  it("wrong types → 400 validation_failed naming each field, nothing written", async () => {
    for (const c of cases()) {
      const before = await snapshot();
      const response = await call(c.handler, makeRequest(c.method, c.path, { cookie, body: c.wrongTypes }), c.params);
      expect(response.status, c.name).toBe(400);
      const body = (await response.json()) as ErrorJson;
      expect(body.error.code, c.name).toBe("validation_failed");
      for (const key of Object.keys(c.wrongTypes as object)) {
        expect(body.error.fields?.[key], `${c.name}: ${key}`).toBeTypeOf("string");
      }
      expect(await snapshot(), c.name).toEqual(before);
    }
  });

  it("missing fields → 400 with a message per required field, nothing written", async () => {
    for (const c of cases()) {
      const before = await snapshot();
      const response = await call(c.handler, makeRequest(c.method, c.path, { cookie, body: {} }), c.params);
      expect(response.status, c.name).toBe(400);
      const body = (await response.json()) as ErrorJson;
      expect(body.error.code, c.name).toBe("validation_failed");
      for (const field of c.required) expect(body.error.fields?.[field], `${c.name}: ${field}`).toBeTypeOf("string");
      expect(await snapshot(), c.name).toEqual(before);
    }
  });

  it("oversize body → 413 before parsing, nothing written", async () => {
    const huge = JSON.stringify({ name: "x".repeat(70 * 1024), email: "a@example.test", password: "p".repeat(10) });
    for (const c of cases()) {
      const before = await snapshot();
      const response = await call(c.handler, makeRequest(c.method, c.path, { cookie, rawBody: huge }), c.params);
      expect(response.status, c.name).toBe(413);
      expect(((await response.json()) as ErrorJson).error.code, c.name).toBe("payload_too_large");
      expect(await snapshot(), c.name).toEqual(before);
    }
  });

  it("oversize body without a Content-Length (streamed) → 413", async () => {
    const chunk = new TextEncoder().encode("x".repeat(16 * 1024));
    let sent = 0;
    const stream = new ReadableStream<Uint8Array>({
      pull(controller) {
        if (sent >= 10) return controller.close();
        sent++;
        controller.enqueue(chunk);
      },
    });
    const request = new Request("http://localhost:3000/api/projects", {
      method: "POST",
      headers: { host: "localhost:3000", origin: "http://localhost:3000", cookie, "content-type": "application/json" },
      body: stream,
      duplex: "half",
    } as RequestInit & { duplex: "half" });
    const before = await snapshot();
    const response = await call(projectsRoute.POST, request);
    expect(response.status).toBe(413);
    expect(await snapshot()).toEqual(before);
  });

  it("not JSON, or JSON that is not an object → 400 bad_request, nothing written", async () => {
    for (const c of cases()) {
      for (const rawBody of ["{not json", "[1,2]", "\"text\"", "null", ""]) {
        const before = await snapshot();
        const response = await call(c.handler, makeRequest(c.method, c.path, { cookie, rawBody }), c.params);
        expect(response.status, `${c.name} ${rawBody}`).toBe(400);
        expect(((await response.json()) as ErrorJson).error.code, c.name).toBe("bad_request");
        expect(await snapshot(), c.name).toEqual(before);
      }
    }
  });

  it("a write without Origin, or from another site → 403, nothing written", async () => {
    const valid: Record<string, unknown> = {
      "create project": { name: "Valid name" },
      "sign-up": { name: "Val", email: "val@example.test", password: "long enough" },
    };
    for (const c of cases()) {
      const body = valid[c.name] ?? c.wrongTypes;
      for (const origin of [null, "https://evil.example"]) {
        const before = await snapshot();
        const response = await call(c.handler, makeRequest(c.method, c.path, { cookie, body, origin }), c.params);
        expect(response.status, `${c.name} from ${origin}`).toBe(403);
        expect(await snapshot(), c.name).toEqual(before);
      }
    }
    const before = await snapshot();
    expect((await call(signOut.POST, makeRequest("POST", "/api/auth/sign-out", { cookie, origin: "https://evil.example" }))).status).toBe(403);
    expect((await call(projectRoute.DELETE, makeRequest("DELETE", `/api/projects/${projectId}`, { cookie, origin: null }), { projectId })).status).toBe(403);
    expect(await snapshot()).toEqual(before);
  });

  it("routes without a body: unknown or overlong ids → 404, no session → 401", async () => {
    const long = "x".repeat(500);
    expect((await call(projectRoute.GET, makeRequest("GET", `/api/projects/${long}`, { cookie }), { projectId: long })).status).toBe(404);
    expect((await call(projectRoute.GET, makeRequest("GET", "/api/projects/nope", { cookie }), { projectId: "nope" })).status).toBe(404);
    expect((await call(membersRoute.GET, makeRequest("GET", "/api/projects/nope/members", { cookie }), { projectId: "nope" })).status).toBe(404);
    const before = await snapshot();
    expect((await call(projectRoute.DELETE, makeRequest("DELETE", "/api/projects/nope", { cookie }), { projectId: "nope" })).status).toBe(404);
    expect((await call(memberRoute.DELETE, makeRequest("DELETE", `/api/projects/${projectId}/members/nope`, { cookie }), { projectId, userId: "nope" })).status).toBe(404);
    expect((await call(projectsRoute.GET, makeRequest("GET", "/api/projects"))).status).toBe(401);
    expect((await call(projectsRoute.POST, makeRequest("POST", "/api/projects", { body: { name: "Anon" } }))).status).toBe(401);
    expect((await call(projectsRoute.GET, makeRequest("GET", "/api/projects", { cookie: "portolan_session=forged-token-value" }))).status).toBe(401);
    expect(await snapshot()).toEqual(before);
  });
});
