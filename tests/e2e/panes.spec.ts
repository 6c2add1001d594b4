import { expect as baseExpect, test, type Locator, type Page, type TestInfo } from "@playwright/test";
import { demoUsers, signIn } from "./helpers";

// Issue 15 item 1 (one screen for the job) and issue 18 item 8 (small screens), as an engineer on the
// seeded demo project (db/seed.ts, db/seed-scenarios.ts). Screenshots are kept as test artefacts.
const DEMO_PROJECT = "Kestrel telemetry front end";

test.describe.configure({ timeout: 180_000 });

// the workspace is a heavy client page and the machine is shared: wait longer than the default for it
const expect = baseExpect.configure({ timeout: 40_000 });

type Box = { x: number; y: number; width: number; height: number };

function overlaps(a: Box, b: Box): boolean {
  return a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height;
}

/**
 * Opens the demo's Baseline, or (with `copyName`) a copy of it made for this story, so that the story's
 * edits leave the demo as the other specs expect it.
 */
async function openBaseline(page: Page, copyName?: string): Promise<void> {
  await signIn(page, demoUsers.engineer.email, demoUsers.engineer.password);
  await expect(page).toHaveURL(/\/projects(\/|$|\?)/, { timeout: 60_000 });
  const { projects } = (await (await page.request.get("/api/projects")).json()) as { projects: { id: string; name: string }[] };
  const project = projects.find((p) => p.name === DEMO_PROJECT);
  expect(project).toBeDefined();
  const { scenarios } = (await (await page.request.get(`/api/projects/${project!.id}/scenarios`)).json()) as { scenarios: { id: string; name: string }[] };
  const baseline = scenarios.find((s) => s.name === "Baseline");
  expect(baseline).toBeDefined();
  let id = baseline!.id;
  if (copyName) {
    const response = await page.request.post(`/api/projects/${project!.id}/scenarios/${id}/duplicate`, {
      data: { name: copyName },
      headers: { origin: new URL(page.url()).origin },
    });
    expect(response.status()).toBe(201);
    id = ((await response.json()) as { scenario: { id: string } }).scenario.id;
  }
  await page.goto(`/projects/${project!.id}/scenarios/${id}`);
  await expect(page.getByTestId("workspace")).toBeVisible();
}

/** The page itself does not scroll: everything scrolls inside its pane. */
async function expectNoPageScroll(page: Page): Promise<void> {
  const { scrollHeight, innerHeight } = await page.evaluate(() => ({ scrollHeight: document.scrollingElement!.scrollHeight, innerHeight: window.innerHeight }));
  expect(scrollHeight, "document.scrollingElement.scrollHeight").toBeLessThanOrEqual(innerHeight);
}

/** Wholly inside the viewport (not below the fold, not cut at a side). */
async function expectOnScreen(page: Page, locator: Locator, what: string): Promise<Box> {
  await expect(locator, what).toBeVisible();
  const box = await locator.boundingBox();
  const viewport = page.viewportSize()!;
  expect(box, what).not.toBeNull();
  expect(box!.y, `${what}: top`).toBeGreaterThanOrEqual(0);
  expect(box!.y + box!.height, `${what}: bottom`).toBeLessThanOrEqual(viewport.height + 0.5);
  expect(box!.x + box!.width, `${what}: right`).toBeLessThanOrEqual(viewport.width + 0.5);
  return box!;
}

async function shot(page: Page, testInfo: TestInfo, name: string): Promise<void> {
  await testInfo.attach(name, { body: await page.screenshot(), contentType: "image/png" });
}

const chart = (page: Page) => page.locator('[aria-label="Chart"]');
const inspector = (page: Page) => page.getByRole("complementary", { name: "Inspector" });
const results = (page: Page) => page.getByRole("region", { name: "Results" });
const checks = (page: Page) => page.getByRole("region", { name: "Checks", exact: true });

