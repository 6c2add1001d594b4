// Jobs (issue 14): solves and checks run in the piscina pool off the request's thread, are refused over
// the size limit before they start, stop when their client goes away, and long ones are followed as jobs.
// The demo project (db/seed.ts) gives the users; heavy scenarios are plain attenuator chains.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { gzipSync } from "node:zlib";
import { call, countRows, makeRequest, setUpDatabase, type ErrorJson } from "./helpers";

// limits read once by lib/base/env.ts: a limit between the heavy chain (~250 MB) and the refused one (~2 GB)
process.env.MAX_SOLVE_MEMORY = "768MiB";
process.env.RUNS_KEPT = "2";

const scenariosRoute = await import("@/app/api/projects/[projectId]/scenarios/route");
const solveRoute = await import("@/app/api/projects/[projectId]/scenarios/[scenarioId]/solve/route");
const runsRoute = await import("@/app/api/projects/[projectId]/scenarios/[scenarioId]/check-runs/route");
const runRoute = await import("@/app/api/projects/[projectId]/scenarios/[scenarioId]/check-runs/[runId]/route");
const storageRoute = await import("@/app/api/projects/[projectId]/scenarios/[scenarioId]/check-runs/storage/route");
const jobRoute = await import("@/app/api/projects/[projectId]/jobs/[jobId]/route");
const sessionRoute = await import("@/app/api/auth/session/route");
const signoffsRoute = await import("@/app/api/projects/[projectId]/signoffs/route");
const decideRoute = await import("@/app/api/projects/[projectId]/signoffs/[signoffId]/decide/route");
const { db } = await import("@/db/client");
const { checkRuns, scenarios, signoffs, users } = await import("@/db/schema");
const { DEMO_USERS, seedDemo } = await import("@/db/seed");
const { kestrelScenario } = await import("@/db/seed-scenarios");
const { createSessionForUser } = await import("@/lib/server/auth/session");
const { closeJobPool } = await import("@/lib/server/jobs/pool");

let projectId: string;
const cookies: Record<"owner" | "engineer" | "reviewer", string> = { owner: "", engineer: "", reviewer: "" };
const userIds: Record<"owner" | "engineer" | "reviewer", string> = { owner: "", engineer: "", reviewer: "" };
const ids: Record<string, string> = {};

/** A chain of n matched 0.1 dB attenuators on a linear plan: S21 = 10^(−0.1·n/20) (pads in cascade, common practice). */
function chain(n: number, points: number) {
  return {
    format: "portolan.scenario/1",
    name: `chain ${n}`,
    z0: 50,
    frequency: { start: 1e9, stop: 2e9, points },
    blocks: Array.from({ length: n }, (_, i) => ({ id: `A${i}`, kind: "attenuator", params: { loss_db: 0.1 } })),
    links: Array.from({ length: n - 1 }, (_, i) => [`A${i}:2`, `A${i + 1}:1`]),
    ports: [
      { name: "IN", at: "A0:1" },
      { name: "OUT", at: `A${n - 1}:2` },
    ],
  };
}

async function createScenario(name: string, scenario: unknown): Promise<string> {
  const res = await call(scenariosRoute.POST, makeRequest("POST", `/api/projects/${projectId}/scenarios`, { cookie: cookies.engineer, body: { name, scenario } }), { projectId });
  expect(res.status).toBe(201);
  return ((await res.json()) as { scenario: { id: string } }).scenario.id;
}

function solve(scenarioId: string, init: { signal?: AbortSignal } = {}): Promise<Response> {
  const request = makeRequest("GET", `/api/projects/${projectId}/scenarios/${scenarioId}/solve?format=json`, { cookie: cookies.engineer });
  return call(solveRoute.GET, init.signal ? new Request(request, { signal: init.signal }) : request, { projectId, scenarioId });
}

function postRun(scenarioId: string, body: unknown, init: { signal?: AbortSignal; cookie?: string } = {}): Promise<Response> {
  const request = makeRequest("POST", `/api/projects/${projectId}/scenarios/${scenarioId}/check-runs`, { cookie: init.cookie ?? cookies.engineer, body });
  return call(runsRoute.POST, init.signal ? new Request(request, { signal: init.signal, duplex: "half" } as RequestInit) : request, { projectId, scenarioId });
}

