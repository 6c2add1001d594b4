// Check runs: run a check on the server on a scenario revision, store it, read the history back.
// The demo project (db/seed.ts, db/seed-scenarios.ts): "Baseline" meets TX→RX isolation ≥ 30 dB,
// "Cheaper switch" (T/R switch isolation 25 dB instead of 45 dB) does not.
import { beforeAll, describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdirSync, mkdtempSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import { call, countRows, createAccount, makeRequest, setUpDatabase, type ErrorJson } from "./helpers";
import * as runsRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/check-runs/route";
import * as runRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/check-runs/[runId]/route";
import * as revisionsRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/revisions/route";
import * as rulesRoute from "@/app/api/projects/[projectId]/rules/route";
import * as jobRoute from "@/app/api/projects/[projectId]/jobs/[jobId]/route";
import { db } from "@/db/client";
import { checkRuns, scenarioRevisions, scenarios, users } from "@/db/schema";
import { DEMO_USERS, seedDemo } from "@/db/seed";
import { DEMO_RULES } from "@/db/seed-scenarios";
import { getPartTexts } from "@/db/queries/parts";
import { createSessionForUser } from "@/lib/server/auth/session";
import type { CheckRunSummary, CheckRunView } from "@/lib/domain/checks/types";
import type { RuleResult, LeakTraceResult, AllChecksResult, DriveResult, StateSweepResult } from "@/engine/checks";
import type { Scenario } from "@/engine/types";

let projectId: string;
const cookies: Record<"owner" | "engineer" | "reviewer", string> = { owner: "", engineer: "", reviewer: "" };
const scenarioIds: Record<string, string> = {};

beforeAll(async () => {
  await setUpDatabase();
  const seeded = await seedDemo();
  projectId = seeded.projectId!;
  for (const demo of DEMO_USERS) {
    const [row] = await db.select({ id: users.id }).from(users).where(eq(users.email, demo.email));
    cookies[demo.role] = `portolan_session=${(await createSessionForUser(row.id)).token}`;
  }
  for (const row of await db.select().from(scenarios).where(eq(scenarios.projectId, projectId))) scenarioIds[row.name] = row.id;
});

const base = (scenarioId: string) => `/api/projects/${projectId}/scenarios/${scenarioId}/check-runs`;

async function post(cookie: string, scenarioId: string, body: unknown): Promise<Response> {
  return call(runsRoute.POST, makeRequest("POST", base(scenarioId), { cookie, body }), { projectId, scenarioId });
}

async function history(cookie: string, scenarioId: string): Promise<CheckRunSummary[]> {
  const res = await call(runsRoute.GET, makeRequest("GET", base(scenarioId), { cookie }), { projectId, scenarioId });
  expect(res.status).toBe(200);
  return ((await res.json()) as { runs: CheckRunSummary[] }).runs;
}

/** Polls GET …/jobs/:id until the job has finished (no clock: the loop yields to the job between polls). */
async function waitForJob(cookie: string, jobId: string): Promise<{ state: string; runId: string | null; error: unknown }> {
  for (;;) {
    const res = await call(jobRoute.GET, makeRequest("GET", `/api/projects/${projectId}/jobs/${jobId}`, { cookie }), { projectId, jobId });
    expect(res.status).toBe(200);
    const { job } = (await res.json()) as { job: { state: string; runId: string | null; error: unknown } };
    if (!["queued", "running"].includes(job.state)) return job;
    await new Promise((resolve) => setTimeout(resolve, 20));
  }
}

/** `portolan check --json` on files written from a revision, as a second, independent path through the engine (the CLI reads files). */
function cliCheck(content: unknown, partTexts: Record<string, string>): AllChecksResult {
  const dir = mkdtempSync(path.join(os.tmpdir(), "portolan-runs-"));
  mkdirSync(path.join(dir, "parts"));
  for (const [file, text] of Object.entries(partTexts)) writeFileSync(path.join(dir, file), text);
  writeFileSync(path.join(dir, "scenario.json"), JSON.stringify(content));
  const run = spawnSync(process.execPath, [path.resolve("node_modules/tsx/dist/cli.mjs"), path.resolve("engine/cli.ts"), "check", "scenario.json", "--json"], { cwd: dir, encoding: "utf8" });
  if (run.status === 2 || run.stdout.trim() === "") throw new Error(run.stderr);
  return JSON.parse(run.stdout) as AllChecksResult;
}

const ISOLATION = { check: "isolation", inputs: { from: "TX", to: "RX", band: [2.4e9, 2.48e9], min_db: 30 } };

describe("running checks", () => {
  it("an isolation check on Cheaper switch fails, is stored against the latest revision, and agrees with the command line", async () => {
    const id = scenarioIds["Cheaper switch"];
    const res = await post(cookies.engineer, id, ISOLATION);
    expect(res.status).toBe(201);
    const { run } = (await res.json()) as { run: CheckRunView };
    const [latest] = await db.select().from(scenarios).where(eq(scenarios.id, id));
    expect(run.revisionId).toBe(latest.latestRevisionId);
    expect(run.revisionNumber).toBe(1);
    expect(run.verdict).toBe("fail");
    const result = run.figures.result as RuleResult;
    const [revision] = await db.select().from(scenarioRevisions).where(eq(scenarioRevisions.id, latest.latestRevisionId!));
    // the CLI on the scenario file with the project rule written into it (the stored file inherits it)
    const cli = cliCheck({ ...(revision.content as object), rules: DEMO_RULES }, await getPartTexts({ projectId }));
    const reference = cli.rules.find((r) => r.id === "tx-rx-isolation")!;
    // same rule, same band, same data: the CLI's worst isolation and its frequency, to rounding
    expect(result.worst).toBeCloseTo(reference.worst, 9);
    expect(result.worstHz).toBe(reference.worstHz);
    expect(result.margin).toBeCloseTo(reference.worst - 30, 9);
    expect(result.margin).toBeLessThan(0);
    const [row] = await db.select().from(checkRuns).where(eq(checkRuns.id, run.id));
    expect(row.revisionId).toBe(latest.latestRevisionId);
    expect(row.check).toBe("isolation");
    expect(row.inputs).toEqual(ISOLATION.inputs);
  });

  it("a run on an older revision stays tied to that revision after the scenario moves on", async () => {
    const id = scenarioIds.Baseline;
    const [row] = await db.select().from(scenarios).where(eq(scenarios.id, id));
    const first = row.latestRevisionId!;
    const [rev1] = await db.select().from(scenarioRevisions).where(eq(scenarioRevisions.id, first));
    const content = rev1.content as unknown as Scenario;
    // revision 2: the T/R switch loses 20 dB of isolation, as in Cheaper switch
    const edited = { ...content, blocks: content.blocks.map((b) => (b.id === "TR" ? { ...b, params: { ...b.params, isolation_db: 25 } } : b)) };
    const saved = await call(
      revisionsRoute.POST,
      makeRequest("POST", `/api/projects/${projectId}/scenarios/${id}/revisions`, { cookie: cookies.engineer, body: { baseRevisionId: first, scenario: edited } }),
      { projectId, scenarioId: id },
    );
    expect(saved.status).toBe(201);
    const second = ((await saved.json()) as { revision: { id: string; number: number } }).revision;
    expect(second.number).toBe(2);

    const onLatest = (await (await post(cookies.engineer, id, ISOLATION)).json()) as { run: CheckRunView };
    const onFirst = (await (await post(cookies.engineer, id, { ...ISOLATION, revisionId: first })).json()) as { run: CheckRunView };
    expect(onLatest.run.revisionId).toBe(second.id);
    expect(onLatest.run.verdict).toBe("fail");
    expect(onFirst.run.revisionId).toBe(first);
    expect(onFirst.run.revisionNumber).toBe(1);
    expect(onFirst.run.verdict).toBe("pass");
    // Hand reasoning from the switch model (docs/blocks.md "switch": an off throw passes 10^(−isolation_db/20)):
    // TX reaches RX through the T/R switch's off path, so 20 dB less switch isolation is 20 dB less TX→RX
    // isolation, up to the much weaker paths around it (e.g. via the antenna switch and reflections).
    const worst1 = (onFirst.run.figures.result as RuleResult).worst;
    const worst2 = (onLatest.run.figures.result as RuleResult).worst;
    expect(worst1 - worst2).toBeGreaterThan(19.9);
    expect(worst1 - worst2).toBeLessThan(20.1);

    const list = await history(cookies.reviewer, id);
    expect(list.map((r) => [r.revisionNumber, r.verdict])).toEqual([
      [1, "pass"],
      [2, "fail"],
    ]);
    expect(list[0]).not.toHaveProperty("figures");
    const one = await call(runRoute.GET, makeRequest("GET", `${base(id)}/${onFirst.run.id}`, { cookie: cookies.reviewer }), { projectId, scenarioId: id, runId: onFirst.run.id });
    expect(one.status).toBe(200);
    const got = ((await one.json()) as { run: CheckRunView }).run;
    expect(got.revisionId).toBe(first);
    expect((got.figures.result as RuleResult).verdict).toBe("pass");
    // a run is not visible under another scenario
    const other = scenarioIds["Cheaper switch"];
    const cross = await call(runRoute.GET, makeRequest("GET", `${base(other)}/${onFirst.run.id}`, { cookie: cookies.reviewer }), { projectId, scenarioId: other, runId: onFirst.run.id });
    expect(cross.status).toBe(404);
  });

  it("a reviewer may run checks (check.run) but not add rules (rule.edit)", async () => {
    const id = scenarioIds["Cheaper switch"];
    const before = await countRows(checkRuns);
    const res = await post(cookies.reviewer, id, { check: "leak_trace", inputs: { from: "TX", to: "RX", band: [2.4e9, 2.48e9] } });
    expect(res.status).toBe(201);
    const { run } = (await res.json()) as { run: CheckRunView };
    const trace = run.figures.result as LeakTraceResult;
    expect(trace.paths.length).toBeGreaterThan(0);
    // the strongest leak path crosses the T/R switch (the part that differs from Baseline)
    expect(trace.paths[0].hops.some((h) => h.block === "TR")).toBe(true);
    expect(run.userName).toBe("Rhea Reviewer");
    expect(await countRows(checkRuns)).toBe(before + 1);
    const rule = await call(
      rulesRoute.POST,
      makeRequest("POST", `/api/projects/${projectId}/rules`, { cookie: cookies.reviewer, body: { spec: { kind: "isolation", id: "x", from: "TX", to: "RX", band: [2.4e9, 2.48e9], min_db: 20 } } }),
      { projectId },
    );
    expect(rule.status).toBe(403);
  });

  it("run all rules merges the project's rules with the scenario's own and reports the one that fails", async () => {
    const id = scenarioIds["Cheaper switch"];
    const res = await post(cookies.engineer, id, { check: "all_rules", inputs: {} });
    expect(res.status).toBe(201);
    const { run } = (await res.json()) as { run: CheckRunView };
    const result = run.figures.result as AllChecksResult;
    // the scenario repeats the three project rules word for word: they are evaluated once
    expect(result.rules.map((r) => [r.id, r.verdict])).toEqual([
      ["tx-rx-isolation", "fail"],
      ["tx-match", "pass"],
      ["tx-ant-loss", "pass"],
    ]);
    expect(run.figures.ruleSources?.every((s) => s.source === "project")).toBe(true);
    expect(run.verdict).toBe("fail");
  });

  it("a state sweep tabulates both T/R switch settings for both switches (4 combinations)", async () => {
    const id = scenarioIds["Cheaper switch"];
    const res = await post(cookies.engineer, id, { check: "state_sweep", inputs: {} });
    // a state sweep is a long job: 202 with a job id, followed until it is done (lib/server/jobs)
    expect(res.status).toBe(202);
    const { job } = (await res.json()) as { job: { id: string } };
    const done = await waitForJob(cookies.engineer, job.id);
    expect(done.state).toBe("done");
    const runRes = await call(runRoute.GET, makeRequest("GET", `${base(id)}/${done.runId}`, { cookie: cookies.engineer }), { projectId, scenarioId: id, runId: done.runId! });
    const result = ((await runRes.json()) as { run: CheckRunView }).run.figures.result as StateSweepResult;
    // two 2-throw switches (TR, ASW): 2 × 2 combinations
    expect(result.combinations).toBe(4);
    expect(result.rows).toHaveLength(4);
    expect(result.rules.map((r) => r.id)).toEqual(["tx-rx-isolation", "tx-match", "tx-ant-loss"]);
  });

  it("a drive check needs source powers when the scenario has no drive rule, and carries the cautions", async () => {
    const id = scenarioIds["Cheaper switch"];
    const before = await countRows(checkRuns);
    const none = await post(cookies.engineer, id, { check: "drive", inputs: {} });
    expect(none.status).toBe(422);
    expect(await countRows(checkRuns)).toBe(before);
    const res = await post(cookies.engineer, id, { check: "drive", inputs: { sources: [{ port: "TX", dbm: 30 }] } });
    expect(res.status).toBe(201);
    const result = ((await res.json()) as { run: CheckRunView }).run.figures.result as DriveResult;
    expect(result.cautions.length).toBeGreaterThan(0);
    expect(result.cautions.join(" ")).toMatch(/qualified people/);
  });
});

describe("bad input stores nothing", () => {
  it("malformed requests are 400 with field messages", async () => {
    const id = scenarioIds.Baseline;
    const before = await countRows(checkRuns);
    const cases: unknown[] = [
      { check: "isolation", inputs: { from: "TX", to: "RX", min_db: 30 } }, // no band
      { check: "isolation", inputs: { from: "TX", to: "RX", band: [2.48e9, 2.4e9], min_db: 30 } }, // reversed band
      { check: "isolation", inputs: { ...ISOLATION.inputs, extra: 1 } }, // unknown field
      { check: "everything", inputs: {} },
      { check: "match", inputs: { port: "TX", band: [2.4e9, 2.48e9] } }, // no limit
      { check: "power_ledger", inputs: { port: "TX" }, revisionId: "" },
    ];
    for (const body of cases) {
      const res = await post(cookies.engineer, id, body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(((await res.json()) as ErrorJson).error.code).toBe("validation_failed");
    }
    const notJson = await call(runsRoute.POST, makeRequest("POST", base(id), { cookie: cookies.engineer, rawBody: "{check:" }), { projectId, scenarioId: id });
    expect(notJson.status).toBe(400);
    expect(await countRows(checkRuns)).toBe(before);
  });

  it("inputs that do not fit the scenario are 422 naming the problem", async () => {
    const id = scenarioIds.Baseline;
    const before = await countRows(checkRuns);
    const unknownPort = await post(cookies.engineer, id, { check: "isolation", inputs: { ...ISOLATION.inputs, to: "NOPE" } });
    expect(unknownPort.status).toBe(422);
    expect(((await unknownPort.json()) as ErrorJson).error.message).toMatch(/NOPE/);
    // the plan is 2.3–2.6 GHz: a band at 5 GHz holds no plan point
    const outside = await post(cookies.engineer, id, { check: "isolation", inputs: { ...ISOLATION.inputs, band: [5e9, 5.1e9] } });
    expect(outside.status).toBe(422);
    expect(await countRows(checkRuns)).toBe(before);
  });

  it("a revision of another scenario, a non-member and a signed-out visitor are refused", async () => {
    const id = scenarioIds.Baseline;
    const [other] = await db.select().from(scenarios).where(eq(scenarios.id, scenarioIds["Cheaper switch"]));
    const before = await countRows(checkRuns);
    expect((await post(cookies.engineer, id, { ...ISOLATION, revisionId: other.latestRevisionId })).status).toBe(404);
    const stranger = await createAccount({ email: "stranger@example.com" });
    expect((await post(stranger.cookie, id, ISOLATION)).status).toBe(404);
    expect((await call(runsRoute.GET, makeRequest("GET", base(id), { cookie: stranger.cookie }), { projectId, scenarioId: id })).status).toBe(404);
    expect((await post("", id, ISOLATION)).status).toBe(401);
    expect(await countRows(checkRuns)).toBe(before);
  });
});
