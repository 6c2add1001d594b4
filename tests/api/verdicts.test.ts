// One truth for verdicts (issue 11), through the route handlers on the demo project: a project rule
// tightened until "Baseline" fails it marks the earlier verdict stale, fails the bundle's checks.json,
// csv and report and the CLI's re-check (exit 1); a bare approval is 409, an approval with a waiver is
// stored, audited and carried by the next bundle; an unsolvable revision cannot be put up for sign-off.
// Expected figures come from the engine's own earlier run (no hard-coded isolation), and the limit logic
// is the rule definition of docs/checks.md (isolation: margin = worst − min_db, fail when negative).
import { beforeAll, describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { and, eq } from "drizzle-orm";
import { call, makeRequest, setUpDatabase, type ErrorJson } from "./helpers";
import * as runsRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/check-runs/route";
import * as verdictRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/verdict/route";
import * as revisionsRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/revisions/route";
import * as bundleRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/bundle/route";
import * as ruleRoute from "@/app/api/projects/[projectId]/rules/[ruleId]/route";
import * as signoffsRoute from "@/app/api/projects/[projectId]/signoffs/route";
import * as decideRoute from "@/app/api/projects/[projectId]/signoffs/[signoffId]/decide/route";
import { db } from "@/db/client";
import { auditEvents, checkRuns, rules, scenarioRevisions, scenarios, signoffs, users } from "@/db/schema";
import { DEMO_USERS, seedDemo } from "@/db/seed";
import { DEMO_RULES } from "@/db/seed-scenarios";
import { migrateScenarioRules } from "@/db/migrate-scenario-rules";
import { readZipSafely, type ChecksDocument } from "@/engine/bundle";
import { ENGINE_VERSION } from "@/engine/version";
import type { RuleResult } from "@/engine/checks";
import type { Scenario } from "@/engine/types";
import { createSessionForUser } from "@/lib/server/auth/session";
import type { CheckRunSummary } from "@/lib/domain/checks/types";
import { projectRuleUsage, projectVerdicts, type RevisionVerdict } from "@/lib/server/verdicts";

let projectId: string;
const cookies: Record<"owner" | "engineer" | "reviewer", string> = { owner: "", engineer: "", reviewer: "" };
const ids: Record<"owner" | "engineer" | "reviewer", string> = { owner: "", engineer: "", reviewer: "" };
const scenarioIds: Record<string, string> = {};
let baselineWorst = 0;
let tightened = 0;

beforeAll(async () => {
  await setUpDatabase();
  projectId = (await seedDemo()).projectId!;
  for (const demo of DEMO_USERS) {
    const [row] = await db.select({ id: users.id }).from(users).where(eq(users.email, demo.email));
    ids[demo.role] = row.id;
    cookies[demo.role] = `portolan_session=${(await createSessionForUser(row.id)).token}`;
  }
  for (const row of await db.select().from(scenarios).where(eq(scenarios.projectId, projectId))) scenarioIds[row.name] = row.id;
});

const scenarioBase = (scenarioId: string) => `/api/projects/${projectId}/scenarios/${scenarioId}`;

async function verdict(cookie: string, scenarioId: string, method: "GET" | "POST", revisionId?: string): Promise<{ status: number; body: { verdict: RevisionVerdict } & ErrorJson }> {
  const handler = method === "GET" ? verdictRoute.GET : verdictRoute.POST;
  const url = `${scenarioBase(scenarioId)}/verdict${method === "GET" && revisionId ? `?revisionId=${revisionId}` : ""}`;
  const res = await call(handler, makeRequest(method, url, { cookie, ...(method === "POST" ? { body: revisionId ? { revisionId } : {} } : {}) }), { projectId, scenarioId });
  return { status: res.status, body: (await res.json()) as { verdict: RevisionVerdict } & ErrorJson };
}

async function history(scenarioId: string): Promise<CheckRunSummary[]> {
  const res = await call(runsRoute.GET, makeRequest("GET", `${scenarioBase(scenarioId)}/check-runs`, { cookie: cookies.engineer }), { projectId, scenarioId });
  return ((await res.json()) as { runs: CheckRunSummary[] }).runs;
}

/** The bundle's files as text, and where it was written (for the CLI). */
async function bundleOf(scenarioId: string): Promise<Map<string, string>> {
  const res = await call(bundleRoute.GET, makeRequest("GET", `${scenarioBase(scenarioId)}/bundle`, { cookie: cookies.reviewer }), { projectId, scenarioId });
  expect(res.status).toBe(200);
  const bytes = new Uint8Array(await res.arrayBuffer());
  const dir = mkdtempSync(path.join(os.tmpdir(), "portolan-verdicts-"));
  writeFileSync(path.join(dir, "bundle.zip"), bytes);
  const files = new Map([...readZipSafely(bytes)].map(([name, data]) => [name, new TextDecoder().decode(data)]));
  files.set("(path)", path.join(dir, "bundle.zip"));
  return files;
}

async function setProjectRule(id: string, change: Record<string, unknown>): Promise<void> {
  const [row] = (await db.select().from(rules).where(eq(rules.projectId, projectId))).filter((r) => (r.spec as { id?: string }).id === id);
  const res = await call(ruleRoute.PUT, makeRequest("PUT", `/api/projects/${projectId}/rules/${row.id}`, { cookie: cookies.engineer, body: { spec: { ...row.spec, ...change } } }), { projectId, ruleId: row.id });
  expect(res.status).toBe(200);
}

async function saveRevision(scenarioId: string, edit: (s: Scenario) => Scenario): Promise<{ id: string; number: number }> {
  const [row] = await db.select().from(scenarios).where(eq(scenarios.id, scenarioId));
  const [rev] = await db.select().from(scenarioRevisions).where(eq(scenarioRevisions.id, row.latestRevisionId!));
  const res = await call(
    revisionsRoute.POST,
    makeRequest("POST", `${scenarioBase(scenarioId)}/revisions`, { cookie: cookies.engineer, body: { baseRevisionId: rev.id, scenario: edit(rev.content as unknown as Scenario) } }),
    { projectId, scenarioId },
  );
  expect(res.status).toBe(201);
  return ((await res.json()) as { revision: { id: string; number: number } }).revision;
}

describe("verdict identity and the effective rule set", () => {
  it("the baseline's verdict is judged by the project's rules and records revision, rules hash and engine version", async () => {
    const { status, body } = await verdict(cookies.engineer, scenarioIds.Baseline, "POST");
    expect(status).toBe(200);
    const v = body.verdict;
    expect(v.run?.verdict).toBe("pass");
    expect(v.ruleSet.rules.map((r) => [r.id, r.source])).toEqual(DEMO_RULES.map((r) => [r.id, "project"]));
    expect(v.rulesHash).toMatch(/^[0-9a-f]{64}$/);
    const [row] = await db.select().from(checkRuns).where(eq(checkRuns.id, v.run!.id));
    expect([row.contentHash, row.rulesHash, row.engineVersion]).toEqual([v.contentHash, v.rulesHash, ENGINE_VERSION]);
    const iso = v.run!.figures.result.rules.find((r: RuleResult) => r.id === "tx-rx-isolation")!;
    baselineWorst = iso.worst;
    expect(iso.margin).toBeCloseTo(iso.worst - 30, 9); // docs/checks.md: isolation margin = worst − min_db
    // a second open reuses the current run instead of running again
    expect((await verdict(cookies.reviewer, scenarioIds.Baseline, "POST")).body.verdict.run!.id).toBe(v.run!.id);
  });

  it("tightening the project rule past the baseline marks that verdict stale, and a re-run fails naming the rule", async () => {
    tightened = Math.ceil(baselineWorst) + 5;
    await setProjectRule("tx-rx-isolation", { min_db: tightened });
    const [latestRun] = (await history(scenarioIds.Baseline)).filter((r) => r.check === "all_rules");
    expect(latestRun.stale).toEqual(["the rules changed since it ran"]);
    expect(latestRun.latest).toBe(true);
    expect((await verdict(cookies.engineer, scenarioIds.Baseline, "GET")).body.verdict.run).toBeNull();
    const overview = await projectVerdicts({ userId: ids.reviewer, projectId });
    expect(overview.find((r) => r.scenarioName === "Baseline")).toMatchObject({ state: "stale", verdict: "pass", reasons: ["the rules changed since it ran"] });
    const { body } = await verdict(cookies.engineer, scenarioIds.Baseline, "POST");
    expect(body.verdict.run?.verdict).toBe("fail");
    expect(body.verdict.failing).toEqual(["tx-rx-isolation"]);
    const iso = body.verdict.run!.figures.result.rules.find((r: RuleResult) => r.id === "tx-rx-isolation")!;
    expect(iso.worst).toBeCloseTo(baselineWorst, 9);
    expect(iso.margin).toBeCloseTo(baselineWorst - tightened, 9);
  });

  it("the bundle's checks.json, checks.csv and report.html fail naming the rule, and `portolan check` exits 1", async () => {
    const files = await bundleOf(scenarioIds.Baseline);
    const doc = JSON.parse(files.get("results/checks.json")!) as ChecksDocument;
    expect(doc.verdict).toBe("fail");
    expect(doc.engine_version).toBe(ENGINE_VERSION);
    expect(doc.rules.find((r) => r.id === "tx-rx-isolation")).toMatchObject({ source: "project", verdict: "fail", limit: tightened });
    expect(doc.rule_set.rules.map((r) => r.source)).toEqual(["project", "project", "project"]);
    const csv = files.get("results/checks.csv")!.split("\r\n");
    expect(csv.find((line) => line.startsWith("rule:tx-rx-isolation,"))).toMatch(/^rule:tx-rx-isolation,project,[^,]*,fail,/);
    expect(csv.find((line) => line.startsWith("overall,"))).toContain(",fail,");
    const report = files.get("report.html")!;
    expect(report).toContain('<span class="fail">FAIL</span>');
    expect(report).toMatch(/tx-rx-isolation<\/td><td>project<\/td><td>isolation ≥ \d+ dB \(TX → RX\)/);
    const run = spawnSync(process.execPath, [path.resolve("node_modules/tsx/dist/cli.mjs"), path.resolve("engine/cli.ts"), "check", files.get("(path)")!], { encoding: "utf8" });
    expect(run.status).toBe(1);
    expect(run.stdout).toContain("REPRODUCED");
    expect(run.stdout).toContain("FAILING RULES: tx-rx-isolation");
  });

  it("a bare approval is 409 listing the failing rule; an approval with a waiver is stored, audited and in the next bundle", async () => {
    const req = await call(
      signoffsRoute.POST,
      makeRequest("POST", `/api/projects/${projectId}/signoffs`, { cookie: cookies.engineer, body: { scenarioId: scenarioIds.Baseline, reviewerIds: [ids.reviewer] } }),
      { projectId },
    );
    expect(req.status).toBe(201);
    const signoffId = ((await req.json()) as { signoffs: { id: string }[] }).signoffs[0].id;
    const decide = (body: unknown) =>
      call(decideRoute.POST, makeRequest("POST", `/api/projects/${projectId}/signoffs/${signoffId}/decide`, { cookie: cookies.reviewer, body }), { projectId, signoffId });
    const bare = await decide({ decision: "approved", comment: "looks fine" });
    expect(bare.status).toBe(409);
    expect(((await bare.json()) as ErrorJson).error.message).toContain("tx-rx-isolation");
    const noReason = await decide({ decision: "approved", waiver: [{ id: "tx-rx-isolation", reason: " " }] });
    expect(noReason.status).toBe(400);
    const wrong = await decide({ decision: "approved", waiver: [{ id: "tx-rx-isolation", reason: "r" }, { id: "tx-match", reason: "r" }] });
    expect(wrong.status).toBe(422);
    expect(((await wrong.json()) as ErrorJson).error.message).toContain("tx-match");
    expect((await db.select().from(signoffs).where(eq(signoffs.id, signoffId)))[0].state).toBe("requested");
    const reason = "Bench measurement of the T/R switch shows the margin; the model is pessimistic.";
    const ok = await decide({ decision: "approved", comment: "approved on the bench data", waiver: [{ id: "tx-rx-isolation", reason }] });
    expect(ok.status).toBe(200);
    const [stored] = await db.select().from(signoffs).where(eq(signoffs.id, signoffId));
    expect(stored.waiver).toEqual({ rules: [{ id: "tx-rx-isolation", reason }] });
    expect(stored.evidence).toMatchObject({ verdict: "fail", failing: ["tx-rx-isolation"], engineVersion: ENGINE_VERSION });
    const [audit] = await db.select().from(auditEvents).where(and(eq(auditEvents.projectId, projectId), eq(auditEvents.action, "signoff.approve_with_waiver")));
    expect(audit.detail).toMatchObject({ waiver: [{ id: "tx-rx-isolation", reason }], verdict: "fail" });
    const files = await bundleOf(scenarioIds.Baseline);
    const doc = JSON.parse(files.get("results/checks.json")!) as ChecksDocument;
    expect(doc.waivers).toEqual([expect.objectContaining({ reviewer: "Rhea Reviewer <rhea@portolan.example>", rules: [{ id: "tx-rx-isolation", reason }] })]);
    expect(files.get("report.html")).toContain(reason);
  });

  it("an override shows both limits, who changed it (the server's record) and judges the scenario; an opt-out needs a reason", async () => {
    // the client's `by` is not trusted: the saving user is recorded
    const loose = { ...DEMO_RULES[0], id: "tx-rx-isolation", min_db: 30, by: "mallory@example.test", at: "2000-01-01T00:00:00Z" };
    await saveRevision(scenarioIds.Baseline, (s) => ({ ...s, rule_overrides: [loose] }));
    const { body } = await verdict(cookies.engineer, scenarioIds.Baseline, "POST");
    expect(body.verdict.run?.verdict).toBe("pass");
    expect(body.verdict.ruleSet.rules[0]).toMatchObject({ source: "scenario-override", rule: { min_db: 30 }, project_rule: { min_db: tightened }, by: "emil@portolan.example" });
    const [row] = await db.select().from(scenarios).where(eq(scenarios.id, scenarioIds.Baseline));
    const [rev] = await db.select().from(scenarioRevisions).where(eq(scenarioRevisions.id, row.latestRevisionId!));
    const blank = await call(
      revisionsRoute.POST,
      makeRequest("POST", `${scenarioBase(scenarioIds.Baseline)}/revisions`, { cookie: cookies.engineer, body: { baseRevisionId: rev.id, scenario: { ...(rev.content as object), rule_opt_outs: [{ id: "tx-match", reason: "" }] } } }),
      { projectId, scenarioId: scenarioIds.Baseline },
    );
    expect(blank.status).toBe(400);
    const stampedAt = body.verdict.ruleSet.rules[0].at;
    expect(stampedAt).not.toBe("2000-01-01T00:00:00Z");
    await saveRevision(scenarioIds.Baseline, (s) => ({ ...s, rule_opt_outs: [{ id: "tx-match", reason: "matched by the PA module, not this chain" }] }));
    const after = (await verdict(cookies.engineer, scenarioIds.Baseline, "POST")).body.verdict;
    expect(after.ruleSet.rules[0]).toMatchObject({ by: "emil@portolan.example", at: stampedAt }); // unchanged override keeps its record
    expect(after.ruleSet.rules.map((r) => r.id)).toEqual(["tx-rx-isolation", "tx-ant-loss"]);
    expect(after.ruleSet.opted_out).toEqual([expect.objectContaining({ id: "tx-match", reason: "matched by the PA module, not this chain" })]);
    // the project Rules page lists who departs from each rule
    const usage = await projectRuleUsage({ userId: ids.reviewer, projectId });
    expect(usage["tx-rx-isolation"].overrides).toEqual([expect.objectContaining({ scenarioName: "Baseline", rule: expect.objectContaining({ min_db: 30 }), by: "emil@portolan.example" })]);
    expect(usage["tx-match"].optOuts).toEqual([expect.objectContaining({ scenarioName: "Baseline", reason: "matched by the PA module, not this chain" })]);
    expect(usage["tx-ant-loss"]).toEqual({ overrides: [], optOuts: [] });
  });

  it("a revision that does not solve cannot be put up for sign-off (422 naming the problem)", async () => {
    const draft = await saveRevision(scenarioIds["Cheaper switch"], (s) => ({ ...s, links: [...s.links, ["GHOST:1", "GHOST:2"]] }));
    const res = await call(
      signoffsRoute.POST,
      makeRequest("POST", `/api/projects/${projectId}/signoffs`, { cookie: cookies.engineer, body: { scenarioId: scenarioIds["Cheaper switch"], revisionId: draft.id, reviewerIds: [ids.reviewer] } }),
      { projectId },
    );
    expect(res.status).toBe(422);
    const message = ((await res.json()) as ErrorJson).error.message;
    expect(message).toContain(`Revision ${draft.number} does not solve`);
    expect(message).toContain("GHOST");
    expect((await verdict(cookies.engineer, scenarioIds["Cheaper switch"], "POST")).status).toBe(422);
  });

  it("the start-up migration turns hidden copies of project rules into explicit overrides, once", async () => {
    // a scenario saved before overrides existed: one identical copy, one stricter copy, one of its own
    const [row] = await db.select().from(scenarios).where(eq(scenarios.id, scenarioIds["Cheaper switch"]));
    const [rev] = await db.select().from(scenarioRevisions).where(eq(scenarioRevisions.id, row.latestRevisionId!));
    const own = { kind: "match" as const, id: "rx-match", port: "RX", band: [2.4e9, 2.48e9] as [number, number], max_vswr: 2 };
    const legacy = { ...(rev.content as unknown as Scenario), rules: [DEMO_RULES[1], { ...DEMO_RULES[2], max_db: 4 }, own] };
    await saveRevision(scenarioIds["Cheaper switch"], (s) => ({ ...legacy, links: s.links.filter((l) => l[0] !== "GHOST:1") }));
    const before = (await db.select().from(scenarios).where(eq(scenarios.id, row.id)))[0].latestRevisionNumber;
    expect(await migrateScenarioRules()).toEqual({ migrated: 1 });
    const [after] = await db.select().from(scenarios).where(eq(scenarios.id, row.id));
    expect(after.latestRevisionNumber).toBe(before + 1);
    const [migrated] = await db.select().from(scenarioRevisions).where(eq(scenarioRevisions.id, after.latestRevisionId!));
    const content = migrated.content as unknown as Scenario;
    expect(migrated.origin).toBe("migrate");
    expect(content.rules).toEqual([own]);
    expect(content.rule_overrides).toEqual([{ ...DEMO_RULES[2], max_db: 4 }]);
    expect(await migrateScenarioRules()).toEqual({ migrated: 0 });
  });
});
