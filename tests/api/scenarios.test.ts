// Scenarios, revisions and the server solve, through the route handlers on a fresh database.
import { beforeAll, describe, expect, it } from "vitest";
import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import { call, countRows, createAccount, makeRequest, setUpDatabase, type ErrorJson } from "./helpers";
import * as projectsRoute from "@/app/api/projects/route";
import * as scenariosRoute from "@/app/api/projects/[projectId]/scenarios/route";
import * as scenarioRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/route";
import * as revisionsRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/revisions/route";
import * as restoreRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/revisions/[revisionId]/restore/route";
import * as duplicateRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/duplicate/route";
import * as solveRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/solve/route";
import * as partsRoute from "@/app/api/projects/[projectId]/parts/route";
import { db } from "@/db/client";
import { auditEvents, memberships, scenarioRevisions, scenarios } from "@/db/schema";
import type { Scenario } from "@/engine/types";

type Account = Awaited<ReturnType<typeof createAccount>>;
let owner: Account;
let engineer: Account;
let reviewer: Account;
let stranger: Account;
let projectId: string;

type RevisionJson = { id: string; number: number; content: Scenario; contentHash: string; warnings: string[]; origin: string; restoredFrom: number | null };
type CreatedJson = { scenario: { id: string; name: string; latestRevisionId: string; latestRevisionNumber: number }; revision: RevisionJson };

beforeAll(async () => {
  await setUpDatabase();
  owner = await createAccount({ email: "owner@example.test", name: "Olga Owner" });
  engineer = await createAccount({ email: "eng@example.test", name: "Ezra Engineer" });
  reviewer = await createAccount({ email: "rev@example.test", name: "Rita Reviewer" });
  stranger = await createAccount({ email: "stranger@example.test" });
  const created = await call(projectsRoute.POST, makeRequest("POST", "/api/projects", { cookie: owner.cookie, body: { name: "Osprey link" } }));
  projectId = ((await created.json()) as { project: { id: string } }).project.id;
  await db.insert(memberships).values([
    { projectId, userId: engineer.user.id, role: "engineer" },
    { projectId, userId: reviewer.user.id, role: "reviewer" },
  ]);
});

const base = () => `/api/projects/${projectId}/scenarios`;

async function create(cookie: string, body: unknown): Promise<Response> {
  return call(scenariosRoute.POST, makeRequest("POST", base(), { cookie, body }), { projectId });
}

async function save(cookie: string, scenarioId: string, body: unknown): Promise<Response> {
  return call(revisionsRoute.POST, makeRequest("POST", `${base()}/${scenarioId}/revisions`, { cookie, body }), { projectId, scenarioId });
}

async function getScenario(cookie: string, scenarioId: string): Promise<Response> {
  return call(scenarioRoute.GET, makeRequest("GET", `${base()}/${scenarioId}`, { cookie }), { projectId, scenarioId });
}

/** Two 3 dB pads in a chain between TX and OUT. */
function twoPads(name = "Pads"): Scenario {
  return {
    format: "portolan.scenario/1",
    name,
    z0: 50,
    frequency: { start: 1e9, stop: 2e9, points: 3 },
    blocks: [
      { id: "PAD1", kind: "attenuator", params: { loss_db: 3 }, position: { x: 0, y: 0 } },
      { id: "PAD2", kind: "attenuator", params: { loss_db: 3 }, position: { x: 200, y: 0 } },
    ],
    links: [["PAD1:2", "PAD2:1"]],
    ports: [
      { name: "TX", at: "PAD1:1" },
      { name: "OUT", at: "PAD2:2" },
    ],
  };
}