for (const viewport of [
  { width: 1440, height: 900 },
  { width: 1024, height: 768 },
]) {
  test.describe(`at ${viewport.width}×${viewport.height}`, () => {
    test.use({ viewport });

    test("chart, inspector, results and checks on one screen; no page scroll; the helm button covers no field; the plan one tab away", async ({ page }, testInfo) => {
      await openBaseline(page, `Panes story ${viewport.width}`);
      await expectOnScreen(page, chart(page), "chart");
      await expectOnScreen(page, inspector(page), "inspector");
      await expectOnScreen(page, results(page), "results pane");
      await expect(results(page).getByRole("button", { name: /^S21 \(TX → RX\)/ })).toBeVisible();
      await expectOnScreen(page, page.getByRole("region", { name: "Verdicts and review" }), "checks pane");
      await expectOnScreen(page, checks(page).getByRole("heading", { name: "Checks" }), "checks heading");
      await expectNoPageScroll(page);
      await shot(page, testInfo, `workspace-${viewport.width}x${viewport.height}`);

      // one helm button, in the workspace toolbar (no floating one)
      const helmButtons = page.getByRole("button", { name: /^Helm/ });
      await expect(helmButtons).toHaveCount(1);
      await expect(page.getByRole("toolbar", { name: "Workspace" }).getByRole("button", { name: /^Helm/ })).toBeVisible();

      // a block selected: its fields in view, none under the helm button, the page still not scrolling
      await page.getByTestId("workspace").locator('.react-flow__node[data-id="TERM"]').click();
      const term = page.getByRole("region", { name: "Inspector for TERM" });
      await expect(term).toBeVisible();
      await expectNoPageScroll(page);
      const helmBox = (await helmButtons.boundingBox())!;
      const fields = inspector(page).locator("input, select, textarea");
      const count = await fields.count();
      expect(count).toBeGreaterThan(1);
      for (let i = 0; i < count; i++) {
        const box = await fields.nth(i).boundingBox();
        if (box) expect(overlaps(helmBox, box), `helm button over inspector field ${i}`).toBe(false);
      }

      // typing in the inspector leaves the chart where it was
      const chartBefore = (await chart(page).boundingBox())!;
      const returnLoss = term.getByLabel(/^Return loss/);
      await returnLoss.fill("24");
      await returnLoss.press("Tab");
      // the edit is kept as the working draft (autosave)
      await expect(page.getByRole("status", { name: /^Save state:/ })).toHaveText("Draft saved", { timeout: 15_000 });
      const chartAfter = (await chart(page).boundingBox())!;
      expect(chartAfter.y).toBeCloseTo(chartBefore.y, 0);
      expect(chartAfter.height).toBeCloseTo(chartBefore.height, 0);
      await expectNoPageScroll(page);

      // the frequency plan while TERM stays selected
      await inspector(page).getByRole("tab", { name: "Plan and Z0" }).click();
      await expect(inspector(page).getByRole("heading", { name: "Frequency plan" })).toBeVisible();
      await expectOnScreen(page, inspector(page).getByRole("form", { name: "Frequency plan" }).getByLabel(/^Start/), "plan start field");
      await expect(page.getByTestId("workspace").locator('.react-flow__node[data-id="TERM"].selected')).toHaveCount(1);
      await shot(page, testInfo, `plan-with-block-selected-${viewport.width}x${viewport.height}`);
      await inspector(page).getByRole("tab", { name: "Block" }).click();
      await expect(term).toBeVisible();
    });
  });
}

