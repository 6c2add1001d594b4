// A bundle exported through the route states the switch setting its verdicts used, carries the state
// sweep summary (the same as the app's state sweep run through the job pool) and the drive check table,
// and its report says whether the verdict holds in every switch setting (issue 18 item 3).
import { beforeAll, describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { call, createAccount, HOST, makeRequest, ORIGIN, setUpDatabase } from "./helpers";
import * as projectsRoute from "@/app/api/projects/route";
import * as partsRoute from "@/app/api/projects/[projectId]/parts/route";
import * as scenariosRoute from "@/app/api/projects/[projectId]/scenarios/route";
import * as bundleRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/bundle/route";
import { readZipSafely, type BundleManifest, type ChecksDocument } from "@/engine/bundle";
import type { StateSweepResult } from "@/engine/checks";
import type { Scenario } from "@/engine/types";
import { DEMO_PART_FILES, DEMO_RULES, kestrelScenario, patchAntennaTouchstone, resonatorFilterTouchstone } from "@/db/seed-scenarios";
import { resolveAccess } from "@/lib/server/permissions";
import { runCheck } from "@/lib/server/check-runs";

let cookie: string;
let userId: string;
let projectId: string;
let scenarioId: string;
let content: Scenario;
let files: Map<string, string>;

async function uploadPart(fileName: string, text: string): Promise<void> {
  const form = new FormData();
  form.set("file", new Blob([text]), fileName);
  const request = new Request(`http://${HOST}/api/projects/${projectId}/parts`, { method: "POST", headers: { origin: ORIGIN, host: HOST, cookie }, body: form });
  expect((await call(partsRoute.POST, request, { projectId })).status).toBe(201);
}

beforeAll(async () => {
  await setUpDatabase();
  const owner = await createAccount({ email: "sweep-owner@example.test", name: "Sam Sweep" });
  cookie = owner.cookie;
  userId = owner.user.id;
  const created = await call(projectsRoute.POST, makeRequest("POST", "/api/projects", { cookie, body: { name: "Switch settings" } }));
  projectId = ((await created.json()) as { project: { id: string } }).project.id;
  await uploadPart(DEMO_PART_FILES.filter, resonatorFilterTouchstone());
  await uploadPart(DEMO_PART_FILES.antenna, patchAntennaTouchstone());
  // the demo front end (T/R switch TR and antenna switch ASW, both on throw 1) with the demo rules and a
  // drive rule as its own rules; the LNA is rated 10 dBm
  const base = kestrelScenario("Sweep story", 45);
  const scenario = { ...base, rules: [...DEMO_RULES, { kind: "drive", id: "tx-drive", sources: [{ port: "TX", dbm: 20 }], band: [2.4e9, 2.48e9] }] };
  const res = await call(scenariosRoute.POST, makeRequest("POST", `/api/projects/${projectId}/scenarios`, { cookie, body: { name: "Sweep story", scenario } }), { projectId });
  expect(res.status).toBe(201);
  const body = (await res.json()) as { scenario: { id: string }; revision: { content: Scenario } };
  scenarioId = body.scenario.id;
  content = body.revision.content;
  const bundle = await call(bundleRoute.GET, makeRequest("GET", `/api/projects/${projectId}/scenarios/${scenarioId}/bundle`, { cookie }), { projectId, scenarioId });
  expect(bundle.status).toBe(200);
  const bytes = new Uint8Array(await bundle.arrayBuffer());
  files = new Map([...readZipSafely(bytes)].map(([name, data]) => [name, new TextDecoder().decode(data)]));
  const dir = mkdtempSync(path.join(os.tmpdir(), "portolan-api-sweep-"));
  const zipPath = path.join(dir, "bundle.zip");
  writeFileSync(zipPath, bytes);
  files.set("(path)", zipPath);
});

describe("switch settings in an exported bundle", () => {
  it("manifest, checks.json and checks.csv name the switch setting of the saved scenario", () => {
    const expected = content.blocks
      .filter((b) => b.kind === "switch")
      .map((b) => ({ block: b.id, ...(b.label ? { label: b.label } : {}), throws: (b.params as { throws: number }).throws, state: b.state ?? 1 }));
    expect(expected.map((s) => s.block)).toEqual(["TR", "ASW"]);
    const manifest = JSON.parse(files.get("manifest.json")!) as BundleManifest;
    const doc = JSON.parse(files.get("results/checks.json")!) as ChecksDocument;
    expect(manifest.switch_states).toEqual(expected);
    expect(doc.switch_states).toEqual(expected);
    const csv = files.get("results/checks.csv")!.trimEnd().split("\r\n");
    expect(csv.find((l) => l.startsWith("rule:tx-rx-isolation,"))!.endsWith(",TR=1 ASW=1")).toBe(true);
  });

  it("the sweep summary is what the state sweep check gives when run through the job pool", async () => {
    const doc = JSON.parse(files.get("results/checks.json")!) as ChecksDocument;
    const access = await resolveAccess({ userId, projectId });
    const run = await runCheck({ access, scenarioId, request: { check: "state_sweep", inputs: {} } });
    const direct = run.figures.result as StateSweepResult;
    const sweep = doc.sweep!;
    expect(sweep.combinations).toBe(4);
    expect([sweep.combinations, sweep.passing, sweep.failing]).toEqual([direct.combinations, direct.passing, direct.failing]);
    // with TR on the receive throw, TX no longer reaches ANT-A: the loss rule cannot hold in every setting
    expect(sweep.holds_in_every_setting).toBe(false);
    for (const [j, rule] of direct.rules.entries()) {
      const margins = direct.rows.map((r) => r.cells[j].margin);
      const at = margins.indexOf(Math.min(...margins));
      const summary = sweep.rules.find((r) => r.id === rule.id)!;
      expect(summary.worst_margin).toBeCloseTo(margins[at], 9);
      expect(summary.worst_states).toEqual(direct.rows[at].states);
    }
    // TX to ANT-A is worst with both switches away from it (TR on receive, ASW on ANT-B): two isolations in the path
    expect(sweep.rules.find((r) => r.id === "tx-ant-loss")!.worst_states).toEqual([2, 2]);
  });

  it("the drive table is ordered failures first, smallest margin next, unrated parts last", () => {
    const doc = JSON.parse(files.get("results/checks.json")!) as ChecksDocument;
    const [table] = doc.drive!;
    expect(table.rule).toBe("tx-drive");
    const rank = (v: string | null) => (v === "fail" ? 0 : v === "warn" ? 1 : v === "pass" ? 2 : 3);
    for (let i = 1; i < table.rows.length; i++) {
      const a = table.rows[i - 1];
      const b = table.rows[i];
      expect(rank(a.verdict)).toBeLessThanOrEqual(rank(b.verdict));
      if (a.verdict === b.verdict && a.margin !== null && b.margin !== null) expect(a.margin).toBeLessThanOrEqual(b.margin);
      if (a.verdict === null && b.verdict === null) expect(a.worstDbm).toBeGreaterThanOrEqual(b.worstDbm);
    }
    // the LNA is the one rated part; every other block follows it, unrated
    expect(table.rows[0]).toMatchObject({ block: "LNA", ratingDbm: 10 });
    expect(table.rows.slice(1).every((r) => r.ratingDbm === null)).toBe(true);
  });

  it("report.html heads with whether the verdict holds in every setting and shows the sweep and the drive check; the CLI reproduces them", () => {
    const report = files.get("report.html")!;
    expect(report).toContain('data-testid="sweep-headline"');
    expect(report).toContain("Not shown to hold in every switch setting.");
    expect(report).toContain("This verdict is for the setting shown (TR=1 ASW=1) only");
    expect(report).toContain("<h2>State sweep: every switch setting</h2>");
    expect(report).toContain("<h2>Drive check</h2>");
    expect(report).toContain("<h2>Switch setting judged</h2>");
    expect(report).toContain("RF power can burn people and destroy parts.");
    const run = spawnSync(process.execPath, [path.resolve("node_modules/tsx/dist/cli.mjs"), path.resolve("engine/cli.ts"), "check", files.get("(path)")!], { encoding: "utf8" });
    expect(run.stdout).toContain("REPRODUCED");
    expect(run.stdout).toMatch(/same +state sweep/);
    expect(run.stdout).toMatch(/same +drive:tx-drive/);
    expect(run.stdout).toMatch(/same +manifest switch settings/);
    expect([0, 1]).toContain(run.status);
  });
});