describe("creating and listing scenarios", () => {
  it("an engineer creates a blank scenario: revision 1, no blocks, warnings instead of an error", async () => {
    const response = await create(engineer.cookie, { name: "Empty chart" });
    expect(response.status).toBe(201);
    const body = (await response.json()) as CreatedJson;
    expect(body.scenario.name).toBe("Empty chart");
    expect(body.revision.number).toBe(1);
    expect(body.revision.content.blocks).toEqual([]);
    expect(body.revision.content.name).toBe("Empty chart");
    expect(body.revision.warnings.join(" ")).toMatch(/no blocks/i);
    expect(body.revision.contentHash).toMatch(/^[0-9a-f]{64}$/);
  });

  it("a template gives a scenario the engine accepts (no warnings)", async () => {
    const response = await create(owner.cookie, { name: "From template", template: "pad-chain" });
    expect(response.status).toBe(201);
    const body = (await response.json()) as CreatedJson;
    expect(body.revision.content.blocks.map((b) => b.id)).toEqual(["PAD1", "PAD2"]);
    expect(body.revision.warnings).toEqual([]);
  });

  it("the list shows every scenario with its revision number, to every member and to nobody else", async () => {
    const list = await call(scenariosRoute.GET, makeRequest("GET", base(), { cookie: reviewer.cookie }), { projectId });
    expect(list.status).toBe(200);
    const { scenarios: rows } = (await list.json()) as { scenarios: { name: string; revisionNumber: number; blockCount: number }[] };
    expect(rows.map((r) => r.name)).toEqual(["Empty chart", "From template"]);
    expect(rows[1]).toMatchObject({ revisionNumber: 1, blockCount: 2 });
    // the counts come from columns stored with the revision; a row saved before those columns existed
    // (nulls) is counted from its content and lists the same
    const [template] = await db.select({ id: scenarios.latestRevisionId }).from(scenarios).where(eq(scenarios.name, "From template"));
    const [stored] = await db.select({ blockCount: scenarioRevisions.blockCount, portNames: scenarioRevisions.portNames }).from(scenarioRevisions).where(eq(scenarioRevisions.id, template.id!));
    expect(stored.blockCount).toBe(2);
    const fresh = (await (await call(scenariosRoute.GET, makeRequest("GET", base(), { cookie: reviewer.cookie }), { projectId })).json()) as { scenarios: { name: string; blockCount: number; portNames: string[] }[] };
    expect(stored.portNames).toEqual(fresh.scenarios[1].portNames);
    expect(stored.portNames!.length).toBeGreaterThan(0);
    await db.update(scenarioRevisions).set({ blockCount: null, portNames: null }).where(eq(scenarioRevisions.id, template.id!));
    const legacy = await call(scenariosRoute.GET, makeRequest("GET", base(), { cookie: reviewer.cookie }), { projectId });
    expect(((await legacy.json()) as typeof fresh).scenarios[1]).toMatchObject({ blockCount: 2, portNames: stored.portNames });
    const refused = await call(scenariosRoute.GET, makeRequest("GET", base(), { cookie: stranger.cookie }), { projectId });
    expect(refused.status).toBe(404);
    const anonymous = await call(scenariosRoute.GET, makeRequest("GET", base()), { projectId });
    expect(anonymous.status).toBe(401);
  });

  it("a reviewer cannot create (403) and nothing is written", async () => {
    const before = await countRows(scenarios);
    const response = await create(reviewer.cookie, { name: "Not mine" });
    expect(response.status).toBe(403);
    expect(await countRows(scenarios)).toBe(before);
  });

  it("schema-invalid content is refused with the field named (400), nothing written", async () => {
    const before = await countRows(scenarios);
    const bad = { ...twoPads(), z0: -50 };
    const response = await create(engineer.cookie, { name: "Broken", scenario: bad });
    expect(response.status).toBe(400);
    const body = (await response.json()) as ErrorJson;
    expect(Object.keys(body.error.fields ?? {})).toContain("scenario.z0");
    expect(await countRows(scenarios)).toBe(before);
  });
});

