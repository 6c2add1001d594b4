import AxeBuilder from "@axe-core/playwright";
import { expect as baseExpect, test, type Page } from "@playwright/test";
import JSZip from "jszip";
import { writeFileSync } from "node:fs";
import { pathToFileURL } from "node:url";
import { demoUsers, signIn, type DemoRole } from "./helpers";

// Issue 18 item 3 (the report and the bundle state the switch setting, the state sweep summary and the
// drive check) and issue 15 item 7 (favicon, readable port names), on the seeded demo (db/seed.ts).
// Screenshots are kept as test artefacts (testInfo.attach).
const DEMO_PROJECT = "Kestrel telemetry front end";

test.describe.configure({ timeout: 180_000 });
const expect = baseExpect.configure({ timeout: 40_000 });
test.use({ viewport: { width: 1440, height: 900 } });

const origin = (page: Page) => ({ origin: new URL(page.url()).origin });

async function signInAs(page: Page, role: DemoRole): Promise<void> {
  await signIn(page, demoUsers[role].email, demoUsers[role].password);
  await expect(page).toHaveURL(/\/projects(\/|$|\?)/, { timeout: 60_000 });
}

async function demoProject(page: Page): Promise<{ projectId: string; baselineId: string }> {
  const { projects } = (await (await page.request.get("/api/projects")).json()) as { projects: { id: string; name: string }[] };
  const projectId = projects.find((p) => p.name === DEMO_PROJECT)!.id;
  const { scenarios } = (await (await page.request.get(`/api/projects/${projectId}/scenarios`)).json()) as { scenarios: { id: string; name: string }[] };
  return { projectId, baselineId: scenarios.find((s) => s.name === "Baseline")!.id };
}

test("the reviewer opens report.html from a bundle and reads the switch setting, whether it holds in every setting, the sweep and the drive check", async ({ browser }, testInfo) => {
  // the engineer saves the demo front end with a drive rule of its own (TX at 20 dBm; the LNA is rated 10 dBm)
  const eng = await browser.newContext();
  const engPage = await eng.newPage();
  await signInAs(engPage, "engineer");
  const { projectId, baselineId } = await demoProject(engPage);
  const baseline = (await (await engPage.request.get(`/api/projects/${projectId}/scenarios/${baselineId}`)).json()) as { revision: { content: Record<string, unknown> } };
  const name = "E2E report with drive rule";
  const content = { ...baseline.revision.content, name, rules: [{ kind: "drive", id: "tx-drive", sources: [{ port: "TX", dbm: 20 }], band: [2.4e9, 2.48e9] }] };
  const created = await engPage.request.post(`/api/projects/${projectId}/scenarios`, { data: { name, scenario: content }, headers: origin(engPage) });
  expect(created.status()).toBe(201);
  const scenarioId = ((await created.json()) as { scenario: { id: string } }).scenario.id;
  // the demo's three project rules, plus any an earlier story in the same run added (the helm story adds one)
  const projectRules = ((await (await engPage.request.get(`/api/projects/${projectId}/rules`)).json()) as { rules: unknown[] }).rules.length;
  await eng.close();

  const context = await browser.newContext();
  const page = await context.newPage();
  await signInAs(page, "reviewer");
  const bundle = await page.request.get(`/api/projects/${projectId}/scenarios/${scenarioId}/bundle`);
  expect(bundle.status()).toBe(200);
  const zip = await JSZip.loadAsync(await bundle.body());
  const reportPath = testInfo.outputPath("report.html");
  writeFileSync(reportPath, await zip.file("report.html")!.async("string"));
  await page.goto(pathToFileURL(reportPath).href);

  // the headline answers "does it pass in every switch setting": here only in the one shown
  const headline = page.getByTestId("sweep-headline");
  await expect(headline).toContainText("Not shown to hold in every switch setting.");
  await expect(headline).toContainText("This verdict is for the setting shown (TR=1 ASW=1) only");
  await testInfo.attach("report-headline", { body: await page.screenshot(), contentType: "image/png" });

  const setting = page.locator("table", { has: page.getByRole("columnheader", { name: "Throw selected" }) });
  await expect(setting.getByRole("row")).toHaveCount(3);
  await expect(setting.getByRole("row", { name: /TR T\/R switch 2 1/ })).toBeVisible();
  await expect(setting.getByRole("row", { name: /ASW antenna switch 2 1/ })).toBeVisible();

  await expect(page.getByRole("heading", { name: "State sweep: every switch setting" })).toBeVisible();
  const sweep = page.locator("table", { has: page.getByRole("columnheader", { name: "Worst setting" }) });
  // the project's rules and the drive rule, each with its worst of 4 settings (and the header row)
  await expect(sweep.getByRole("row")).toHaveCount(projectRules + 2);
  await expect(sweep.getByRole("row", { name: /tx-ant-loss/ })).toContainText("TR=2 ASW=2");
  await sweep.scrollIntoViewIfNeeded();
  await testInfo.attach("report-sweep", { body: await sweep.screenshot(), contentType: "image/png" });

  await expect(page.getByRole("heading", { name: "Drive check" })).toBeVisible();
  const drive = page.locator("table", { has: page.getByRole("columnheader", { name: "Level reached" }) });
  // the LNA is the one rated part, so it comes first; unrated parts follow with "no rating"
  await expect(drive.getByRole("row").nth(1)).toContainText("LNA");
  await expect(drive.getByRole("row").nth(2)).toContainText("no rating");
  await drive.scrollIntoViewIfNeeded();
  await testInfo.attach("report-drive", { body: await drive.screenshot(), contentType: "image/png" });
  // the RF power cautions stay at the top of the report
  await expect(page.getByRole("note")).toContainText("RF power can burn people and destroy parts.");

  const { violations } = await new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"]).analyze();
  const bad = violations.filter((v) => v.impact === "serious" || v.impact === "critical").map((v) => `${v.id}: ${v.help} (${v.nodes.length})`);
  expect(bad, bad.join("\n")).toEqual([]);
  await context.close();
});

