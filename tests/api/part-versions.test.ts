// Part versions (issue 15 item 2): upload a new version explicitly, blocks pin the version they use, solves
// resolve file + version, a version in use cannot be deleted, moving a block is audited, bundles carry
// every pinned version and `portolan check bundle.zip` reproduces them.
import { beforeAll, describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { and, eq } from "drizzle-orm";
import { call, countRows, createAccount, HOST, makeRequest, ORIGIN, setUpDatabase, type ErrorJson } from "./helpers";
import * as projectsRoute from "@/app/api/projects/route";
import * as partsRoute from "@/app/api/projects/[projectId]/parts/route";
import * as partRoute from "@/app/api/projects/[projectId]/parts/[partId]/route";
import * as versionsRoute from "@/app/api/projects/[projectId]/parts/[partId]/versions/route";
import * as scenariosRoute from "@/app/api/projects/[projectId]/scenarios/route";
import * as revisionsRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/revisions/route";
import * as solveRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/solve/route";
import * as bundleRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/bundle/route";
import * as importRoute from "@/app/api/projects/[projectId]/bundles/route";
import { db } from "@/db/client";
import { auditEvents, memberships, parts } from "@/db/schema";
import { hashScenarioContent } from "@/db/queries/revisions";
import { readZipSafely } from "@/engine/bundle";
import type { Scenario } from "@/engine/types";

type Account = Awaited<ReturnType<typeof createAccount>>;
let engineer: Account;
let reviewer: Account;
let stranger: Account;
let projectId: string;
let dir: string;

type PartJson = { id: string; fileName: string; partVersion: number; ports: number; points: number; versions?: { id: string; partVersion: number }[] };
type SolveJson = { frequencies: number[]; ports: string[]; s: [number, number][][][] };
type Use = { scenarioId: string; scenarioName: string; blockId: string; partVersion: number };

/**
 * An invented matched 2-port pad: S11 = S22 = 0, S21 = S12 = `through` at 1, 1.5 and 2 GHz, referenced to 50 Ω.
 * Between two 50 Ω system ports the composite is the part's own S (Pozar, Microwave Engineering 4th ed.,
 * §4.3: S is defined by the incident and reflected waves at ports terminated in their reference).
 */
function padText(through: number, stopGhz = 2): string {
  const rows = [1, 1.5, stopGhz].map((f) => `${f} 0 0 ${through} 0 ${through} 0 0 0`);
  return ["! invented matched pad", "# GHz S RI R 50", ...rows, ""].join("\n");
}

function uploadRequest(cookie: string, fileName: string, text: string, fields: Record<string, string> = {}): Request {
  const form = new FormData();
  form.set("file", new Blob([text]), fileName);
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  return new Request(`http://${HOST}/api/projects/${projectId}/parts`, { method: "POST", headers: { origin: ORIGIN, host: HOST, cookie }, body: form });
}
const upload = (cookie: string, fileName: string, text: string, fields: Record<string, string> = {}) => call(partsRoute.POST, uploadRequest(cookie, fileName, text, fields), { projectId });

function scenarioWith(name: string, blocks: Scenario["blocks"], ports: Scenario["ports"], links: Scenario["links"] = []): Scenario {
  return { format: "portolan.scenario/1", name, z0: 50, frequency: { list: [1e9, 1.5e9, 2e9] }, blocks, links, ports };
}

async function createScenario(cookie: string, scenario: Scenario): Promise<{ id: string; revisionId: string; warnings: string[] }> {
  const response = await call(scenariosRoute.POST, makeRequest("POST", `/api/projects/${projectId}/scenarios`, { cookie, body: { name: scenario.name, scenario } }), { projectId });
  expect(response.status).toBe(201);
  const body = (await response.json()) as { scenario: { id: string }; revision: { id: string; warnings: string[] } };
  return { id: body.scenario.id, revisionId: body.revision.id, warnings: body.revision.warnings };
}

async function solve(scenarioId: string): Promise<SolveJson> {
  const response = await call(solveRoute.GET, makeRequest("GET", `/api/projects/${projectId}/scenarios/${scenarioId}/solve?format=json`, { cookie: reviewer.cookie }), { projectId, scenarioId });
  expect(response.status).toBe(200);
  return (await response.json()) as SolveJson;
}

async function versionsOf(partId: string, cookie = reviewer.cookie): Promise<{ fileName: string; versions: PartJson[]; uses: Use[] }> {
  const response = await call(versionsRoute.GET, makeRequest("GET", `/api/projects/${projectId}/parts/${partId}/versions`, { cookie }), { projectId, partId });
  expect(response.status).toBe(200);
  return (await response.json()) as { fileName: string; versions: PartJson[]; uses: Use[] };
}

const del = (cookie: string, partId: string) => call(partRoute.DELETE, makeRequest("DELETE", `/api/projects/${projectId}/parts/${partId}`, { cookie }), { projectId, partId });

let v1: PartJson;
let v2: PartJson;
let pinnedToOne: { id: string; revisionId: string };
let pinnedToTwo: { id: string; revisionId: string };

beforeAll(async () => {
  await setUpDatabase();
  dir = mkdtempSync(path.join(os.tmpdir(), "portolan-part-versions-"));
  engineer = await createAccount({ email: "eng@example.test", name: "Ezra Engineer" });
  reviewer = await createAccount({ email: "rev@example.test" });
  stranger = await createAccount({ email: "stranger@example.test" });
  const created = await call(projectsRoute.POST, makeRequest("POST", "/api/projects", { cookie: engineer.cookie, body: { name: "Versions bench" } }));
  projectId = ((await created.json()) as { project: { id: string } }).project.id;
  await db.insert(memberships).values([{ projectId, userId: reviewer.user.id, role: "reviewer" }]);
  const first = await upload(engineer.cookie, "pad.s2p", padText(0.5));
  expect(first.status).toBe(201);
  v1 = ((await first.json()) as { part: PartJson }).part;
});

describe("uploading a new version", () => {
  it("a plain upload of a taken file name is still a 409 that points at 'Upload new version'; nothing written", async () => {
    const before = await countRows(parts);
    const response = await upload(engineer.cookie, "pad.s2p", padText(0.25));
    expect(response.status).toBe(409);
    expect(((await response.json()) as ErrorJson).error.message).toContain("new version");
    expect(await countRows(parts)).toBe(before);
  });

  it("reviewers may not upload a version (403), strangers do not see the project (404); nothing written", async () => {
    const before = await countRows(parts);
    expect((await upload(reviewer.cookie, "pad-rev2.s2p", padText(0.25), { new_version_of: "pad.s2p" })).status).toBe(403);
    expect((await upload(stranger.cookie, "pad-rev2.s2p", padText(0.25), { new_version_of: "pad.s2p" })).status).toBe(404);
    expect(await countRows(parts)).toBe(before);
  });

  it("bad input names the field: new_version_of not a Touchstone name (400), no such part (404), another port count (422)", async () => {
    const before = await countRows(parts);
    const bad = await upload(engineer.cookie, "x.s2p", padText(0.25), { new_version_of: "../pad" });
    expect(bad.status).toBe(400);
    expect(Object.keys(((await bad.json()) as ErrorJson).error.fields ?? {})).toEqual(["new_version_of"]);
    const missing = await upload(engineer.cookie, "x.s2p", padText(0.25), { new_version_of: "nothing.s2p" });
    expect(missing.status).toBe(404);
    expect(((await missing.json()) as ErrorJson).error.fields).toHaveProperty("new_version_of");
    const onePort = ["# GHz S RI R 50", "1 0.1 0", "2 0.1 0", ""].join("\n");
    const ports = await upload(engineer.cookie, "x.s1p", onePort, { new_version_of: "pad.s2p" });
    expect(ports.status).toBe(422);
    const portsBody = (await ports.json()) as ErrorJson;
    expect(portsBody.error.message).toContain("has 2 ports; this file has 1");
    expect(portsBody.error.fields).toHaveProperty("file");
    expect(await countRows(parts)).toBe(before);
  });

  it("an engineer uploads version 2 under the part's file name, whatever the chosen file is called; version 1 stays readable", async () => {
    const response = await upload(engineer.cookie, "pad_from_vendor_rev_b.s2p", padText(0.25), { new_version_of: "pad.s2p" });
    expect(response.status).toBe(201);
    v2 = ((await response.json()) as { part: PartJson }).part;
    expect(v2).toMatchObject({ fileName: "pad.s2p", partVersion: 2, ports: 2, points: 3 });
    const list = (await (await call(partsRoute.GET, makeRequest("GET", `/api/projects/${projectId}/parts`, { cookie: reviewer.cookie }), { projectId })).json()) as { parts: PartJson[] };
    expect(list.parts).toHaveLength(1);
    expect(list.parts[0]).toMatchObject({ id: v2.id, partVersion: 2, versions: [{ id: v1.id, partVersion: 1 }, { id: v2.id, partVersion: 2 }] });
    const old = await call(partRoute.GET, makeRequest("GET", `/api/projects/${projectId}/parts/${v1.id}`, { cookie: reviewer.cookie }), { projectId, partId: v1.id });
    expect(((await old.json()) as { part: { text: string } }).part.text).toBe(padText(0.5));
    const events = await db.select().from(auditEvents).where(and(eq(auditEvents.projectId, projectId), eq(auditEvents.action, "part.version_upload")));
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({ target: "pad.s2p", actorEmail: "eng@example.test" });
  });
});

describe("pinning and resolution", () => {
  it("a solve resolves file + version: no part_version reads version 1 (|S21| 0.5), part_version 2 reads version 2 (0.25)", async () => {
    const ports: Scenario["ports"] = [
      { name: "IN", at: "PAD:1" },
      { name: "OUT", at: "PAD:2" },
    ];
    pinnedToOne = await createScenario(engineer.cookie, scenarioWith("Pinned to one", [{ id: "PAD", kind: "touchstone", file: "parts/pad.s2p" }], ports));
    pinnedToTwo = await createScenario(engineer.cookie, scenarioWith("Pinned to two", [{ id: "PAD", kind: "touchstone", file: "parts/pad.s2p", part_version: 2 }], ports));
    const one = await solve(pinnedToOne.id);
    const two = await solve(pinnedToTwo.id);
    for (let k = 0; k < 3; k++) {
      // the file's own S21 (the composite of a part between two ports at its reference, Pozar §4.3)
      expect(Math.hypot(...one.s[k][1][0])).toBeCloseTo(0.5, 12);
      expect(Math.hypot(...two.s[k][1][0])).toBeCloseTo(0.25, 12);
    }
  });

  it("a block pinning a version the library does not have is a warning of the revision, not a silent fall-back", async () => {
    const missing = await createScenario(
      engineer.cookie,
      scenarioWith("Pinned to nine", [{ id: "PAD", kind: "touchstone", file: "parts/pad.s2p", part_version: 9 }], [{ name: "IN", at: "PAD:1" }]),
    );
    expect(missing.warnings.join(" ")).toContain("parts/pad.s2p");
  });

  it("part_version that is not a positive integer is refused naming the block's field; nothing written", async () => {
    const before = await countRows(parts);
    const bad = scenarioWith("Bad pin", [{ id: "PAD", kind: "touchstone", file: "parts/pad.s2p", part_version: 0 }], []);
    const response = await call(scenariosRoute.POST, makeRequest("POST", `/api/projects/${projectId}/scenarios`, { cookie: engineer.cookie, body: { name: "Bad pin", scenario: bad } }), { projectId });
    expect(response.status).toBe(400);
    expect(JSON.stringify(((await response.json()) as ErrorJson).error)).toContain("part_version");
    expect(await countRows(parts)).toBe(before);
  });

  it("the part's uses list every block with the version it pins; the scenario list counts blocks behind", async () => {
    const { uses } = await versionsOf(v1.id);
    const mine = uses.filter((u) => u.scenarioName.startsWith("Pinned to one") || u.scenarioName.startsWith("Pinned to two"));
    expect(mine).toEqual([
      { scenarioId: pinnedToOne.id, scenarioName: "Pinned to one", blockId: "PAD", partVersion: 1 },
      { scenarioId: pinnedToTwo.id, scenarioName: "Pinned to two", blockId: "PAD", partVersion: 2 },
    ]);
    const list = (await (await call(scenariosRoute.GET, makeRequest("GET", `/api/projects/${projectId}/scenarios`, { cookie: reviewer.cookie }), { projectId })).json()) as {
      scenarios: { id: string; blocksBehind: number }[];
    };
    expect(list.scenarios.find((s) => s.id === pinnedToOne.id)?.blocksBehind).toBe(1);
    expect(list.scenarios.find((s) => s.id === pinnedToTwo.id)?.blocksBehind).toBe(0);
  });
});

describe("deleting versions and moving blocks", () => {
  it("a version in use cannot be deleted (409 names the scenario); reviewers may not delete (403)", async () => {
    expect((await del(reviewer.cookie, v1.id)).status).toBe(403);
    const one = await del(engineer.cookie, v1.id);
    expect(one.status).toBe(409);
    expect(((await one.json()) as { scenarios: string[] }).scenarios).toEqual(["Pinned to one"]);
    const two = await del(engineer.cookie, v2.id);
    expect(two.status).toBe(409);
    const twoBody = (await two.json()) as ErrorJson & { scenarios: string[] };
    expect(twoBody.scenarios).toEqual(["Pinned to two"]);
    expect(twoBody.error.message).toContain("pad.s2p version 2");
  });

  it("moving a block to version 2 is a saved revision with a part.move audit event; then version 1 can be deleted", async () => {
    const moved = scenarioWith("Pinned to one", [{ id: "PAD", kind: "touchstone", file: "parts/pad.s2p", part_version: 2 }], [
      { name: "IN", at: "PAD:1" },
      { name: "OUT", at: "PAD:2" },
    ]);
    const saved = await call(
      revisionsRoute.POST,
      makeRequest("POST", `/api/projects/${projectId}/scenarios/${pinnedToOne.id}/revisions`, { cookie: engineer.cookie, body: { baseRevisionId: pinnedToOne.revisionId, scenario: moved } }),
      { projectId, scenarioId: pinnedToOne.id },
    );
    expect(saved.status).toBe(201);
    const events = await db.select().from(auditEvents).where(and(eq(auditEvents.projectId, projectId), eq(auditEvents.action, "part.move")));
    expect(events).toHaveLength(1);
    expect(events[0].target).toBe("pad.s2p");
    expect(events[0].detail).toMatchObject({ block: "PAD", from: 1, to: 2, scenario: "Pinned to one" });
    expect(Math.hypot(...(await solve(pinnedToOne.id)).s[0][1][0])).toBeCloseTo(0.25, 12);
    // "Pinned to nine" pins a version that does not exist: it holds neither version
    expect((await del(engineer.cookie, v1.id)).status).toBe(204);
    const left = await versionsOf(v2.id);
    expect(left.versions.map((v) => v.partVersion)).toEqual([2]);
    const deleted = await db.select().from(auditEvents).where(and(eq(auditEvents.projectId, projectId), eq(auditEvents.action, "part.delete")));
    expect(deleted).toHaveLength(1);
  });
});

describe("bundles with two versions of one part", () => {
  let zip: Uint8Array;
  let scenario: Scenario;
  let revisionHash: string;

  it("a scenario placing versions 2 and 3 of one file exports both, under parts/v2/ and parts/v3/, with scenario.json unchanged", async () => {
    // version 3 adds a point above 2 GHz; the pads are cascaded so that both versions count: |S21| = 0.25 · 0.1
    const third = await upload(engineer.cookie, "pad.s2p", padText(0.1, 3), { new_version_of: "pad.s2p" });
    expect(third.status).toBe(201);
    expect(((await third.json()) as { part: PartJson }).part.partVersion).toBe(3);
    scenario = scenarioWith(
      "Two versions",
      [
        { id: "A", kind: "touchstone", file: "parts/pad.s2p", part_version: 2 },
        { id: "B", kind: "touchstone", file: "parts/pad.s2p", part_version: 3 },
      ],
      [
        { name: "IN", at: "A:1" },
        { name: "OUT", at: "B:2" },
      ],
      [["A:2", "B:1"]],
    );
    const created = await createScenario(engineer.cookie, scenario);
    expect(created.warnings).toEqual([]);
    const solved = await solve(created.id);
    // matched pads in cascade: S21 = S21a · S21b (Pozar 4th ed., §4.4, matched two-ports)
    expect(Math.hypot(...solved.s[0][1][0])).toBeCloseTo(0.025, 12);
    const response = await call(bundleRoute.GET, makeRequest("GET", `/api/projects/${projectId}/scenarios/${created.id}/bundle`, { cookie: reviewer.cookie }), { projectId, scenarioId: created.id });
    expect(response.status).toBe(200);
    zip = new Uint8Array(await response.arrayBuffer());
    const files = readZipSafely(zip);
    expect([...files.keys()].filter((k) => k.startsWith("parts/")).sort()).toEqual(["parts/v2/pad.s2p", "parts/v3/pad.s2p"]);
    expect(new TextDecoder().decode(files.get("parts/v2/pad.s2p"))).toBe(padText(0.25));
    expect(new TextDecoder().decode(files.get("parts/v3/pad.s2p"))).toBe(padText(0.1, 3));
    const stored = JSON.parse(new TextDecoder().decode(files.get("scenario.json"))) as Scenario;
    expect(stored.blocks.map((b) => [b.file, b.part_version])).toEqual([
      ["parts/pad.s2p", 2],
      ["parts/pad.s2p", 3],
    ]);
    revisionHash = hashScenarioContent(stored);
    const manifest = JSON.parse(new TextDecoder().decode(files.get("manifest.json"))) as { revision: { content_hash: string } };
    expect(manifest.revision.content_hash).toBe(revisionHash);
  });

  it("`portolan check bundle.zip` verifies and reproduces it from those paths", () => {
    const file = path.join(dir, "two-versions.zip");
    writeFileSync(file, zip);
    const run = spawnSync("node", ["dist/portolan.mjs", "check", file], { encoding: "utf8", timeout: 120_000 });
    expect(run.stdout).toContain("scenario.json is the revision's content (SHA-256");
    expect(run.stdout).toContain("REPRODUCED: the stored verdicts and figures come out the same");
    expect(run.status).toBe(0);
  });

  it("importing it into another project stores each version's text as a part and re-points the blocks; the composite is the same", async () => {
    const otherId = ((await (await call(projectsRoute.POST, makeRequest("POST", "/api/projects", { cookie: engineer.cookie, body: { name: "Elsewhere" } }))).json()) as { project: { id: string } }).project.id;
    const form = new FormData();
    form.set("file", new Blob([new Uint8Array(zip)]), "bundle.zip");
    const request = new Request(`http://${HOST}/api/projects/${otherId}/bundles`, { method: "POST", headers: { origin: ORIGIN, host: HOST, cookie: engineer.cookie }, body: form });
    const response = await call(importRoute.POST, request, { projectId: otherId });
    expect(response.status).toBe(201);
    const result = (await response.json()) as { scenario: { id: string }; revision: { content: Scenario }; parts: { fileName: string; reused: boolean; renamedFrom: string | null }[] };
    expect(result.parts).toEqual([
      { fileName: "pad.s2p", reused: false, renamedFrom: null },
      { fileName: "pad-2.s2p", reused: false, renamedFrom: "pad.s2p" },
    ]);
    expect(result.revision.content.blocks.map((b) => [b.file, b.part_version])).toEqual([
      ["parts/pad.s2p", undefined],
      ["parts/pad-2.s2p", undefined],
    ]);
    const solved = await call(solveRoute.GET, makeRequest("GET", `/api/projects/${otherId}/scenarios/${result.scenario.id}/solve?format=json`, { cookie: engineer.cookie }), {
      projectId: otherId,
      scenarioId: result.scenario.id,
    });
    expect(Math.hypot(...((await solved.json()) as SolveJson).s[0][1][0])).toBeCloseTo(0.025, 12);
  });
});