describe("revisions", () => {
  let scenarioId: string;
  let first: RevisionJson;

  beforeAll(async () => {
    const body = (await (await create(engineer.cookie, { name: "Revised" })).json()) as CreatedJson;
    scenarioId = body.scenario.id;
    first = body.revision;
  });

  it("a save from the latest revision makes revision 2 with the author, and GET returns it", async () => {
    const response = await save(engineer.cookie, scenarioId, { baseRevisionId: first.id, scenario: twoPads("Revised") });
    expect(response.status).toBe(201);
    const { revision } = (await response.json()) as { revision: RevisionJson & { authorName: string } };
    expect(revision.number).toBe(2);
    expect(revision.authorName).toBe("Ezra Engineer");
    expect(revision.warnings).toEqual([]);
    const latest = (await (await getScenario(reviewer.cookie, scenarioId)).json()) as { revision: RevisionJson; role: string };
    expect(latest.role).toBe("reviewer");
    expect(latest.revision.id).toBe(revision.id);
    expect(latest.revision.content.blocks).toHaveLength(2);
    // the workspace's block positions survive the round trip
    expect(latest.revision.content.blocks[1].position).toEqual({ x: 200, y: 0 });
  });

  it("equal content gives an equal hash whatever the key order, different content a different one", async () => {
    const { revisions } = (await (await call(revisionsRoute.GET, makeRequest("GET", `${base()}/${scenarioId}/revisions`, { cookie: engineer.cookie }), { projectId, scenarioId })).json()) as {
      revisions: RevisionJson[];
    };
    const latest = revisions[0];
    const shuffled = Object.fromEntries(Object.entries(twoPads("Revised")).reverse());
    const again = await save(engineer.cookie, scenarioId, { baseRevisionId: latest.id, scenario: shuffled });
    const { revision } = (await again.json()) as { revision: RevisionJson };
    expect(revision.contentHash).toBe(latest.contentHash);
    expect(revision.contentHash).not.toBe(first.contentHash);
  });

  it("a save from a stale revision that changes what was saved since answers 409 with the current revision and the conflict, and writes nothing", async () => {
    const before = await countRows(scenarioRevisions);
    // r3 added PAD1 with 3 dB; this save, from r1, adds PAD1 with 6 dB: the same parameter, two values
    const mine = twoPads("Revised");
    mine.blocks[0].params = { loss_db: 6 };
    const response = await save(owner.cookie, scenarioId, { baseRevisionId: first.id, scenario: mine });
    expect(response.status).toBe(409);
    const body = (await response.json()) as ErrorJson & { current: { number: number; authorName: string }; conflicts: { key: string; mine: string; theirs: string }[] };
    expect(body.error.code).toBe("conflict");
    expect(body.current.number).toBe(3);
    expect(body.current.authorName).toBe("Ezra Engineer");
    expect(body.conflicts).toEqual([expect.objectContaining({ key: "block:PAD1:param:loss_db", mine: "6 dB", theirs: "3 dB" })]);
    expect(await countRows(scenarioRevisions)).toBe(before);
  });

  it("content with no canonical JSON (a lone UTF-16 surrogate, RFC 8785 §3.2.2.2) is refused with the field named (422), nothing written", async () => {
    const before = await countRows(scenarioRevisions);
    const latest = (await (await getScenario(engineer.cookie, scenarioId)).json()) as { revision: RevisionJson };
    const content = twoPads("Revised");
    content.ports[0].name = "TX \ud800";
    const response = await save(engineer.cookie, scenarioId, { baseRevisionId: latest.revision.id, scenario: content });
    expect(response.status).toBe(422);
    const body = (await response.json()) as ErrorJson;
    expect(body.error.message).toMatch(/ports\[0\]\.name: string holds a lone UTF-16 surrogate/);
    expect(await countRows(scenarioRevisions)).toBe(before);
  });

  it("a draft with a link to a missing block is stored, with the engine's message as a warning", async () => {
    const latest = (await (await getScenario(engineer.cookie, scenarioId)).json()) as { revision: RevisionJson };
    const draft = { ...twoPads("Revised"), links: [["PAD1:2", "NOPE:1"]] };
    const response = await save(engineer.cookie, scenarioId, { baseRevisionId: latest.revision.id, scenario: draft });
    expect(response.status).toBe(201);
    const { revision } = (await response.json()) as { revision: RevisionJson };
    expect(revision.warnings.join(" ")).toMatch(/links\[0\]\[1\].*NOPE/);
  });

  it("reviewers cannot save (403); non-members get 404", async () => {
    const latest = (await (await getScenario(engineer.cookie, scenarioId)).json()) as { revision: RevisionJson };
    expect((await save(reviewer.cookie, scenarioId, { baseRevisionId: latest.revision.id, scenario: twoPads() })).status).toBe(403);
    expect((await save(stranger.cookie, scenarioId, { baseRevisionId: latest.revision.id, scenario: twoPads() })).status).toBe(404);
    expect((await getScenario(stranger.cookie, scenarioId)).status).toBe(404);
  });

  it("restore writes a new revision with the old content; history keeps every revision", async () => {
    const restore = await call(
      restoreRoute.POST,
      makeRequest("POST", `${base()}/${scenarioId}/revisions/${first.id}/restore`, { cookie: owner.cookie }),
      { projectId, scenarioId, revisionId: first.id },
    );
    expect(restore.status).toBe(201);
    const { revision } = (await restore.json()) as { revision: RevisionJson };
    expect(revision).toMatchObject({ number: 5, origin: "restore", restoredFrom: 1 });
    expect(revision.content.blocks).toEqual([]);
    expect(revision.contentHash).toBe(first.contentHash);
    const history = (await (await call(revisionsRoute.GET, makeRequest("GET", `${base()}/${scenarioId}/revisions`, { cookie: reviewer.cookie }), { projectId, scenarioId })).json()) as {
      revisions: RevisionJson[];
    };
    expect(history.revisions.map((r) => r.number)).toEqual([5, 4, 3, 2, 1]);
    const refused = await call(restoreRoute.POST, makeRequest("POST", `${base()}/${scenarioId}/revisions/${first.id}/restore`, { cookie: reviewer.cookie }), {
      projectId,
      scenarioId,
      revisionId: first.id,
    });
    expect(refused.status).toBe(403);
  });

  it("rename keeps the revisions; the content's name follows; reviewers may not rename", async () => {
    const patch = (cookie: string, name: string) => call(scenarioRoute.PATCH, makeRequest("PATCH", `${base()}/${scenarioId}`, { cookie, body: { name } }), { projectId, scenarioId });
    expect((await patch(reviewer.cookie, "Nope")).status).toBe(403);
    expect((await patch(engineer.cookie, "  ")).status).toBe(400);
    expect((await patch(engineer.cookie, "Renamed")).status).toBe(200);
    const latest = (await (await getScenario(engineer.cookie, scenarioId)).json()) as { scenario: { name: string; latestRevisionNumber: number }; revision: RevisionJson };
    expect(latest.scenario).toMatchObject({ name: "Renamed", latestRevisionNumber: 5 });
    expect(latest.revision.content.name).toBe("Renamed");
  });

  it("duplicate copies the latest content into a new scenario at revision 1", async () => {
    const response = await call(duplicateRoute.POST, makeRequest("POST", `${base()}/${scenarioId}/duplicate`, { cookie: engineer.cookie }), { projectId, scenarioId });
    expect(response.status).toBe(201);
    const body = (await response.json()) as CreatedJson;
    expect(body.scenario.name).toBe("Renamed (copy)");
    expect(body.revision).toMatchObject({ number: 1, origin: "duplicate" });
    const source = (await (await getScenario(engineer.cookie, scenarioId)).json()) as { revision: RevisionJson };
    expect(body.revision.content.blocks).toEqual(source.revision.content.blocks);
    const refused = await call(duplicateRoute.POST, makeRequest("POST", `${base()}/${scenarioId}/duplicate`, { cookie: reviewer.cookie }), { projectId, scenarioId });
    expect(refused.status).toBe(403);
  });

  it("delete removes the scenario and its revisions, with an audit event; reviewers get 403", async () => {
    const del = (cookie: string) => call(scenarioRoute.DELETE, makeRequest("DELETE", `${base()}/${scenarioId}`, { cookie }), { projectId, scenarioId });
    expect((await del(reviewer.cookie)).status).toBe(403);
    expect((await del(engineer.cookie)).status).toBe(204);
    expect((await getScenario(engineer.cookie, scenarioId)).status).toBe(404);
    const left = await db.select().from(scenarioRevisions).where(eq(scenarioRevisions.scenarioId, scenarioId));
    expect(left).toEqual([]);
    const events = await db.select({ action: auditEvents.action }).from(auditEvents).where(eq(auditEvents.projectId, projectId));
    expect(events.map((e) => e.action)).toEqual(expect.arrayContaining(["scenario.create", "scenario.save", "scenario.restore", "scenario.rename", "scenario.duplicate", "scenario.delete"]));
  });
});