beforeAll(async () => {
  await setUpDatabase();
  projectId = (await seedDemo()).projectId!;
  for (const demo of DEMO_USERS) {
    const [row] = await db.select({ id: users.id }).from(users).where(eq(users.email, demo.email));
    cookies[demo.role] = `portolan_session=${(await createSessionForUser(row.id)).token}`;
    userIds[demo.role] = row.id;
  }
  for (const row of await db.select().from(scenarios).where(eq(scenarios.projectId, projectId))) ids[row.name] = row.id;
  ids.heavy = await createScenario("Heavy chain", chain(40, 50_001));
  // 256 blocks × 100,001 points: 1.5 GiB by the engine's estimate (3 GiB with wave maps), over the 768 MiB limit
  ids.huge = await createScenario("Huge chain", chain(256, 100_001));
});

afterAll(async () => {
  await closeJobPool();
});

describe("solves run off the request's thread", () => {
  it("a session check answers while a heavy solve runs in the pool", async () => {
    let solved = false;
    const heavy = solve(ids.heavy).then((res) => {
      solved = true;
      return res;
    });
    // session checks while the solve runs: each is a database read on the main thread; a solve on that
    // thread would hold them for its whole duration (seconds, issue 14)
    const took: number[] = [];
    for (let i = 0; i < 5; i++) {
      const t0 = performance.now();
      const res = await call(sessionRoute.GET, makeRequest("GET", "/api/auth/session", { cookie: cookies.engineer }));
      took.push(performance.now() - t0);
      expect(res.status).toBe(200);
    }
    expect(solved).toBe(false); // the checks above overlapped the solve
    took.sort((a, b) => a - b);
    expect(took[2]).toBeLessThan(100); // a guard against a stall (median of five), not a speed test
    const res = await heavy;
    expect(res.status).toBe(200);
    const body = (await res.json()) as { ports: string[]; frequencies: number[]; s: { re: number[][][]; im: number[][][] } | unknown };
    expect(body.ports).toEqual(["IN", "OUT"]);
  });

  it("a scenario whose size estimate is over MAX_SOLVE_MEMORY is refused with 422 naming the estimate and the limit", async () => {
    const before = await countRows(checkRuns);
    const res = await solve(ids.huge);
    expect(res.status).toBe(422);
    const body = (await res.json()) as ErrorJson;
    expect(body.error.code).toBe("too_large");
    expect(body.error.message).toMatch(/over the limit of 768 MiB/);
    expect(body.error.message).toMatch(/reduce the frequency points \(100001\)/);
    expect(body.error.message).toMatch(/the number of blocks \(256\)/);
    expect(body.error.message).toMatch(/MAX_SOLVE_MEMORY/);
    expect(Number(body.error.fields?.limit.split(" ")[0])).toBe(768 * 1024 ** 2);
    expect(Number(body.error.fields?.estimate.split(" ")[0])).toBeGreaterThan(768 * 1024 ** 2);
    // the same refusal for a check run and for a long job, before any job exists; nothing stored
    const run = await postRun(ids.huge, { check: "match", inputs: { port: "IN", band: [1e9, 2e9], min_return_loss_db: 10 } });
    expect(run.status).toBe(422);
    const sweep = await postRun(ids.huge, { check: "state_sweep", inputs: {} });
    expect(sweep.status).toBe(422);
    expect(((await sweep.json()) as ErrorJson).error.code).toBe("too_large");
    expect(await countRows(checkRuns)).toBe(before);
  });

  it("a check run is cancelled when its client goes away, and stores nothing", async () => {
    const before = await countRows(checkRuns);
    const client = new AbortController();
    const pending = postRun(ids.heavy, { check: "match", inputs: { port: "IN", band: [1e9, 2e9], min_return_loss_db: 10 } }, { signal: client.signal });
    // let the route read its body and hand the job to the pool, then disconnect
    await new Promise((resolve) => setTimeout(resolve, 300));
    client.abort();
    const res = await pending;
    expect(res.status).toBe(499);
    expect(((await res.json()) as ErrorJson).error.code).toBe("job_cancelled");
    expect(await countRows(checkRuns)).toBe(before);
  });
});

