import { expect, test } from "@playwright/test";
import { helmAnswer as answer, helmCommand as command, openDemoBaselineByHelm, saveRevision } from "./helpers";

// The spread analysis (issue 17) on the seeded demo project (db/seed-scenarios.ts): an engineer gives the
// driver pad DRV a spread of ± 1 dB in the inspector, the chart marks it, and the analysis run from the
// helm shows its progress and then the yield table.

test.describe.configure({ timeout: 180_000 });


test("an engineer adds a spread on the baseline, runs the spread analysis from the helm and reads the yield table", async ({ page }) => {
  await openDemoBaselineByHelm(page);

  // the inspector's spread row of the pad's loss: ± 1 dB uniform
  await page.locator('[aria-label^="Block DRV,"]').click();
  const inspector = page.getByRole("complementary", { name: "Inspector" });
  await inspector.getByRole("combobox", { name: "Spread of loss_db" }).selectOption("plus_minus");
  const amount = inspector.getByRole("textbox", { name: "Spread amount of loss_db" });
  await amount.fill("1");
  await amount.press("Enter");
  await expect(page.getByLabel("DRV has spreads")).toBeVisible();
  // the analysis runs on a saved revision (a job on the server): save the spread deliberately
  await expect(page.getByRole("status", { name: /^Save state:/ })).toHaveText("Draft saved", { timeout: 15_000 });
  await saveRevision(page, "DRV loss ±1 dB spread");

  await command(page, "Spread analysis…");
  await answer(page, "Samples", "3000");
  await answer(page, "Seed (blank for a random one, stored with the run)", "7");
  await expect(page.getByTestId("job-progress")).toBeVisible();
  await expect(page.getByTestId("job-progress")).toContainText("Spread analysis");

  const result = page.getByRole("article", { name: "Spread analysis result" });
  await expect(result).toBeVisible({ timeout: 120_000 });
  await expect(result.getByTestId("check-headline")).toContainText("3000 samples, seed 7");
  const table = result.getByTestId("spread-yield-table");
  await expect(table.getByRole("columnheader", { name: "95% interval" })).toBeVisible();
  // one row per judged rule, each with passed/total out of 3000
  await expect(table.getByRole("row").nth(1)).toContainText("/3000");
  await expect(result.getByText(/DRV\.loss_db ±1 dB/)).toBeVisible();
});
