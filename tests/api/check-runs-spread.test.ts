// The spread analysis as a long check job (issue 17): POST answers 202 with a job, the job reports its
// progress and stores a run tied to the revision, its rule set and the engine; the seed is stored and
// repeats the run; bad inputs are 400 and write nothing.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { call, countRows, makeRequest, setUpDatabase, type ErrorJson } from "./helpers";

const scenariosRoute = await import("@/app/api/projects/[projectId]/scenarios/route");
const runsRoute = await import("@/app/api/projects/[projectId]/scenarios/[scenarioId]/check-runs/route");
const runRoute = await import("@/app/api/projects/[projectId]/scenarios/[scenarioId]/check-runs/[runId]/route");
const worstRoute = await import("@/app/api/projects/[projectId]/scenarios/[scenarioId]/check-runs/[runId]/worst-sample/route");
const bundleRoute = await import("@/app/api/projects/[projectId]/scenarios/[scenarioId]/bundle/route");
const { readZipSafely } = await import("@/engine/bundle");
const jobRoute = await import("@/app/api/projects/[projectId]/jobs/[jobId]/route");
const { db } = await import("@/db/client");
const { checkRuns, users } = await import("@/db/schema");
const { DEMO_USERS, seedDemo } = await import("@/db/seed");
const { createSessionForUser } = await import("@/lib/server/auth/session");
const { closeJobPool } = await import("@/lib/server/jobs/pool");
const { ENGINE_VERSION } = await import("@/engine/version");
type SpreadRun = import("@/lib/domain/checks/types").CheckRunOf<"spread">;
type JobJson = { job: { id: string; state: string; runId: string | null; progress: { phase: string; fraction: number } | null; error: { status: number; message: string } | null } };

let projectId: string;
let cookie = "";
let reviewerCookie = "";
let padId = "";
let plainId = "";

/** A matched attenuator of 3 dB ± 1 dB (uniform) under an insertion-loss rule of 3.5 dB. */
const pad = {
  format: "portolan.scenario/1",
  name: "Pad with a spread",
  z0: 50,
  frequency: { start: 1e9, stop: 2e9, points: 5 },
  blocks: [{ id: "P1", kind: "attenuator", params: { loss_db: 3 }, spread: { loss_db: { plus_minus: 1 } } }],
  links: [],
  ports: [
    { name: "IN", at: "P1:1" },
    { name: "OUT", at: "P1:2" },
  ],
  rules: [{ kind: "insertion_loss", id: "il", from: "IN", to: "OUT", band: [1e9, 2e9], max_db: 3.5 }],
};

async function createScenario(scenario: { name: string } & Record<string, unknown>): Promise<string> {
  const res = await call(scenariosRoute.POST, makeRequest("POST", `/api/projects/${projectId}/scenarios`, { cookie, body: { name: scenario.name, scenario } }), { projectId });
  expect(res.status).toBe(201);
  return ((await res.json()) as { scenario: { id: string } }).scenario.id;
}

const post = (scenarioId: string, body: unknown) =>
  call(runsRoute.POST, makeRequest("POST", `/api/projects/${projectId}/scenarios/${scenarioId}/check-runs`, { cookie, body }), { projectId, scenarioId });

/** Follows a job to its end, as the browser does, and records the phases it reported. */
async function follow(jobId: string): Promise<{ job: JobJson["job"]; phases: string[] }> {
  const phases: string[] = [];
  for (;;) {
    const res = await call(jobRoute.GET, makeRequest("GET", `/api/projects/${projectId}/jobs/${jobId}`, { cookie }), { projectId, jobId });
    const { job } = (await res.json()) as JobJson;
    if (job.progress) phases.push(job.progress.phase);
    if (job.state !== "queued" && job.state !== "running") return { job, phases };
    await new Promise((resolve) => setTimeout(resolve, 20));
  }
}