describe("time limit", () => {
  it("a job past its time limit is stopped with 504 job_timeout", async () => {
    const { runInPool, taskLimits } = await import("@/lib/server/jobs/pool");
    const task = { kind: "solve" as const, content: chain(40, 50_001) as never, parts: {}, format: "json" as const, scenarioName: "chain", ...taskLimits() };
    // the heavy chain takes seconds; 50 ms is far below that on any machine
    await expect(runInPool(task, { timeLimitMs: 50 })).rejects.toMatchObject({ code: "job_timeout", status: 504 });
    // the pool still works after the thread was ended
    const small = await runInPool({ ...task, content: chain(3, 11) as never });
    expect(small.ok).toBe(true);
  });
});

describe("only what is needed is loaded", () => {
  it("a solve reads the parts its scenario names, not the project's others", async () => {
    const { getPartTexts, partFilesOf } = await import("@/db/queries/parts");
    const { scenarioRevisions } = await import("@/db/schema");
    const [row] = await db.select({ content: scenarioRevisions.content }).from(scenarioRevisions).innerJoin(scenarios, eq(scenarios.latestRevisionId, scenarioRevisions.id)).where(eq(scenarios.id, ids.Baseline));
    const named = partFilesOf(row.content);
    const all = await getPartTexts({ projectId });
    const read = await getPartTexts({ projectId, files: named });
    expect(named.length).toBeGreaterThan(0);
    expect(Object.keys(read).sort()).toEqual([...named].sort());
    expect(Object.keys(all).length).toBeGreaterThanOrEqual(named.length);
    expect(await getPartTexts({ projectId, files: [] })).toEqual({});
    // the heavy chain names no part: nothing is read
    expect(partFilesOf(chain(3, 3))).toEqual([]);
  });
});

describe("long jobs", () => {
  async function job(jobId: string, cookie = cookies.engineer) {
    const res = await call(jobRoute.GET, makeRequest("GET", `/api/projects/${projectId}/jobs/${jobId}`, { cookie }), { projectId, jobId });
    return { status: res.status, job: ((await res.json()) as { job: { state: string; runId: string | null; progress: { fraction: number } | null } }).job };
  }

  it("a state sweep answers 202, reports progress, and its run lands in the database", async () => {
    const res = await postRun(ids["Cheaper switch"], { check: "state_sweep", inputs: {} });
    expect(res.status).toBe(202);
    const started = ((await res.json()) as { job: { id: string; state: string } }).job;
    expect(["queued", "running"]).toContain(started.state);
    let current = (await job(started.id)).job;
    while (current.state === "queued" || current.state === "running") {
      await new Promise((resolve) => setTimeout(resolve, 20));
      current = (await job(started.id)).job;
    }
    expect(current.state).toBe("done");
    expect(current.progress?.fraction).toBe(1);
    const [row] = await db.select().from(checkRuns).where(eq(checkRuns.id, current.runId!));
    expect(row.check).toBe("state_sweep");
    // a job of this project is not visible from another: 404
    const other = await call(jobRoute.GET, makeRequest("GET", `/api/projects/nope/jobs/${started.id}`, { cookie: cookies.engineer }), { projectId: "nope", jobId: started.id });
    expect(other.status).toBe(404);
  });

  it("DELETE cancels a running job: nothing is stored", async () => {
    const before = await countRows(checkRuns);
    // the heavy chain has no switch: its sweep is one combination, but its solve takes seconds
    const res = await postRun(ids.heavy, { check: "state_sweep", inputs: {} });
    expect(res.status).toBe(202);
    const started = ((await res.json()) as { job: { id: string } }).job;
    const del = await call(jobRoute.DELETE, makeRequest("DELETE", `/api/projects/${projectId}/jobs/${started.id}`, { cookie: cookies.engineer }), { projectId, jobId: started.id });
    expect(del.status).toBe(200);
    expect(((await del.json()) as { job: { state: string } }).job.state).toBe("cancelled");
    // the pool settles the aborted task; give it a moment, then nothing was stored
    await new Promise((resolve) => setTimeout(resolve, 200));
    expect((await job(started.id)).job.state).toBe("cancelled");
    expect(await countRows(checkRuns)).toBe(before);
  });
});

