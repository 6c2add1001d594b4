import { expect, test, type Page } from "@playwright/test";
import { demoUsers, signIn } from "./helpers";

// Issue 15, items 5 and 7, as an engineer on the seeded demo project (db/seed.ts, db/seed-scenarios.ts).
// Screenshots are kept as test artefacts (testInfo.attach) for review.
const DEMO_PROJECT = "Kestrel telemetry front end";

test.describe.configure({ timeout: 150_000 });

const helm = (page: Page) => page.getByRole("dialog", { name: "Helm" });
const helmInput = (page: Page) => helm(page).getByRole("combobox");

async function command(page: Page, text: string): Promise<void> {
  await page.keyboard.press("Control+k");
  await expect(helmInput(page)).toBeFocused();
  await page.keyboard.type(text);
  await expect(helm(page).locator('[cmdk-item][data-selected="true"]')).toContainText(text.replace(/…$/, ""));
  await page.keyboard.press("Enter");
}

async function answer(page: Page, prompt: string | RegExp, text?: string): Promise<void> {
  await expect(helmInput(page)).toHaveAttribute("aria-label", prompt);
  if (text !== undefined) {
    await page.keyboard.press("Control+a");
    await page.keyboard.type(text);
  }
  await page.keyboard.press("Enter");
}

async function openBaseline(page: Page): Promise<void> {
  await signIn(page, demoUsers.engineer.email, demoUsers.engineer.password);
  await expect(page).toHaveURL(/\/projects(\/|$|\?)/, { timeout: 30_000 });
  await command(page, "Go to project…");
  await answer(page, "Project", DEMO_PROJECT);
  await expect(page).toHaveURL(/\/projects\/[^/]+$/);
  await command(page, "Open scenario Baseline");
  await expect(page.getByTestId("workspace")).toBeVisible({ timeout: 30_000 });
}

test("the power ledger reads as shares of the power entering the port, with an energy balance and no pass badge", async ({ page }, testInfo) => {
  await openBaseline(page);
  await command(page, "Show power ledger");
  await answer(page, "Port", "TX");
  const result = page.getByRole("article", { name: "Power ledger result" });
  await expect(result).toBeVisible({ timeout: 30_000 });
  // an analysis, not a verdict
  await expect(result.locator('[data-verdict="analysis"]')).toHaveText("analysis");
  await expect(result.locator('[data-verdict="pass"]')).toHaveCount(0);
  // the closure in words
  await expect(result.getByTestId("ledger-balance")).toContainText(/^1 W incident at TX = .* reflected \+ .* out of the other system ports \+ .* absorbed/);
  await expect(result.getByTestId("ledger-balance")).toContainText(/books balance|unaccounted/);
  // every bar says dB and %, and no share of the entering power is shown as thousands of per cent
  const svg = result.getByRole("img", { name: /Power ledger from TX/ });
  await expect(svg).toContainText("dB ·");
  await expect(svg).not.toContainText(/\d{5,}\.\d+ %/);
  await testInfo.attach("power-ledger", { body: await result.screenshot(), contentType: "image/png" });
});

test("drive check: the source level default is modest and shown; failures and tight margins lead, unrated blocks trail", async ({ page }, testInfo) => {
  await openBaseline(page);
  await command(page, "Check drive levels");
  await expect(helmInput(page)).toHaveAttribute("aria-label", /^Source powers \((from the drive rule|no drive rule: 20 dBm assumed)\)$/);
  await page.keyboard.press("Enter");
  const result = page.getByRole("article", { name: "Drive check result" });
  await expect(result).toBeVisible({ timeout: 30_000 });
  const firstCells = await result.getByRole("table").locator("tbody tr td:first-child").allInnerTexts();
  expect(firstCells.length).toBeGreaterThan(0);
  // once a "no rating" row appears, only "no rating" rows follow
  const firstUnrated = firstCells.findIndex((t) => /no rating/i.test(t));
  if (firstUnrated >= 0) for (const t of firstCells.slice(firstUnrated)) expect(t).toMatch(/no rating/i);
  await testInfo.attach("drive-table", { body: await result.screenshot(), contentType: "image/png" });
});

test("small things: an icon, unclipped block labels and a shortcut sheet on ? that stays shut while typing", async ({ page }, testInfo) => {
  await openBaseline(page);
  await expect(page.locator('link[rel="icon"]').first()).toHaveAttribute("href", /icon/);
  const icon = await page.request.get("/icon.svg");
  expect(icon.ok()).toBe(true);

  // no block label is clipped with an ellipsis
  const titles = page.getByTestId("block-title");
  await expect(titles.first()).toBeVisible();
  for (const el of await titles.all()) {
    const clipped = await el.evaluate((n) => n.scrollWidth > n.clientWidth + 1 || getComputedStyle(n).textOverflow === "ellipsis");
    expect(clipped).toBe(false);
  }

  // "?" while typing in a field types a "?"
  const field = page.getByTestId("workspace").locator("aside input").first();
  await field.click();
  await page.keyboard.press("Shift+Slash");
  await expect(page.getByRole("dialog", { name: "Keyboard shortcuts" })).toBeHidden();
  await page.keyboard.press("Backspace");

  // "?" on the chart opens the sheet
  await page.getByTestId("workspace").getByRole("toolbar", { name: "Workspace" }).click({ position: { x: 2, y: 2 } });
  await page.locator("body").evaluate((b) => (document.activeElement as HTMLElement | null)?.blur?.() ?? b);
  await page.keyboard.press("Shift+Slash");
  const sheet = page.getByRole("dialog", { name: "Keyboard shortcuts" });
  await expect(sheet).toBeVisible();
  await expect(sheet.getByRole("region", { name: "Workspace shortcuts" })).toContainText("Add a block");
  await expect(sheet.getByRole("region", { name: "Helm shortcuts" })).toContainText("Open the helm");
  await testInfo.attach("shortcut-sheet", { body: await page.screenshot(), contentType: "image/png" });
  await page.keyboard.press("Escape");
  await expect(sheet).toBeHidden();
  await testInfo.attach("chart", { body: await page.getByTestId("workspace").screenshot(), contentType: "image/png" });
});
