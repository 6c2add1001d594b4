// Touchstone parts: upload limits, malformed files, figures against scikit-rf/numpy, delete refused while in use.
import { beforeAll, describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { call, countRows, createAccount, makeRequest, setUpDatabase, ORIGIN, HOST, type ErrorJson } from "./helpers";
import * as projectsRoute from "@/app/api/projects/route";
import * as partsRoute from "@/app/api/projects/[projectId]/parts/route";
import * as partRoute from "@/app/api/projects/[projectId]/parts/[partId]/route";
import * as scenariosRoute from "@/app/api/projects/[projectId]/scenarios/route";
import * as revisionsRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/revisions/route";
import { db } from "@/db/client";
import { memberships, parts } from "@/db/schema";
import { PART_MAX_BYTES } from "@/lib/base/validation/parts";
import type { Scenario } from "@/engine/types";

type Account = Awaited<ReturnType<typeof createAccount>>;
let engineer: Account;
let reviewer: Account;
let stranger: Account;
let projectId: string;

type PartJson = {
  id: string;
  name: string;
  fileName: string;
  ports: number;
  version: string;
  points: number;
  startHz: number;
  stopHz: number;
  referenceOhms: [number, number][];
  maxSingular: number;
  reciprocityError: number;
  passivity: string;
  reciprocity: string;
  active: boolean;
  activeReason: string | null;
  preview: { label: string; hz: number[]; db: number[] };
  text?: string;
};

const FIXTURES = path.resolve("tests/fixtures/touchstone");

beforeAll(async () => {
  await setUpDatabase();
  engineer = await createAccount({ email: "eng@example.test" });
  reviewer = await createAccount({ email: "rev@example.test" });
  stranger = await createAccount({ email: "stranger@example.test" });
  const created = await call(projectsRoute.POST, makeRequest("POST", "/api/projects", { cookie: engineer.cookie, body: { name: "Parts bench" } }));
  projectId = ((await created.json()) as { project: { id: string } }).project.id;
  await db.insert(memberships).values([{ projectId, userId: reviewer.user.id, role: "reviewer" }]);
});

function uploadRequest(cookie: string, fileName: string, text: string | Blob, name?: string): Request {
  const form = new FormData();
  form.set("file", typeof text === "string" ? new Blob([text]) : text, fileName);
  if (name !== undefined) form.set("name", name);
  return new Request(`http://${HOST}/api/projects/${projectId}/parts`, { method: "POST", headers: { origin: ORIGIN, host: HOST, cookie }, body: form });
}

const upload = (cookie: string, fileName: string, text: string | Blob, name?: string) => call(partsRoute.POST, uploadRequest(cookie, fileName, text, name), { projectId });

/** σmax of S over frequency and max |Sij − Sji|, from scikit-rf 0.15.4 reading the file and numpy's SVD. */
function referenceFigures(file: string): { sigma: number; recip: number; f: number[] } {
  const script = [
    "import json, sys",
    "import numpy as np",
    "np.complex = complex; np.float = float; np.int = int",
    "import skrf",
    "n = skrf.Network(sys.argv[1])",
    "s = n.s",
    "sig = max(np.linalg.svd(m, compute_uv=False)[0] for m in s)",
    "rec = max(np.max(np.abs(m - m.T)) for m in s)",
    "print('RESULT ' + json.dumps({'sigma': float(sig), 'recip': float(rec), 'f': n.f.tolist()}))",
  ].join("\n");
  const run = spawnSync("/usr/bin/python3", ["-c", script, file], { encoding: "utf8" });
  if (run.status !== 0) throw new Error(run.stderr);
  // scikit-rf prints a matplotlib notice on import; the result is the line marked RESULT
  const line = run.stdout.split("\n").find((l) => l.startsWith("RESULT "));
  if (!line) throw new Error(`no result from scikit-rf: ${run.stdout}`);
  return JSON.parse(line.slice("RESULT ".length));
}

describe("uploading parts", () => {
  it("a 2-port 1.1 file is stored with port count, range, points, reference and figures matching scikit-rf", async () => {
    const file = path.join(FIXTURES, "twoport_ma_mhz.s2p");
    const response = await upload(engineer.cookie, "twoport_ma_mhz.s2p", readFileSync(file, "utf8"), "Synthetic filter");
    expect(response.status).toBe(201);
    const { part } = (await response.json()) as { part: PartJson };
    const ref = referenceFigures(file);
    expect(part).toMatchObject({ name: "Synthetic filter", fileName: "twoport_ma_mhz.s2p", ports: 2, version: "1.1", points: ref.f.length });
    expect(part.startHz).toBe(ref.f[0]);
    expect(part.stopHz).toBe(ref.f[ref.f.length - 1]);
    expect(part.referenceOhms).toEqual([
      [50, 0],
      [50, 0],
    ]);
    expect(part.maxSingular).toBeCloseTo(ref.sigma, 9);
    expect(part.reciprocityError).toBeCloseTo(ref.recip, 9);
    // measured data beyond 1e-6 warns, as the engine's data-quality check judges it (engine/checks/data-quality.ts)
    expect(part.passivity).toBe(ref.sigma <= 1 + 1e-6 ? "pass" : "warn");
    expect(part.reciprocity).toBe(ref.recip <= 1e-6 ? "pass" : "warn");
    expect(part.preview.label).toBe("|S21|");
    expect(part.preview.hz.length).toBe(ref.f.length);
  });

  it("an amplifier's data marks the part active, with σmax (numpy SVD via scikit-rf 0.15.4) and its gain as the reason", async () => {
    // S11 = S22 = 0.3, S21 = 10 (20 dB), S12 = 0.218 at every point: gain far above the 1 dB that calibration error gives
    const text = ["! measured amplifier", "# GHz S RI R 50", "1 0.3 0 10 0 0.218 0 0.3 0", "2 0.3 0 10 0 0.218 0 0.3 0", ""].join("\n");
    const file = path.join(tmpdir(), `portolan-amp-${process.pid}.s2p`);
    writeFileSync(file, text);
    const response = await upload(engineer.cookie, "amp.s2p", text);
    expect(response.status).toBe(201);
    const { part } = (await response.json()) as { part: PartJson };
    const ref = referenceFigures(file);
    expect(part.maxSingular).toBeCloseTo(ref.sigma, 12);
    expect(part.active).toBe(true);
    expect(part.activeReason).toBe(`its data shows gain: largest singular value ${ref.sigma.toFixed(3)} (${(20 * Math.log10(ref.sigma)).toFixed(2)} dB) at 1 GHz`);
    const passive = (await (await upload(engineer.cookie, "pad.s2p", "# GHz S RI R 50\n1 0 0 0.5 0 0.5 0 0 0\n")).json()) as { part: PartJson };
    expect([passive.part.active, passive.part.activeReason]).toEqual([false, null]);
    // leave the library as the later tests expect it
    for (const id of [part.id, passive.part.id]) {
      const del = await call(partRoute.DELETE, makeRequest("DELETE", `/api/projects/${projectId}/parts/${id}`, { cookie: engineer.cookie }), { projectId, partId: id });
      expect(del.status).toBeLessThan(300);
    }
  });

  it("a 2.0 file with per-port references keeps them (75 Ω and 100 Ω on ports 2 and 3)", async () => {
    const file = path.join(FIXTURES, "v2_threeport_full.s3p");
    const response = await upload(engineer.cookie, "v2_threeport_full.ts", readFileSync(file, "utf8"));
    expect(response.status).toBe(201);
    const { part } = (await response.json()) as { part: PartJson };
    expect(part).toMatchObject({ ports: 3, version: "2.0", name: "v2_threeport_full" });
    expect(part.referenceOhms.map(([re]) => re)).toEqual([50, 75, 100]);
  });

  it("a file name already in the project is a 409; nothing written", async () => {
    const before = await countRows(parts);
    const response = await upload(engineer.cookie, "twoport_ma_mhz.s2p", readFileSync(path.join(FIXTURES, "twoport_ma_mhz.s2p"), "utf8"));
    expect(response.status).toBe(409);
    expect(await countRows(parts)).toBe(before);
  });

  it("a malformed file is a 422 naming the line; nothing written", async () => {
    const before = await countRows(parts);
    const text = ["! broken", "# GHz S RI R 50", "1.0 0.1 0.0", "1.1 0.2 oops", ""].join("\n");
    const response = await upload(engineer.cookie, "broken.s1p", text);
    expect(response.status).toBe(422);
    const body = (await response.json()) as ErrorJson;
    expect(body.error.message).toMatch(/broken\.s1p:4/);
    expect(await countRows(parts)).toBe(before);
  });

  it("a record too short for the port count is a 422 naming its line", async () => {
    const text = ["# GHz S RI R 50", "1.0 0.1 0 0.9 0 0.9 0 0.1 0", "2.0 0.1 0 0.9 0", ""].join("\n");
    const response = await upload(engineer.cookie, "short.s2p", text);
    expect(response.status).toBe(422);
    expect(((await response.json()) as ErrorJson).error.message).toMatch(/short\.s2p:\d/);
  });

  it("a file over 5 MB is a 413 with the limit in the message; nothing written", async () => {
    const before = await countRows(parts);
    const line = "1.0 0.1 0.0\n";
    const big = "# GHz S RI R 50\n" + line.repeat(Math.ceil((PART_MAX_BYTES + 10) / line.length));
    const response = await upload(engineer.cookie, "huge.s1p", big);
    expect(response.status).toBe(413);
    expect(((await response.json()) as ErrorJson).error.message).toMatch(/5 MB/);
    expect(await countRows(parts)).toBe(before);
  });

  it("names that are not Touchstone files, non-multipart bodies and missing files are refused", async () => {
    expect((await upload(engineer.cookie, "notes.txt", "# GHz S RI R 50\n1 0 0\n")).status).toBe(400);
    const json = await call(partsRoute.POST, makeRequest("POST", `/api/projects/${projectId}/parts`, { cookie: engineer.cookie, body: { file: "x" } }), { projectId });
    expect(json.status).toBe(415);
    const empty = new Request(`http://${HOST}/api/projects/${projectId}/parts`, { method: "POST", headers: { origin: ORIGIN, host: HOST, cookie: engineer.cookie }, body: new FormData() });
    expect((await call(partsRoute.POST, empty, { projectId })).status).toBe(400);
  });

  it("reviewers cannot upload (403) and strangers do not see the project (404)", async () => {
    const text = readFileSync(path.join(FIXTURES, "oneport_ri_ghz.s1p"), "utf8");
    expect((await upload(reviewer.cookie, "one.s1p", text)).status).toBe(403);
    expect((await upload(stranger.cookie, "one.s1p", text)).status).toBe(404);
    const list = await call(partsRoute.GET, makeRequest("GET", `/api/projects/${projectId}/parts`, { cookie: reviewer.cookie }), { projectId });
    expect(list.status).toBe(200);
    const body = (await list.json()) as { parts: PartJson[] };
    expect(body.parts.map((p) => p.fileName).sort()).toEqual(["twoport_ma_mhz.s2p", "v2_threeport_full.ts"]);
    expect(body.parts[0].text).toBeUndefined();
    const withText = (await (await call(partsRoute.GET, makeRequest("GET", `/api/projects/${projectId}/parts?text=1`, { cookie: reviewer.cookie }), { projectId })).json()) as { parts: PartJson[] };
    expect(withText.parts.every((p) => typeof p.text === "string" && p.text.length > 0)).toBe(true);
  });
});

describe("deleting parts", () => {
  it("a part placed in a scenario's latest revision cannot be deleted (409 names the scenario); once removed it can", async () => {
    const text = readFileSync(path.join(FIXTURES, "oneport_ri_ghz.s1p"), "utf8");
    const { part } = (await (await upload(engineer.cookie, "antenna.s1p", text)).json()) as { part: PartJson };
    const scenario: Scenario = {
      format: "portolan.scenario/1",
      name: "Uses the antenna",
      z0: 50,
      frequency: { start: part.startHz, stop: part.stopHz, points: 3 },
      blocks: [{ id: "ANT", kind: "touchstone", file: "parts/antenna.s1p" }],
      links: [],
      ports: [{ name: "A", at: "ANT:1" }],
    };
    const created = (await (await call(scenariosRoute.POST, makeRequest("POST", `/api/projects/${projectId}/scenarios`, { cookie: engineer.cookie, body: { name: "Uses the antenna", scenario } }), { projectId })).json()) as {
      scenario: { id: string };
      revision: { id: string; warnings: string[] };
    };
    expect(created.revision.warnings).toEqual([]);
    const del = (cookie: string) => call(partRoute.DELETE, makeRequest("DELETE", `/api/projects/${projectId}/parts/${part.id}`, { cookie }), { projectId, partId: part.id });
    expect((await del(reviewer.cookie)).status).toBe(403);
    const refused = await del(engineer.cookie);
    expect(refused.status).toBe(409);
    const body = (await refused.json()) as ErrorJson & { scenarios: string[] };
    expect(body.scenarios).toEqual(["Uses the antenna"]);
    expect(body.error.message).toContain("Uses the antenna");

    const scenarioId = created.scenario.id;
    const emptied = { ...scenario, blocks: [], ports: [] };
    const saved = await call(revisionsRoute.POST, makeRequest("POST", `/api/projects/${projectId}/scenarios/${scenarioId}/revisions`, { cookie: engineer.cookie, body: { baseRevisionId: created.revision.id, scenario: emptied } }), {
      projectId,
      scenarioId,
    });
    expect(saved.status).toBe(201);
    expect((await del(engineer.cookie)).status).toBe(204);
    const gone = await call(partRoute.GET, makeRequest("GET", `/api/projects/${projectId}/parts/${part.id}`, { cookie: engineer.cookie }), { projectId, partId: part.id });
    expect(gone.status).toBe(404);
  });
});