describe("server solve", () => {
  const partText = ["! invented 1-port: a resonance at 1.5 GHz", "# GHz S RI R 50", "1.0 0.6 0.1", "1.5 0.05 -0.02", "2.0 0.55 -0.2", ""].join("\n");
  let scenarioId: string;
  let content: Scenario;

  beforeAll(async () => {
    const form = new FormData();
    form.set("file", new Blob([partText]), "dip.s1p");
    const upload = await call(partsRoute.POST, new Request(`http://localhost:3000/api/projects/${projectId}/parts`, { method: "POST", headers: { origin: "http://localhost:3000", host: "localhost:3000", cookie: engineer.cookie }, body: form }), {
      projectId,
    });
    expect(upload.status).toBe(201);
    content = {
      ...twoPads("Solved"),
      blocks: [...twoPads().blocks, { id: "ANT", kind: "touchstone", file: "parts/dip.s1p" }, { id: "SPL", kind: "splitter", params: {} }],
      links: [
        ["PAD1:2", "SPL:1"],
        ["SPL:2", "PAD2:1"],
        ["SPL:3", "ANT:1"],
      ],
    };
    const body = (await (await create(engineer.cookie, { name: "Solved", scenario: content })).json()) as CreatedJson;
    expect(body.revision.warnings).toEqual([]);
    scenarioId = body.scenario.id;
  });

  const solve = (query: string, cookie = reviewer.cookie) =>
    call(solveRoute.GET, makeRequest("GET", `${base()}/${scenarioId}/solve${query}`, { cookie }), { projectId, scenarioId });

  it("two 3 dB pads alone give |S21| = −6 dB (common practice: cascaded matched attenuators add in dB)", async () => {
    const pads = (await (await create(engineer.cookie, { name: "Only pads", scenario: twoPads("Only pads") })).json()) as CreatedJson;
    const response = await call(solveRoute.GET, makeRequest("GET", `${base()}/${pads.scenario.id}/solve?format=json`, { cookie: reviewer.cookie }), { projectId, scenarioId: pads.scenario.id });
    expect(response.status).toBe(200);
    const body = (await response.json()) as { s: [number, number][][][]; ports: string[] };
    expect(body.ports).toEqual(["TX", "OUT"]);
    for (const matrix of body.s) {
      const [re, im] = matrix[1][0];
      expect(20 * Math.log10(Math.hypot(re, im))).toBeCloseTo(-6, 10);
    }
  });

  it("agrees with `portolan solve --json` on the same scenario file and part file", async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), "portolan-solve-"));
    mkdirSync(path.join(dir, "parts"));
    writeFileSync(path.join(dir, "parts", "dip.s1p"), partText);
    writeFileSync(path.join(dir, "scenario.json"), JSON.stringify(content));
    const cli = JSON.parse(
      execFileSync(process.execPath, [path.resolve("node_modules/tsx/dist/cli.mjs"), path.resolve("engine/cli.ts"), "solve", "scenario.json", "--json"], { cwd: dir, encoding: "utf8" }),
    ) as { frequencies: number[]; ports: string[]; s: [number, number][][][] };
    const response = await solve("?format=json");
    expect(response.status).toBe(200);
    const server = (await response.json()) as typeof cli;
    expect(server.ports).toEqual(cli.ports);
    expect(server.frequencies).toEqual(cli.frequencies);
    for (let k = 0; k < cli.s.length; k++) {
      for (let i = 0; i < cli.ports.length; i++) {
        for (let j = 0; j < cli.ports.length; j++) {
          expect(server.s[k][i][j][0]).toBeCloseTo(cli.s[k][i][j][0], 12);
          expect(server.s[k][i][j][1]).toBeCloseTo(cli.s[k][i][j][1], 12);
        }
      }
    }
  });

  it("Touchstone and CSV downloads name the revision; an unsolvable revision is a 422 with the engine's message", async () => {
    const ts = await solve("?format=touchstone");
    expect(ts.status).toBe(200);
    // one file stem for every file named after a scenario (lib/domain/scenarios/file-stem.ts): lower case, dashes
    expect(ts.headers.get("content-disposition")).toMatch(/"solved-r1\.s2p"/);
    const text = await ts.text();
    expect(text).toMatch(/^# Hz S RI R 50/m);
    const csv = await solve("?format=csv");
    expect((await csv.text()).split("\n")[0]).toMatch(/^frequency_hz,/);
    expect((await solve("?format=xml")).status).toBe(400);
    const empty = (await (await create(engineer.cookie, { name: "Nothing yet" })).json()) as CreatedJson;
    const refused = await call(solveRoute.GET, makeRequest("GET", `${base()}/${empty.scenario.id}/solve`, { cookie: engineer.cookie }), { projectId, scenarioId: empty.scenario.id });
    expect(refused.status).toBe(422);
    expect(((await refused.json()) as ErrorJson).error.message).toMatch(/blocks/);
  });
});
