import { expect, test, type Page } from "@playwright/test";
import { demoUsers, signIn, type DemoRole } from "./helpers";

// The helm (Ctrl+K) on the seeded demo project (db/seed.ts, db/seed-scenarios.ts): "Baseline" meets the
// TX→RX isolation rule (≥ 30 dB over 2.40–2.48 GHz), "Cheaper switch" (T/R switch isolation 25 dB instead
// of 45 dB) does not. Everything after signing in is done with the keyboard only.
const DEMO_PROJECT = "Kestrel telemetry front end";

test.describe.configure({ timeout: 120_000 });

const helm = (page: Page) => page.getByRole("dialog", { name: "Helm" });
const helmInput = (page: Page) => helm(page).getByRole("combobox");

async function openHelm(page: Page): Promise<void> {
  await page.keyboard.press("Control+k");
  await expect(helm(page)).toBeVisible();
  await expect(helmInput(page)).toBeFocused();
}

/** Open the helm, type a command and run it with Enter. */
async function command(page: Page, text: string): Promise<void> {
  await openHelm(page);
  await page.keyboard.type(text);
  // the lists load when the helm opens: wait until the command typed is the one Enter would run
  await expect(helm(page).locator('[cmdk-item][data-selected="true"]')).toContainText(text.replace(/…$/, ""));
  await page.keyboard.press("Enter");
}

/** Answer the step the helm shows: Enter alone takes the default (the first option, or the text shown). */
async function answer(page: Page, prompt: string, text?: string): Promise<void> {
  await expect(helmInput(page)).toHaveAttribute("aria-label", prompt);
  if (text !== undefined) {
    await page.keyboard.press("Control+a");
    await page.keyboard.type(text);
  }
  await page.keyboard.press("Enter");
}

/** From the projects page to a demo scenario, through the helm. */
async function goToScenario(page: Page, role: DemoRole, scenario: string): Promise<void> {
  await signIn(page, demoUsers[role].email, demoUsers[role].password);
  // password hashing is slow on a busy machine: allow more than the default 10 s
  await expect(page).toHaveURL(/\/projects(\/|$|\?)/, { timeout: 30_000 });
  await command(page, "Go to project…");
  await answer(page, "Project", DEMO_PROJECT);
  await expect(page).toHaveURL(/\/projects\/[^/]+$/);
  await expect(page.getByRole("heading", { level: 1, name: DEMO_PROJECT })).toBeVisible();
  await command(page, `Open scenario ${scenario}`);
  await expect(page.getByTestId("workspace")).toBeVisible({ timeout: 30_000 });
  await expect(page.getByRole("heading", { level: 2, name: scenario, exact: true }).first()).toBeVisible();
}

test("keyboard only: an isolation check with chosen ports and band fails on Cheaper switch", async ({ page }) => {
  await goToScenario(page, "engineer", "Cheaper switch");
  await command(page, "Run isolation check");
  await answer(page, "From port", "TX");
  await answer(page, "To port", "RX");
  await answer(page, "Band", "2.4 GHz to 2.48 GHz");
  await answer(page, "Least isolation (dB)", "30");
  await expect(helm(page)).toBeHidden();

  const result = page.getByRole("article", { name: "Isolation check result" });
  await expect(result).toBeVisible({ timeout: 30_000 });
  await expect(result.getByText("Fail", { exact: true }).first()).toBeVisible();
  await expect(result.getByTestId("check-headline")).toContainText(/TX→RX|RX→TX/);
  // the run is in the history, tied to revision 1
  await expect(page.getByRole("list", { name: "Run history" }).getByRole("button").first()).toContainText("r1");

  // the command is now first among the recent ones
  await openHelm(page);
  await expect(helm(page).getByRole("option").first()).toHaveText(/Run isolation check/);
  await page.keyboard.press("Escape");
  await expect(helm(page)).toBeHidden();
});

test("keyboard only: a leak trace lists its hops and highlights them on the chart", async ({ page }) => {
  await goToScenario(page, "engineer", "Cheaper switch");
  await command(page, "Trace leak paths");
  await answer(page, "From port");
  await answer(page, "To port");
  await answer(page, "Band");

  const result = page.getByRole("article", { name: "Leak trace result" });
  await expect(result).toBeVisible({ timeout: 30_000 });
  const hops = result.getByRole("list", { name: "Hops of path 1" });
  await expect(hops).toContainText("TR");
  await expect(hops).toContainText("dB");
  // the strongest path is shown on the chart: its blocks carry the mark
  await expect(page.locator('[aria-label^="Block TR,"][aria-label$="on the highlighted leak path"]')).toHaveCount(1);
  await expect(page.locator('[aria-label^="Block TR,"]')).toBeVisible();
  // and the links between the path's blocks are marked too (DRV → TXBPF leads from TX into the chain)
  await expect(page.locator('[aria-label="Link DRV:2 to TXBPF:1, on the highlighted leak path"]')).toHaveCount(1);
  // a block that the path does not cross is not marked
  await expect(page.locator('[aria-label^="Block ANTB,"][aria-label$="on the highlighted leak path"]')).toHaveCount(0);
});