test("the favicon is served as an ICO with several sizes", async ({ page }) => {
  const response = await page.request.get("/favicon.ico");
  expect(response.status()).toBe(200);
  expect(response.headers()["content-type"]).toMatch(/^image\/(x-icon|vnd\.microsoft\.icon)/);
  const body = await response.body();
  // ICONDIR: reserved 0, type 1 (icon), then the image count (the ICO layout every browser reads)
  expect([body.readUInt16LE(0), body.readUInt16LE(2)]).toEqual([0, 1]);
  expect(body.readUInt16LE(4)).toBeGreaterThanOrEqual(2);
});

test("the filter block's ports read as a list of names in the inspector and the port menu", async ({ page }, testInfo) => {
  await signInAs(page, "engineer");
  const { projectId, baselineId } = await demoProject(page);
  await page.goto(`/projects/${projectId}/scenarios/${baselineId}`);
  await expect(page.getByTestId("workspace")).toBeVisible({ timeout: 60_000 });
  await page.locator('[aria-label^="Block RXBPF,"]').click();
  const names = page.getByRole("list", { name: "Port names" });
  // the filter's ports have numbers, not names: each tag says what it meets (demo: TR:3 in, the LNA out)
  await expect(names.getByRole("listitem")).toHaveText(["1 → TR:3", "2 → LNA:1"]);
  await testInfo.attach("inspector-port-names", { body: await names.screenshot(), contentType: "image/png" });
  // a switch's ports are named: the port menu says which one was opened
  await page.getByRole("img", { name: /^Port TR:3 \(throw 2\)/ }).click({ button: "right" });
  const menu = page.getByRole("menu", { name: "Port TR:3 (throw 2)" });
  await expect(menu).toContainText("throw 2");
  await testInfo.attach("port-menu", { body: await menu.screenshot(), contentType: "image/png" });
});