test.describe("pane sizes", () => {
  test.use({ viewport: { width: 1440, height: 900 } });

  test("a separator moves with the arrow keys, says its value, and the size is remembered after a reload", async ({ page }, testInfo) => {
    await openBaseline(page);
    const separator = page.getByRole("separator", { name: "Resize chart and inspector" });
    await expect(separator).toBeVisible();
    const before = Number(await separator.getAttribute("aria-valuenow"));
    expect(before).toBeGreaterThan(0);
    const chartWidth = (await chart(page).boundingBox())!.width;

    await separator.focus();
    await expect(separator).toBeFocused();
    for (let i = 0; i < 3; i++) await page.keyboard.press("ArrowLeft");
    await expect.poll(async () => Number(await separator.getAttribute("aria-valuenow"))).toBeLessThan(before);
    const after = Number(await separator.getAttribute("aria-valuenow"));
    await expect.poll(async () => (await chart(page).boundingBox())!.width).toBeLessThan(chartWidth - 20);
    await expectNoPageScroll(page);
    await shot(page, testInfo, "after-keyboard-resize");

    // the vertical separator between chart and results answers to the up and down keys
    const rows = page.getByRole("separator", { name: "Resize chart and results" });
    const rowsBefore = Number(await rows.getAttribute("aria-valuenow"));
    await rows.focus();
    await page.keyboard.press("ArrowDown");
    await expect.poll(async () => Number(await rows.getAttribute("aria-valuenow"))).toBeGreaterThan(rowsBefore);

    await page.reload();
    await expect(page.getByTestId("workspace")).toBeVisible();
    await expect(page.getByRole("separator", { name: "Resize chart and inspector" })).toHaveAttribute("aria-valuenow", String(after));
  });
});

test.describe("at 390×844", () => {
  test.use({ viewport: { width: 390, height: 844 }, hasTouch: true, isMobile: true });

  test("the workspace reads as a list with results and checks, the chart behind a toggle, nothing wider than the screen", async ({ page }, testInfo) => {
    await openBaseline(page);
    const list = page.getByRole("region", { name: "Scenario as a list" });
    await expect(list).toBeVisible();
    await expect(chart(page)).toHaveCount(0);
    const blocks = list.getByRole("list", { name: "Blocks" });
    await expect(blocks.getByRole("listitem")).toHaveCount(9);
    await expect(blocks).toContainText("TERM");
    await expect(blocks).toContainText("Load");
    await expect(blocks).toContainText(/Return loss\d+(\.\d+)? dB/);
    await expect(list.getByRole("list", { name: "Links" })).toContainText("DRV:2");
    await expect(list.getByRole("list", { name: "System ports" })).toContainText("TX at DRV:1");
    await expect(results(page).getByRole("button", { name: /^S21 \(TX → RX\)/ })).toBeAttached();
    await expect(checks(page)).toBeAttached();

    // a block from the list opens in the inspector
    await blocks.getByRole("button", { name: /^TERM/ }).click();
    const term = page.getByRole("region", { name: "Inspector for TERM" });
    await expect(term).toBeVisible();
    // brought into view below the list
    await expect.poll(async () => (await term.boundingBox())!.y).toBeLessThan(844);
    await expect.poll(async () => (await term.boundingBox())!.y).toBeGreaterThanOrEqual(0);

    const widths = () => page.evaluate(() => ({ scroll: document.scrollingElement!.scrollWidth, inner: window.innerWidth }));
    let w = await widths();
    expect(w.scroll, "no horizontal overflow (list)").toBeLessThanOrEqual(w.inner);
    await shot(page, testInfo, "workspace-390-list");
    await results(page).scrollIntoViewIfNeeded();
    await shot(page, testInfo, "workspace-390-results");

    // the header fits: the account menu is on screen
    await page.evaluate(() => window.scrollTo(0, 0));
    await expectOnScreen(page, page.getByRole("button", { name: "Account menu" }), "account menu");

    // the chart behind its toggle
    await page.getByRole("button", { name: "Chart", exact: true }).click();
    await expect(chart(page)).toBeVisible();
    await expect(list).toHaveCount(0);
    w = await widths();
    expect(w.scroll, "no horizontal overflow (chart)").toBeLessThanOrEqual(w.inner);
    await shot(page, testInfo, "workspace-390-chart");
  });

  test("the project pages fit at 390 px", async ({ page }) => {
    await openBaseline(page);
    const projectUrl = page.url().replace(/\/scenarios\/.*$/, "");
    for (const path of ["", "/scenarios", "/parts", "/rules", "/compare", "/members", "/signoffs"]) {
      await page.goto(projectUrl + path);
      await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
      const w = await page.evaluate(() => ({ scroll: document.scrollingElement!.scrollWidth, inner: window.innerWidth }));
      expect(w.scroll, `no horizontal overflow on ${path || "the overview"}`).toBeLessThanOrEqual(w.inner);
    }
  });
});