test("keyboard only: comparing the two demo scenarios shows the isolation rule that differs", async ({ page }) => {
  await goToScenario(page, "engineer", "Baseline");
  await command(page, "Compare scenarios");
  await answer(page, "First scenario");
  await answer(page, "Second scenario", "Cheaper switch");
  await expect(page.getByRole("heading", { level: 2, name: "Compare" })).toBeVisible();

  const differs = page.getByRole("row", { name: "Rule tx-rx-isolation, verdict differs" });
  await expect(differs).toBeVisible({ timeout: 60_000 });
  await expect(differs.getByText("Pass", { exact: true })).toBeVisible();
  await expect(differs.getByText("Fail", { exact: true })).toBeVisible();
  // the other rules keep their verdict
  await expect(page.getByRole("row", { name: "Rule tx-match" })).toBeVisible();
  await expect(page.getByRole("row", { name: /verdict differs/ })).toHaveCount(1);
  // and the difference is the T/R switch's isolation
  await expect(page.getByRole("list", { name: "Differences" })).toContainText("isolation_db: 45 dB → 25 dB");
});

test("a reviewer's helm lists checks but no editing actions", async ({ page }) => {
  await goToScenario(page, "reviewer", "Cheaper switch");
  await openHelm(page);
  const options = helm(page).getByRole("option");
  await expect(options.filter({ hasText: "Run isolation check" })).toHaveCount(1);
  await expect(options.filter({ hasText: "Export review bundle" })).toHaveCount(1);
  for (const editing of ["Add block…", "Mark system port…", "Set switch state…", "Save revision", "Duplicate scenario"]) {
    await expect(options.filter({ hasText: editing })).toHaveCount(0);
  }
  await page.keyboard.press("Escape");

  // the same page for an engineer lists them (the filter is by role, not by page)
  await page.context().clearCookies();
  await goToScenario(page, "engineer", "Cheaper switch");
  await openHelm(page);
  for (const editing of ["Add block…", "Mark system port…", "Set switch state…", "Save revision", "Duplicate scenario"]) {
    await expect(helm(page).getByRole("option").filter({ hasText: editing })).toHaveCount(1);
  }
});

test("keyboard only: the power ledger, the state sweep and the drive check render their results", async ({ page }) => {
  await goToScenario(page, "engineer", "Cheaper switch");
  await command(page, "Show power ledger");
  await answer(page, "Port", "TX");
  const ledger = page.getByRole("article", { name: "Power ledger result" });
  await expect(ledger).toBeVisible({ timeout: 30_000 });
  await expect(ledger.getByRole("img", { name: /^Power ledger from TX at / })).toBeVisible();

  await command(page, "Sweep switch states");
  const sweep = page.getByRole("article", { name: "State sweep result" });
  await expect(sweep).toBeVisible({ timeout: 30_000 });
  // TR and ASW have two throws each: four combinations, one marked best and one worst
  await expect(sweep.getByRole("row")).toHaveCount(5);
  await expect(sweep.locator('tr[data-mark="best"]')).toHaveCount(1);
  await expect(sweep.locator('tr[data-mark="worst"]')).toHaveCount(1);

  await command(page, "Check drive levels");
  await answer(page, "Source powers", "TX 20 dBm");
  const drive = page.getByRole("article", { name: "Drive check result" });
  await expect(drive).toBeVisible({ timeout: 30_000 });
  await expect(drive.getByText("Transmitting systems are to be verified by qualified people with calibrated instruments before use.")).toBeVisible();
  // sorting a column by keyboard: the header button toggles aria-sort
  const header = drive.getByRole("columnheader", { name: "Block" });
  await header.getByRole("button").focus();
  await page.keyboard.press("Enter");
  await expect(header).toHaveAttribute("aria-sort", /ascending|descending/);
});

test("the rules page: an engineer adds a rule with a band in GHz, a reviewer only reads", async ({ page }) => {
  await signIn(page, demoUsers.engineer.email, demoUsers.engineer.password);
  await expect(page).toHaveURL(/\/projects(\/|$|\?)/, { timeout: 30_000 });
  await command(page, "Go to project…");
  await answer(page, "Project", DEMO_PROJECT);
  await expect(page).toHaveURL(/\/projects\/[^/]+$/);
  await command(page, "Go to rules");
  await expect(page.getByRole("heading", { level: 2, name: "Rules" })).toBeVisible();
  await page.getByRole("button", { name: "New rule" }).click();
  const form = page.getByRole("form", { name: "New rule" });
  await form.getByLabel("Name").fill("mon-isolation");
  await form.getByLabel("From port").fill("TX");
  await form.getByLabel("To port").fill("MON");
  await form.getByLabel("Band").fill("2.40 to 2.48 GHz");
  // an empty limit is refused with a message beside the field, nothing is sent
  await form.getByRole("button", { name: "Save rule" }).click();
  await expect(form.getByText("Enter the limit.")).toBeVisible();
  await form.getByLabel("Least isolation (dB)").fill("15");
  await form.getByRole("button", { name: "Save rule" }).click();
  const row = page.getByRole("row").filter({ hasText: "mon-isolation" });
  await expect(row).toContainText("TX → MON");
  await expect(row).toContainText("2.4 GHz to 2.48 GHz");

  await page.context().clearCookies();
  await signIn(page, demoUsers.reviewer.email, demoUsers.reviewer.password);
  await expect(page).toHaveURL(/\/projects(\/|$|\?)/, { timeout: 30_000 });
  await command(page, "Go to project…");
  await answer(page, "Project", DEMO_PROJECT);
  await expect(page).toHaveURL(/\/projects\/[^/]+$/);
  await command(page, "Go to rules");
  await expect(page.getByRole("row").filter({ hasText: "mon-isolation" })).toBeVisible();
  await expect(page.getByRole("button", { name: "New rule" })).toHaveCount(0);
  await expect(page.getByRole("button", { name: /^Edit rule/ })).toHaveCount(0);
});