describe("stored runs are bounded", () => {
  const match = { check: "match", inputs: { port: "TX", band: [2.4e9, 2.48e9], min_return_loss_db: 10 } };

  it("keeps the newest RUNS_KEPT runs per check and revision plus pinned ones; owners see and clear the rest", async () => {
    const id = ids.Baseline;
    const first = await postRun(id, match);
    expect(first.status).toBe(201);
    const pinnedId = ((await first.json()) as { run: { id: string } }).run.id;
    await db.update(checkRuns).set({ pinned: true }).where(eq(checkRuns.id, pinnedId));
    for (let i = 0; i < 4; i++) expect((await postRun(id, match)).status).toBe(201);
    const rows = await db.select({ id: checkRuns.id, pinned: checkRuns.pinned }).from(checkRuns).where(and(eq(checkRuns.scenarioId, id), eq(checkRuns.check, "match")));
    // RUNS_KEPT = 2 newest, plus the pinned first run
    expect(rows).toHaveLength(3);
    expect(rows.some((r) => r.id === pinnedId)).toBe(true);
    // figures are stored gzip'd and read back whole
    const one = await call(runRoute.GET, makeRequest("GET", `/api/projects/${projectId}/scenarios/${id}/check-runs/${pinnedId}`, { cookie: cookies.reviewer }), { projectId, scenarioId: id, runId: pinnedId });
    const run = ((await one.json()) as { run: { figures: { headline: string; result: { verdict: string } } } }).run;
    expect(run.figures.result.verdict).toMatch(/pass|fail|warn/);
    const [stored] = await db.select({ gz: checkRuns.figuresGz, text: checkRuns.figures, bytes: checkRuns.figuresBytes }).from(checkRuns).where(eq(checkRuns.id, pinnedId));
    expect(stored.text).toBeNull();
    expect([...stored.gz!.subarray(0, 2)]).toEqual([0x1f, 0x8b]); // gzip magic, RFC 1952 §2.3.1
    expect(stored.bytes).toBe(stored.gz!.byteLength);
  });

  it("the run a sign-off was decided on is pinned and survives pruning past RUNS_KEPT and an owner's clear", async () => {
    const id = await createScenario("Signed line-up", kestrelScenario("Signed line-up", 45));
    const requested = await call(
      signoffsRoute.POST,
      makeRequest("POST", `/api/projects/${projectId}/signoffs`, { cookie: cookies.engineer, body: { scenarioId: id, reviewerIds: [userIds.reviewer] } }),
      { projectId },
    );
    expect(requested.status).toBe(201);
    const signoffId = ((await requested.json()) as { signoffs: { id: string }[] }).signoffs[0].id;
    const decided = await call(
      decideRoute.POST,
      makeRequest("POST", `/api/projects/${projectId}/signoffs/${signoffId}/decide`, { cookie: cookies.reviewer, body: { decision: "changes_requested", comment: "tighten the match" } }),
      { projectId, signoffId },
    );
    expect(decided.status).toBe(200);
    const [signoff] = await db.select({ evidence: signoffs.evidence }).from(signoffs).where(eq(signoffs.id, signoffId));
    const evidenceRun = signoff.evidence!.checkRunId!;
    expect((await db.select({ pinned: checkRuns.pinned }).from(checkRuns).where(eq(checkRuns.id, evidenceRun)))[0].pinned).toBe(true);
    // three newer "all rules" runs of the same revision: the evidence run falls past RUNS_KEPT = 2 by rank
    for (let i = 0; i < 3; i++) expect((await postRun(id, { check: "all_rules", inputs: {} })).status).toBe(201);
    const allRules = () => db.select({ id: checkRuns.id }).from(checkRuns).where(and(eq(checkRuns.scenarioId, id), eq(checkRuns.check, "all_rules")));
    let rows = await allRules();
    expect(rows).toHaveLength(3);
    expect(rows.map((r) => r.id)).toContain(evidenceRun);
    // an owner's clear applies the same rule: nothing beyond the kept and the pinned to delete
    const cleared = await call(storageRoute.DELETE, makeRequest("DELETE", `/api/projects/${projectId}/scenarios/${id}/check-runs/storage`, { cookie: cookies.owner }), { projectId, scenarioId: id });
    expect(cleared.status).toBe(200);
    rows = await allRules();
    expect(rows.map((r) => r.id)).toContain(evidenceRun);
    const one = await call(runRoute.GET, makeRequest("GET", `/api/projects/${projectId}/scenarios/${id}/check-runs/${evidenceRun}`, { cookie: cookies.reviewer }), { projectId, scenarioId: id, runId: evidenceRun });
    expect(one.status).toBe(200);
  });

  it("concurrent check runs are all stored, and the group still ends at RUNS_KEPT", async () => {
    const id = ids["Cheaper switch"];
    const isolation = { check: "isolation", inputs: { from: "TX", to: "RX", band: [2.4e9, 2.48e9], min_db: 30 } };
    const answers = await Promise.all(Array.from({ length: 6 }, () => postRun(id, isolation)));
    expect(answers.map((r) => r.status)).toEqual([201, 201, 201, 201, 201, 201]);
    const rows = await db.select({ id: checkRuns.id }).from(checkRuns).where(and(eq(checkRuns.scenarioId, id), eq(checkRuns.check, "isolation")));
    expect(rows).toHaveLength(2);
  });

  it("a run is read back in the batch that stores it, before the retention rule: a concurrent run's pruning cannot turn its answer into a 404", async () => {
    const { insertCheckRun } = await import("@/db/queries/check-runs");
    const id = ids["Cheaper switch"];
    const [revision] = await db.select({ id: scenarios.latestRevisionId }).from(scenarios).where(eq(scenarios.id, id));
    // keep 0: the batch's own pruning deletes the run it stored, the sharpest form of the race
    const view = await insertCheckRun(
      { id: "raced-run", scenarioId: id, revisionId: revision.id!, userId: userIds.engineer, check: "isolation", inputs: {}, verdict: "pass", headline: "stored then pruned", figuresGz: gzipSync(JSON.stringify({ headline: "stored then pruned", result: { verdict: "pass" } })), contentHash: "c", rulesHash: "r", engineVersion: "e" },
      { keep: 0 },
    );
    expect(view).toMatchObject({ id: "raced-run", headline: "stored then pruned", verdict: "pass" });
    expect(await db.select({ id: checkRuns.id }).from(checkRuns).where(eq(checkRuns.id, "raced-run"))).toHaveLength(0);
  });

  it("runs stored as JSON text before the migration stay readable, and clearing keeps the rule", async () => {
    const id = ids.Baseline;
    const [revision] = await db.select({ id: scenarios.latestRevisionId }).from(scenarios).where(eq(scenarios.id, id));
    const legacy = { headline: "legacy run", result: { verdict: "pass" } };
    // three old-style runs of another check on the same revision: one more than RUNS_KEPT
    for (const n of [1, 2, 3]) {
      await db.insert(checkRuns).values({ id: `legacy-${n}`, scenarioId: id, revisionId: revision.id!, check: "isolation", verdict: "pass", figures: legacy as never, figuresBytes: JSON.stringify(legacy).length, createdAt: new Date(Date.UTC(2020, 0, n)) });
    }
    const one = await call(runRoute.GET, makeRequest("GET", `/api/projects/${projectId}/scenarios/${id}/check-runs/legacy-3`, { cookie: cookies.reviewer }), { projectId, scenarioId: id, runId: "legacy-3" });
    expect(((await one.json()) as { run: { headline: string; figures: unknown } }).run.figures).toEqual(legacy);
    const storageUrl = `/api/projects/${projectId}/scenarios/${id}/check-runs/storage`;
    const seen = await call(storageRoute.GET, makeRequest("GET", storageUrl, { cookie: cookies.reviewer }), { projectId, scenarioId: id });
    const storage = ((await seen.json()) as { storage: { runs: number; clearable: number; pinned: number; keptPerCheck: number } }).storage;
    expect(storage).toMatchObject({ runs: 6, clearable: 1, pinned: 1, keptPerCheck: 2 });
    const denied = await call(storageRoute.DELETE, makeRequest("DELETE", storageUrl, { cookie: cookies.engineer }), { projectId, scenarioId: id });
    expect(denied.status).toBe(403);
    const cleared = await call(storageRoute.DELETE, makeRequest("DELETE", storageUrl, { cookie: cookies.owner }), { projectId, scenarioId: id });
    expect(cleared.status).toBe(200);
    expect(((await cleared.json()) as { deleted: number }).deleted).toBe(1);
    const left = await db.select({ id: checkRuns.id }).from(checkRuns).where(and(eq(checkRuns.scenarioId, id), eq(checkRuns.check, "isolation")));
    expect(left.map((r) => r.id).sort()).toEqual(["legacy-2", "legacy-3"]); // the oldest went
  });
});
