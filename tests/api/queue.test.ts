// REDIS_URL (issue 14): long jobs go through BullMQ on Redis and a separate `npm run worker` process takes
// them, storing the same run an in-process job stores. Needs Debian's redis-server (tests/run-all.sh
// installs it); this file starts one on a loopback port and skips, saying why, when it is missing.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { existsSync } from "node:fs";
import path from "node:path";
import { eq } from "drizzle-orm";
import { call, findFreePort, makeRequest, setUpDatabase } from "./helpers";

const REDIS_SERVER = "/usr/bin/redis-server";
const hasRedis = existsSync(REDIS_SERVER);
if (!hasRedis) console.warn("queue.test.ts skipped: /usr/bin/redis-server is missing (apt-get install redis-server)");

const redisPort = await findFreePort();
process.env.REDIS_URL = `redis://127.0.0.1:${redisPort}`;

let redis: ChildProcess | null = null;
let worker: ChildProcess | null = null;
let workerLog = "";
let projectId: string;
let scenarioId: string;
let cookie: string;

async function until<T>(what: string, check: () => Promise<T | null>): Promise<T> {
  for (let i = 0; i < 600; i++) {
    const value = await check();
    if (value !== null) return value;
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
  throw new Error(`gave up waiting for ${what}; worker said: ${workerLog}`);
}

describe.skipIf(!hasRedis)("long jobs through Redis and a worker process", () => {
  beforeAll(async () => {
    redis = spawn(REDIS_SERVER, ["--port", String(redisPort), "--bind", "127.0.0.1", "--save", "", "--appendonly", "no"], { stdio: "ignore" });
    await until("redis-server", async () => (spawnSync("redis-cli", ["-p", String(redisPort), "ping"], { encoding: "utf8" }).stdout.trim() === "PONG" ? true : null));
    await setUpDatabase();
    const { db } = await import("@/db/client");
    const { scenarios, users } = await import("@/db/schema");
    const { DEMO_USERS, seedDemo } = await import("@/db/seed");
    const { createSessionForUser } = await import("@/lib/server/auth/session");
    projectId = (await seedDemo()).projectId!;
    const engineer = DEMO_USERS.find((u) => u.role === "engineer")!;
    const [row] = await db.select({ id: users.id }).from(users).where(eq(users.email, engineer.email));
    cookie = `portolan_session=${(await createSessionForUser(row.id)).token}`;
    const [sc] = await db.select({ id: scenarios.id }).from(scenarios).where(eq(scenarios.name, "Cheaper switch"));
    scenarioId = sc.id;
    // the worker process: same database file, same Redis, its own thread pool
    worker = spawn(process.execPath, [path.resolve("dist/queue-worker.mjs")], { env: { ...process.env, JOB_THREADS: "1" }, stdio: ["ignore", "pipe", "pipe"] });
    worker.stdout?.on("data", (d: Buffer) => (workerLog += d.toString()));
    worker.stderr?.on("data", (d: Buffer) => (workerLog += d.toString()));
    await until("the worker to start", async () => (workerLog.includes("taking jobs") ? true : null));
  });

  afterAll(async () => {
    const { closeQueue } = await import("@/lib/server/jobs/queue");
    const { closeJobPool } = await import("@/lib/server/jobs/pool");
    await closeQueue();
    await closeJobPool();
    worker?.kill("SIGTERM");
    redis?.kill("SIGTERM");
  });

  it("a state sweep is taken by the worker process and stores the same result as an in-process run", async () => {
    const runsRoute = await import("@/app/api/projects/[projectId]/scenarios/[scenarioId]/check-runs/route");
    const runRoute = await import("@/app/api/projects/[projectId]/scenarios/[scenarioId]/check-runs/[runId]/route");
    const jobRoute = await import("@/app/api/projects/[projectId]/jobs/[jobId]/route");
    const res = await call(runsRoute.POST, makeRequest("POST", `/api/projects/${projectId}/scenarios/${scenarioId}/check-runs`, { cookie, body: { check: "state_sweep", inputs: {} } }), { projectId, scenarioId });
    expect(res.status).toBe(202);
    const { job } = (await res.json()) as { job: { id: string } };
    const done = await until("the job", async () => {
      const r = await call(jobRoute.GET, makeRequest("GET", `/api/projects/${projectId}/jobs/${job.id}`, { cookie }), { projectId, jobId: job.id });
      const current = ((await r.json()) as { job: { state: string; runId: string | null; takenBy: string | null } }).job;
      return current.state === "queued" || current.state === "running" ? null : current;
    });
    expect(done.state).toBe("done");
    // taken by the other process, not this one
    expect(done.takenBy).toMatch(new RegExp(`^worker ${worker!.pid}@`));
    const runRes = await call(runRoute.GET, makeRequest("GET", `/api/projects/${projectId}/scenarios/${scenarioId}/check-runs/${done.runId}`, { cookie }), { projectId, scenarioId, runId: done.runId! });
    const queued = ((await runRes.json()) as { run: { verdict: string; figures: { headline: string; result: { rows: unknown[]; combinations: number } } } }).run;

    // the same task run in this process's pool
    const { loadScenario } = await import("@/db/queries/scenarios");
    const { getPartTexts, partFilesOf } = await import("@/db/queries/parts");
    const { projectRuleSpecs } = await import("@/db/queries/rules");
    const { effectiveRuleSet } = await import("@/engine/checks");
    const { resolveAccess } = await import("@/lib/server/permissions");
    const { runInPool, taskLimits } = await import("@/lib/server/jobs/pool");
    const { gunzipSync } = await import("node:zlib");
    const { users } = await import("@/db/schema");
    const { db } = await import("@/db/client");
    const [anyUser] = await db.select({ id: users.id }).from(users).limit(1);
    const access = await resolveAccess({ userId: anyUser.id, projectId }).catch(() => ({ userId: anyUser.id, projectId, role: "owner" as const }));
    const { revision } = await loadScenario(access, { scenarioId });
    const parts = await getPartTexts({ projectId, files: partFilesOf(revision.content) });
    const local = await runInPool({ kind: "check", content: revision.content, parts, request: { check: "state_sweep", inputs: {} }, ruleSet: effectiveRuleSet(await projectRuleSpecs({ projectId }), revision.content), ...taskLimits() });
    if (!local.ok || local.kind !== "check") throw new Error("the in-process run failed");
    const figures = JSON.parse(gunzipSync(local.figuresGz).toString("utf8")) as typeof queued.figures;
    expect(queued.verdict).toBe(local.verdict);
    expect(queued.figures.headline).toBe(figures.headline);
    expect(queued.figures.result.combinations).toBe(figures.result.combinations);
    expect(queued.figures.result.rows).toEqual(figures.result.rows);
  });
});
