import { expect, test } from "@playwright/test";
import { helmAnswer as answer, helmCommand as command, openDemoBaselineByHelm } from "./helpers";

// The line-up (issue 16) from the helm on the seeded demo project (db/seed-scenarios.ts): TX → MON runs
// through the driver pad, the TX band-pass part and the monitor coupler. Keyboard only after signing in.

test.describe.configure({ timeout: 120_000 });


test("keyboard only: a line-up from the helm shows its stages, the chart along the path and the traces", async ({ page }) => {
  await openDemoBaselineByHelm(page);

  await command(page, "Line-up: gain, noise figure and levels along a path…");
  await answer(page, "From port", "TX");
  await answer(page, "To port", "MON");
  await answer(page, "Input level (dBm, blank for none)", "0 dBm");

  const result = page.getByRole("article", { name: "Line-up result" });
  await expect(result).toBeVisible({ timeout: 30_000 });
  await expect(result.getByTestId("check-headline")).toContainText("TX→MON through 3 stages");
  const rows = result.getByRole("row");
  await expect(rows).toHaveCount(4); // header + DRV, TXBPF, CPL
  await expect(rows.nth(1)).toContainText("DRV 1→2");
  await expect(rows.nth(3)).toContainText("CPL 1→3");
  await expect(result.getByRole("img", { name: /^Level and cumulative noise figure along the path at / })).toBeVisible();
  // the slider moves the table and the chart to another plan frequency
  const at = result.getByTestId("lineup-frequency");
  const before = await at.textContent();
  await result.getByRole("slider", { name: "Line-up frequency" }).focus();
  await page.keyboard.press("End");
  await expect(at).not.toHaveText(before ?? "");
  await expect(result.getByRole("region", { name: "Gain and noise figure over frequency" })).toBeVisible();
});