async function runSpread(scenarioId: string, inputs: Record<string, unknown>): Promise<SpreadRun> {
  const res = await post(scenarioId, { check: "spread", inputs });
  expect(res.status).toBe(202);
  const { job } = await follow(((await res.json()) as JobJson).job.id);
  expect(job.state).toBe("done");
  const one = await call(runRoute.GET, makeRequest("GET", `/api/projects/${projectId}/scenarios/${scenarioId}/check-runs/${job.runId}`, { cookie }), { projectId, scenarioId, runId: job.runId! });
  expect(one.status).toBe(200);
  return ((await one.json()) as { run: SpreadRun }).run;
}

beforeAll(async () => {
  await setUpDatabase();
  projectId = (await seedDemo()).projectId!;
  const engineer = DEMO_USERS.find((u) => u.role === "engineer")!;
  const [row] = await db.select({ id: users.id }).from(users).where(eq(users.email, engineer.email));
  cookie = `portolan_session=${(await createSessionForUser(row.id)).token}`;
  const reviewer = DEMO_USERS.find((u) => u.role === "reviewer")!;
  const [rev] = await db.select({ id: users.id }).from(users).where(eq(users.email, reviewer.email));
  reviewerCookie = `portolan_session=${(await createSessionForUser(rev.id)).token}`;
  padId = await createScenario(pad);
  const { spread: _spread, ...plainBlock } = pad.blocks[0];
  void _spread;
  plainId = await createScenario({ ...pad, name: "Pad without a spread", blocks: [plainBlock] });
});

afterAll(async () => {
  await closeJobPool();
});

