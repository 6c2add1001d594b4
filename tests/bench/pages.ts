/**
 * `npm run bench:pages` (after `npx next build`): how soon the workspace of the demo baseline shows its
 * chart and its first results after navigation, in Debian's chromium through Playwright against
 * `next start` on loopback. A script added before the page loads sets performance marks when the first
 * chart block (`.react-flow__node` in the chart) and the results' port matrix appear; their times are from
 * the navigation's start (performance.timeOrigin). Median of BENCH_RUNS fresh loads (default 7), after one
 * warm-up load. Targets (issue 14): chart ≤ 1 s, first results ≤ 1.5 s. Prints the load average.
 */
import os from "node:os";
import { chromium } from "@playwright/test";
import { startServer } from "./app/server";

const RUNS = Number(process.env.BENCH_RUNS ?? 7);

const markScript = `
(() => {
  const seen = {};
  const watch = () => {
    const marks = { "chart-shown": '[data-testid="scenario-chart"] .react-flow__node', "results-shown": '[data-testid="matrix-frequency"]' };
    for (const [name, selector] of Object.entries(marks)) {
      if (!seen[name] && document.querySelector(selector)) { seen[name] = true; performance.mark(name); }
    }
  };
  new MutationObserver(watch).observe(document, { childList: true, subtree: true });
})();
`;

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

const server = await startServer();
const browser = await chromium.launch({ executablePath: "/usr/bin/chromium", args: ["--headless", "--no-sandbox", "--disable-gpu"] });
try {
  const cookie = await server.cookie("emil@portolan.example");
  const projectId = await server.projectId(cookie);
  const scenarios = ((await (await fetch(`${server.url}/api/projects/${projectId}/scenarios`, { headers: { cookie } })).json()) as { scenarios: { id: string; name: string }[] }).scenarios;
  const baseline = scenarios.find((s) => s.name === "Baseline")!;
  const [name, value] = cookie.split("=");
  const chart: number[] = [];
  const results: number[] = [];
  for (let i = 0; i <= RUNS; i++) {
    const context = await browser.newContext();
    await context.addCookies([{ name, value, url: server.url }]);
    const page = await context.newPage();
    await page.addInitScript(markScript);
    await page.goto(`${server.url}/projects/${projectId}/scenarios/${baseline.id}`);
    await page.waitForFunction(() => performance.getEntriesByName("chart-shown").length > 0 && performance.getEntriesByName("results-shown").length > 0, null, { timeout: 30_000 });
    const marks = await page.evaluate(() => ({ chart: performance.getEntriesByName("chart-shown")[0].startTime, results: performance.getEntriesByName("results-shown")[0].startTime }));
    if (i > 0) {
      chart.push(marks.chart);
      results.push(marks.results);
    }
    await context.close();
  }
  console.log(`bench:pages — workspace of "Baseline", chromium against next start on loopback, ${RUNS} loads, load average ${os.loadavg().map((x) => x.toFixed(2)).join(" ")}`);
  const verdict = (ms: number, target: number) => (ms <= target ? "PASS" : "MISS");
  console.log(`chart shown          median ${median(chart).toFixed(0).padStart(5)} ms  (min ${Math.min(...chart).toFixed(0)}, max ${Math.max(...chart).toFixed(0)})  target ≤ 1000 ms  ${verdict(median(chart), 1000)}`);
  console.log(`first results shown  median ${median(results).toFixed(0).padStart(5)} ms  (min ${Math.min(...results).toFixed(0)}, max ${Math.max(...results).toFixed(0)})  target ≤ 1500 ms  ${verdict(median(results), 1500)}`);
} finally {
  await browser.close();
  server.stop();
}
