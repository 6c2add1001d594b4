/**
 * `npm run bench:api` (after `npx next build`): throughput and latency of the API under load, with
 * autocannon against `next start` on loopback, each run bounded in time (BENCH_SECONDS, default 10).
 * - scenario list: GET /api/projects/:p/scenarios with 60 scenarios in the project, 50 clients
 *   (target: ≥ 300 requests/s, p99 ≤ 500 ms, issue 14);
 * - check runs: POST …/check-runs (an isolation check on the demo baseline), 10 clients; each run is
 *   solved in the job pool and stored (the retention rule keeps the table bounded);
 * - session checks: GET /api/auth/session, 50 clients, while the check runs go on.
 * Prints the load average beside the figures: on a shared machine they move with it. Not part of npm test.
 */
import os from "node:os";
import autocannon from "autocannon";
import { startServer } from "./app/server";

const SECONDS = Number(process.env.BENCH_SECONDS ?? 10);

type Result = { requests: { average: number }; latency: { p50: number; p99: number; max: number }; non2xx: number; errors: number; timeouts: number; statusCodeStats?: Record<string, { count: number }> };

/** " (429 ×3, 503 ×1)": which statuses the non-2xx answers were. */
function statuses(r: Result): string {
  const bad = Object.entries(r.statusCodeStats ?? {}).filter(([code]) => !code.startsWith("2"));
  return bad.length ? ` (${bad.map(([code, { count }]) => `${code} ×${count}`).join(", ")})` : "";
}

function run(opts: autocannon.Options): Promise<Result> {
  return new Promise((resolve, reject) => {
    autocannon({ ...opts, duration: SECONDS }, (err, result) => (err ? reject(err) : resolve(result as unknown as Result)));
  });
}

function row(name: string, r: Result, target?: { rps: number; p99: number }): string {
  const verdict = target ? (r.requests.average >= target.rps && r.latency.p99 <= target.p99 ? "PASS" : "MISS") : "";
  return `${name.padEnd(44)} ${r.requests.average.toFixed(0).padStart(7)} req/s  p50 ${String(r.latency.p50).padStart(5)} ms  p99 ${String(r.latency.p99).padStart(5)} ms  non-2xx ${r.non2xx}${statuses(r)}  errors ${r.errors + r.timeouts}  ${verdict}`;
}

const server = await startServer();
try {
  const cookie = await server.cookie("emil@portolan.example");
  const projectId = await server.projectId(cookie);
  const listUrl = `${server.url}/api/projects/${projectId}/scenarios`;
  const list = (await (await fetch(listUrl, { headers: { cookie } })).json()) as { scenarios: { id: string; name: string }[] };
  for (let i = list.scenarios.length; i < 60; i++) {
    const res = await fetch(listUrl, { method: "POST", headers: { cookie, origin: server.url, "content-type": "application/json" }, body: JSON.stringify({ name: `Bench ${i}`, template: "tr-switch" }) });
    if (res.status !== 201) throw new Error(`creating scenario ${i}: ${res.status} ${await res.text()}`);
  }
  const scenarios = ((await (await fetch(listUrl, { headers: { cookie } })).json()) as { scenarios: { id: string; name: string }[] }).scenarios;
  const baseline = scenarios.find((s) => s.name === "Baseline")!;
  // warm the routes once
  await fetch(listUrl, { headers: { cookie } });
  const checkBody = JSON.stringify({ check: "isolation", inputs: { from: "TX", to: "RX", band: [2.4e9, 2.48e9], min_db: 30 } });
  const checkUrl = `${server.url}/api/projects/${projectId}/scenarios/${baseline.id}/check-runs`;
  await fetch(checkUrl, { method: "POST", headers: { cookie, origin: server.url, "content-type": "application/json" }, body: checkBody });

  console.log(`bench:api — next start on loopback, ${os.availableParallelism()} cores, ${SECONDS} s per run, load average before: ${os.loadavg().map((x) => x.toFixed(2)).join(" ")}`);
  const listResult = await run({ url: listUrl, connections: 50, headers: { cookie } });
  console.log(row(`scenario list (${scenarios.length} scenarios, 50 clients)`, listResult, { rps: 300, p99: 500 }));
  const [checks, sessions] = await Promise.all([
    run({ url: checkUrl, method: "POST", connections: 10, headers: { cookie, origin: server.url, "content-type": "application/json" }, body: checkBody }),
    run({ url: `${server.url}/api/auth/session`, connections: 50, headers: { cookie } }),
  ]);
  console.log(row("check runs, isolation on Baseline (10 clients)", checks));
  console.log(row("session checks meanwhile (50 clients)", sessions));
  console.log(`load average after: ${os.loadavg().map((x) => x.toFixed(2)).join(" ")}`);
} finally {
  server.stop();
}