describe("spread analysis runs", () => {
  it("3 dB ± 1 dB uniform under a 3.5 dB rule: 202 → job → stored run whose Wilson interval holds the yield 0.75", async () => {
    const run = await runSpread(padId, { samples: 4000, seed: 17 });
    expect(run.check).toBe("spread");
    expect(run.inputs).toEqual({ samples: 4000, seed: 17 });
    // tied to the revision, its effective rule set and this engine
    expect(run.revisionNumber).toBe(1);
    expect(run.contentHash).toMatch(/^[0-9a-f]{64}$/);
    expect(run.rulesHash).toMatch(/^[0-9a-f]{64}$/);
    expect(run.engineVersion).toBe(ENGINE_VERSION);
    expect(run.stale).toEqual([]);
    const il = run.figures.result.rules.find((r) => r.id === "il")!;
    expect(il.total).toBe(4000);
    // P(loss ≤ 3.5) for loss uniform on [2, 4] is 1.5 / 2 = 0.75 (uniform distribution, closed form)
    expect(il.low).toBeLessThan(0.75);
    expect(il.high).toBeGreaterThan(0.75);
    expect(il.yield).toBeCloseTo(il.passed / il.total, 12);
    // the nominal 3 dB meets 3.5 dB by 0.5 dB; some samples miss it, so the verdict is a warning
    expect(il.nominal_margin).toBeCloseTo(0.5, 6);
    expect(run.verdict).toBe("warn");
    // the loss is the only parameter, and the margin falls as it rises (ρ = −1 for a monotone relation)
    expect(il.sensitivity[0].name).toBe("P1.loss_db");
    expect(il.sensitivity[0].rho).toBeCloseTo(-1, 6);
    expect(run.figures.headline).toContain("seed 17");
  });

  it("the same seed gives the same result; another seed other samples", async () => {
    const a = await runSpread(padId, { samples: 300, seed: 5 });
    const b = await runSpread(padId, { samples: 300, seed: 5 });
    const c = await runSpread(padId, { samples: 300, seed: 6 });
    expect(b.figures.result.rules).toEqual(a.figures.result.rules);
    expect(b.figures.result.envelopes).toEqual(a.figures.result.envelopes);
    expect(c.figures.result.rules[0].worst).not.toEqual(a.figures.result.rules[0].worst);
  });

  it("without a seed the server draws one and stores it; without samples it takes 500", async () => {
    const run = await runSpread(padId, {});
    expect(run.inputs.samples).toBe(500);
    expect(Number.isInteger(run.inputs.seed)).toBe(true);
    const again = await runSpread(padId, { samples: 500, seed: run.inputs.seed });
    expect(again.figures.result.rules).toEqual(run.figures.result.rules);
  });

  it("bad inputs are 400 naming the field and store nothing; a scenario without spreads ends its job with 422", async () => {
    const before = await countRows(checkRuns);
    for (const inputs of [{ samples: 0 }, { samples: 20_001 }, { samples: 10.5 }, { seed: -1 }, { samples: 10, colour: "red" }]) {
      const res = await post(padId, { check: "spread", inputs });
      expect(res.status).toBe(400);
      expect(((await res.json()) as ErrorJson).error.message.length).toBeGreaterThan(0);
    }
    const res = await post(plainId, { check: "spread", inputs: { samples: 10, seed: 1 } });
    expect(res.status).toBe(202);
    const { job } = await follow(((await res.json()) as JobJson).job.id);
    expect(job.state).toBe("failed");
    expect(job.error?.status).toBe(422);
    expect(job.error?.message).toMatch(/spread/);
    expect(await countRows(checkRuns)).toBe(before);
  });

  it("the worst sample of a rule opens as a scenario of its own (engineers); reviewers are refused", async () => {
    const run = await runSpread(padId, { samples: 200, seed: 3 });
    const worst = run.figures.result.rules[0].worst!;
    const open = (c: string, body: unknown) =>
      call(worstRoute.POST, makeRequest("POST", `/api/projects/${projectId}/scenarios/${padId}/check-runs/${run.id}/worst-sample`, { cookie: c, body }), { projectId, scenarioId: padId, runId: run.id });
    expect((await open(reviewerCookie, { rule: "il" })).status).toBe(403);
    expect((await open(cookie, { rule: "nope" })).status).toBe(422);
    expect((await open(cookie, {})).status).toBe(400);
    const res = await open(cookie, { rule: "il" });
    expect(res.status).toBe(201);
    const { revision } = (await res.json()) as { revision: { content: { blocks: { params: { loss_db: number }; spread?: unknown }[] } } };
    const block = revision.content.blocks[0];
    expect(block.spread).toBeUndefined();
    expect(block.params.loss_db).toBe(worst.values["P1.loss_db"]);
    // a matched pad's insertion loss is its loss_db (closed form), so the rule's margin is 3.5 − loss_db
    expect(worst.margin).toBeCloseTo(3.5 - block.params.loss_db, 6);
    // the worst sample of a uniform 2…4 dB pad is near the top of its range (200 samples, common practice)
    expect(block.params.loss_db).toBeGreaterThan(3.9);
  });

  it("a bundle carries the revision's current spread run in checks.json and its yield table in report.html", async () => {
    const run = await runSpread(padId, { samples: 1000, seed: 11 });
    const exportOf = async (scenarioId: string) => {
      const res = await call(bundleRoute.GET, makeRequest("GET", `/api/projects/${projectId}/scenarios/${scenarioId}/bundle`, { cookie: reviewerCookie }), { projectId, scenarioId });
      expect(res.status).toBe(200);
      const files = readZipSafely(new Uint8Array(await res.arrayBuffer()));
      const text = (name: string) => new TextDecoder().decode(files.get(name));
      return { checks: JSON.parse(text("results/checks.json")) as { spread?: { samples: number; seed: number; rules: { id: string; passed: number; total: number; low: number; high: number }[] } }, html: text("report.html") };
    };
    const { checks, html } = await exportOf(padId);
    const il = run.figures.result.rules.find((r) => r.id === "il")!;
    expect(checks.spread).toMatchObject({ samples: 1000, seed: 11 });
    expect(checks.spread!.rules.find((r) => r.id === "il")).toMatchObject({ passed: il.passed, total: 1000, low: il.low, high: il.high });
    expect(html).toContain("<h2>Spread analysis</h2>");
    expect(html).toContain(`${il.passed}/1000`);
    // a revision without a spread run has no spread section
    const plain = await exportOf(plainId);
    expect(plain.checks.spread).toBeUndefined();
    expect(plain.html).not.toContain("<h2>Spread analysis</h2>");
  });
});
