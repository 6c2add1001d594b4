// Bundles through the route handlers: export, import round trip, CLI reproduction, hostile uploads.
import { beforeAll, describe, expect, it } from "vitest";
import { execFileSync, spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { and, eq } from "drizzle-orm";
import { call, countRows, createAccount, HOST, makeRequest, ORIGIN, setUpDatabase, type ErrorJson } from "./helpers";
import * as projectsRoute from "@/app/api/projects/route";
import * as partsRoute from "@/app/api/projects/[projectId]/parts/route";
import * as scenariosRoute from "@/app/api/projects/[projectId]/scenarios/route";
import * as scenarioRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/route";
import * as solveRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/solve/route";
import * as bundleRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/bundle/route";
import * as importRoute from "@/app/api/projects/[projectId]/bundles/route";
import { db } from "@/db/client";
import { auditEvents, memberships, parts, scenarioRevisions, scenarios } from "@/db/schema";
import { DRIVE_CAUTIONS } from "@/engine/checks";
import { readZipSafely } from "@/engine/bundle";
import type { Scenario } from "@/engine/types";
import { writeRawZip } from "../engine/bundle-zip-helpers";

type Account = Awaited<ReturnType<typeof createAccount>>;
let owner: Account;
let engineer: Account;
let reviewer: Account;
let projectId: string;
let otherProjectId: string;
let scenarioId: string;
let original: Scenario;
let bundle: Uint8Array;
let dir: string;

const FIXTURES = path.resolve("tests/fixtures/scenarios");
const PART_TEXT = readFileSync(path.join(FIXTURES, "parts/telemetry-patch.s1p"), "utf8");

async function createProject(cookie: string, name: string): Promise<string> {
  const created = await call(projectsRoute.POST, makeRequest("POST", "/api/projects", { cookie, body: { name } }));
  return ((await created.json()) as { project: { id: string } }).project.id;
}

async function uploadPart(cookie: string, project: string, fileName: string, text: string): Promise<Response> {
  const form = new FormData();
  form.set("file", new Blob([text]), fileName);
  const request = new Request(`http://${HOST}/api/projects/${project}/parts`, { method: "POST", headers: { origin: ORIGIN, host: HOST, cookie }, body: form });
  return call(partsRoute.POST, request, { projectId: project });
}

function importRequest(cookie: string, project: string, bytes: Uint8Array, fileName = "bundle.zip"): Request {
  const form = new FormData();
  form.set("file", new Blob([new Uint8Array(bytes)]), fileName);
  return new Request(`http://${HOST}/api/projects/${project}/bundles`, { method: "POST", headers: { origin: ORIGIN, host: HOST, cookie }, body: form });
}

const importBundle = (cookie: string, project: string, bytes: Uint8Array) => call(importRoute.POST, importRequest(cookie, project, bytes), { projectId: project });

async function exportBundle(cookie: string, query = ""): Promise<Response> {
  return call(bundleRoute.GET, makeRequest("GET", `/api/projects/${projectId}/scenarios/${scenarioId}/bundle${query}`, { cookie }), { projectId, scenarioId });
}

type SolveJson = { frequencies: number[]; ports: string[]; s: [number, number][][][] };

async function solveJson(cookie: string, project: string, scenario: string): Promise<SolveJson> {
  const response = await call(solveRoute.GET, makeRequest("GET", `/api/projects/${project}/scenarios/${scenario}/solve?format=json`, { cookie }), { projectId: project, scenarioId: scenario });
  expect(response.status).toBe(200);
  return (await response.json()) as SolveJson;
}

function maxDiff(a: SolveJson, b: SolveJson): number {
  let worst = 0;
  a.s.forEach((m, k) => m.forEach((row, i) => row.forEach(([re, im], j) => (worst = Math.max(worst, Math.hypot(re - b.s[k][i][j][0], im - b.s[k][i][j][1]))))));
  return worst;
}

beforeAll(async () => {
  await setUpDatabase();
  dir = mkdtempSync(path.join(os.tmpdir(), "portolan-api-bundle-"));
  owner = await createAccount({ email: "owner@example.test", name: "Olga Owner" });
  engineer = await createAccount({ email: "eng@example.test", name: "Ezra Engineer" });
  reviewer = await createAccount({ email: "rev@example.test", name: "Rita Reviewer" });
  projectId = await createProject(owner.cookie, "Telemetry");
  await db.insert(memberships).values([
    { projectId, userId: engineer.user.id, role: "engineer" },
    { projectId, userId: reviewer.user.id, role: "reviewer" },
  ]);
  expect((await uploadPart(engineer.cookie, projectId, "telemetry-patch.s1p", PART_TEXT)).status).toBe(201);
  const fixture = JSON.parse(readFileSync(path.join(FIXTURES, "telemetry-front-end.json"), "utf8")) as Scenario;
  // as the workspace stores it: chart positions and the typed expression of a parameter
  const content = {
    ...fixture,
    blocks: fixture.blocks.map((b, i) => ({ ...b, position: { x: 160 * i, y: 40 }, ...(b.id === "DETPAD" ? { expr: { loss_db: "10 dB" } } : {}) })),
  };
  const created = await call(scenariosRoute.POST, makeRequest("POST", `/api/projects/${projectId}/scenarios`, { cookie: engineer.cookie, body: { name: fixture.name, scenario: content } }), { projectId });
  expect(created.status).toBe(201);
  const body = (await created.json()) as { scenario: { id: string }; revision: { content: Scenario; warnings: string[] } };
  expect(body.revision.warnings).toEqual([]);
  scenarioId = body.scenario.id;
  original = body.revision.content;
  otherProjectId = await createProject(engineer.cookie, "Elsewhere");
});


describe("exporting a bundle", () => {
  it("a reviewer downloads the bundle of the latest revision as a zip, and the export is audited", async () => {
    const response = await exportBundle(reviewer.cookie);
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toBe("application/zip");
    expect(response.headers.get("content-disposition")).toMatch(/^attachment; filename="telemetry-front-end-s-band-invented-r1-bundle\.zip"$/);
    bundle = new Uint8Array(await response.arrayBuffer());
    const files = readZipSafely(bundle);
    expect([...files.keys()].sort()).toEqual(["manifest.json", "parts/telemetry-patch.s1p", "report.html", "results/checks.csv", "results/checks.json", "results/composite.s3p", "scenario.json"]);
    const manifest = JSON.parse(new TextDecoder().decode(files.get("manifest.json"))) as { project: { name: string }; revision: { number: number }; created_by: { email: string }; app: { version: string } };
    expect(manifest).toMatchObject({ project: { name: "Telemetry" }, revision: { number: 1 }, created_by: { email: "rev@example.test" }, app: { version: "0.1.0" } });
    const events = await db.select().from(auditEvents).where(and(eq(auditEvents.projectId, projectId), eq(auditEvents.action, "bundle.export")));
    expect(events).toHaveLength(1);
    expect(events[0].actorEmail).toBe("rev@example.test");
  });

  it("report.html is self-contained and carries verdicts, traces, leak traces, the power ledger and the cautions", () => {
    const html = new TextDecoder().decode(readZipSafely(bundle).get("report.html"));
    expect(html).not.toMatch(/<script|<link|<img|<iframe|@import|url\(|src=|href=/i);
    expect(html.match(/<svg /g)?.length).toBe(3); // one |S| plot per driven system port (TX, RX, DET)
    for (const heading of ["Verdicts", "Traces", "Leak traces of the isolation rules", "Power ledger"]) expect(html).toContain(`<h2>${heading}</h2>`);
    for (const caution of DRIVE_CAUTIONS) expect(html).toContain(caution.replace(/'/g, "&#39;"));
    expect(html).toContain("Power entering TX");
  });

  it("the composite in the bundle, read by scikit-rf 0.15.4, is the server's solve to 1e-12", async () => {
    const file = path.join(dir, "composite.s3p");
    writeFileSync(file, readZipSafely(bundle).get("results/composite.s3p")!);
    const script = [
      "import json, sys",
      "import numpy as np",
      "np.complex = complex; np.float = float; np.int = int",
      "import skrf",
      "n = skrf.Network(sys.argv[1])",
      "print('RESULT ' + json.dumps({'f': n.f.tolist(), 're': n.s.real.tolist(), 'im': n.s.imag.tolist()}))",
    ].join("\n");
    const out = execFileSync("/usr/bin/python3", ["-c", script, file], { encoding: "utf8" });
    const ref = JSON.parse(out.slice(out.indexOf("RESULT ") + 7)) as { f: number[]; re: number[][][]; im: number[][][] };
    const server = await solveJson(reviewer.cookie, projectId, scenarioId);
    expect(ref.f).toHaveLength(server.frequencies.length);
    let worst = 0;
    server.s.forEach((m, k) => m.forEach((row, i) => row.forEach(([re, im], j) => (worst = Math.max(worst, Math.hypot(re - ref.re[k][i][j], im - ref.im[k][i][j]))))));
    expect(worst).toBeLessThanOrEqual(1e-12);
  });

  it("the CLI reproduces the verdicts from the exported bundle alone", () => {
    const file = path.join(dir, "exported.zip");
    writeFileSync(file, bundle);
    const run = spawnSync("npx", ["tsx", "engine/cli.ts", "check", file], { encoding: "utf8", timeout: 120_000 });
    expect(run.stdout).toContain("manifest: 6 files verified (SHA-256)");
    // scenario.json hashes to the revision's content hash, the one sign-offs are bound to
    expect(run.stdout).toContain("scenario.json is the revision's content (SHA-256");
    expect(run.stdout).toContain("REPRODUCED: the stored verdicts and figures come out the same");
    expect(run.status).toBe(1); // verified and reproduced, but the fixture's rules fail
  });

  it("a revision of another scenario is not found", async () => {
    const response = await exportBundle(reviewer.cookie, "?revisionId=not-a-revision");
    expect(response.status).toBe(404);
  });
});

describe("importing a bundle", () => {
  it("export then import into another project gives the same scenario and the same composite", async () => {
    const response = await importBundle(engineer.cookie, otherProjectId, bundle);
    expect(response.status).toBe(201);
    const result = (await response.json()) as { scenario: { id: string; name: string }; revision: { content: Scenario }; parts: { fileName: string; reused: boolean }[]; contentHashMatches: boolean };
    expect(result.contentHashMatches).toBe(true);
    // issue 18: the imported scenario's name says it was imported, from which revision and project
    expect(result.scenario.name).toBe(`${original.name} (imported r1 from Telemetry)`);
    expect(result.parts).toEqual([{ fileName: "telemetry-patch.s1p", reused: false, renamedFrom: null }]);
    const got = await call(scenarioRoute.GET, makeRequest("GET", `/api/projects/${otherProjectId}/scenarios/${result.scenario.id}`, { cookie: engineer.cookie }), { projectId: otherProjectId, scenarioId: result.scenario.id });
    const gotBody = (await got.json()) as { revision: { content: Scenario; origin: string } };
    expect(gotBody.revision.content).toEqual({ ...original, name: result.scenario.name });
    expect(gotBody.revision.origin).toBe("import");
    const [part] = await db.select().from(parts).where(eq(parts.projectId, otherProjectId));
    expect(part.text).toBe(PART_TEXT);
    const a = await solveJson(reviewer.cookie, projectId, scenarioId);
    const b = await solveJson(engineer.cookie, otherProjectId, result.scenario.id);
    expect(b.ports).toEqual(a.ports);
    expect(b.frequencies).toEqual(a.frequencies);
    expect(maxDiff(a, b)).toBeLessThanOrEqual(1e-12);
    const events = await db.select().from(auditEvents).where(and(eq(auditEvents.projectId, otherProjectId), eq(auditEvents.action, "bundle.import")));
    expect(events).toHaveLength(1);
  });

  it("importing into the same project reuses an identical part", async () => {
    const before = await countRows(parts);
    const response = await importBundle(engineer.cookie, projectId, bundle);
    expect(response.status).toBe(201);
    const result = (await response.json()) as { parts: { reused: boolean }[]; contentHashMatches: boolean };
    expect(result.parts[0].reused).toBe(true);
    expect(result.contentHashMatches).toBe(true);
    expect(await countRows(parts)).toBe(before);
  });

  it("a different part under the same file name is stored under a free name and the block points at it", async () => {
    const third = await createProject(engineer.cookie, "Clash");
    const other = PART_TEXT.replace(/^(#.*)$/m, "$1\n! a different file of the same name");
    expect((await uploadPart(engineer.cookie, third, "telemetry-patch.s1p", other)).status).toBe(201);
    const response = await importBundle(engineer.cookie, third, bundle);
    expect(response.status).toBe(201);
    const result = (await response.json()) as { revision: { content: Scenario }; parts: { fileName: string; renamedFrom: string | null }[]; contentHashMatches: boolean };
    expect(result.parts).toEqual([{ fileName: "telemetry-patch-2.s1p", reused: false, renamedFrom: "telemetry-patch.s1p" }]);
    expect(result.revision.content.blocks.find((b) => b.id === "ANT")?.file).toBe("parts/telemetry-patch-2.s1p");
    expect(result.contentHashMatches).toBe(false);
  });

  it("a reviewer cannot import (403) and nothing is written", async () => {
    const before = await countRows(scenarios);
    const response = await importBundle(reviewer.cookie, projectId, bundle);
    expect(response.status).toBe(403);
    expect(await countRows(scenarios)).toBe(before);
  });

  it("a body that is not multipart is refused (415)", async () => {
    const response = await call(importRoute.POST, makeRequest("POST", `/api/projects/${projectId}/bundles`, { cookie: engineer.cookie, body: { file: "x" } }), { projectId });
    expect(response.status).toBe(415);
  });
});

describe("hostile bundles are refused with their reason and nothing written", () => {
  /** The exported bundle with `change` applied to its entries, zipped again with the original manifest. */
  function altered(change: (files: Map<string, Uint8Array>) => void): Uint8Array {
    const files = readZipSafely(bundle);
    change(files);
    return writeRawZip([...files].map(([name, data]) => ({ name, data })));
  }

  const cases: [string, () => Uint8Array, number, RegExp, string | null][] = [
    ["a zip bomb (60 MB of zeros)", () => writeRawZip([{ name: "manifest.json", data: "{}" }, { name: "results/zeros.bin", data: new Uint8Array(60 * 1024 * 1024) }]), 413, /^Entry "results\/zeros.bin" takes the bundle past 52428800 bytes once unpacked/, "results/zeros.bin"],
    ["path traversal ../x", () => altered((f) => f.set("../x", new TextEncoder().encode("x"))), 422, /^Entry "\.\.\/x" is refused: its path climbs out of the bundle \(\.\.\)\.$/, "../x"],
    ["an absolute path /etc/x", () => altered((f) => f.set("/etc/x", new TextEncoder().encode("x"))), 422, /^Entry "\/etc\/x" is refused: it is an absolute path\.$/, "/etc/x"],
    ["a tampered part (hash mismatch)", () => altered((f) => f.set("parts/telemetry-patch.s1p", new TextEncoder().encode(PART_TEXT.replace("!", "! edited")))), 422, /^Entry "parts\/telemetry-patch.s1p" does not match manifest.json \(SHA-256 [0-9a-f]{12}…, expected [0-9a-f]{12}…\): the file was changed after export\.$/, "parts/telemetry-patch.s1p"],
    ["a missing manifest", () => altered((f) => f.delete("manifest.json")), 422, /^The bundle has no manifest.json, so its files cannot be verified\.$/, "manifest.json"],
    ["a file that is not a zip", () => new TextEncoder().encode("PK? no, just a text file pretending to be a bundle\n".repeat(20)), 422, /^The file is not a zip archive/, null],
  ];

  it.each(cases)("%s", async (_label, make, status, message, entry) => {
    const tables = [scenarios, scenarioRevisions, parts, auditEvents] as const;
    const before = await Promise.all(tables.map((t) => countRows(t)));
    const response = await importBundle(engineer.cookie, otherProjectId, make());
    expect(response.status).toBe(status);
    const body = (await response.json()) as ErrorJson;
    expect(body.error.message).toMatch(message);
    if (entry) expect(body.error.fields?.entry).toBe(entry);
    expect(await Promise.all(tables.map((t) => countRows(t)))).toEqual(before);
  });
});
