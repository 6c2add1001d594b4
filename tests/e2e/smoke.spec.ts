import { expect, test, type Page } from "@playwright/test";
import { collectForeignRequests, signInAs } from "./helpers";

// Screenshots of the landing page in both themes, kept for a person to look at after a run.
const SHOTS = "test-results/screenshots";

// Palette from docs/README.md ("Look"): paper #F4EFE2 and night-ink #121A24.
const PAPER = "rgb(244, 239, 226)";
const NIGHT = "rgb(18, 26, 36)";

async function backgroundOf(page: Page): Promise<string> {
  return page.evaluate(() => getComputedStyle(document.body).backgroundColor);
}

test("landing page shows the wordmark and a way to sign in, fetching nothing from other hosts", async ({ page }) => {
  const foreign = collectForeignRequests(page);
  const failed: string[] = [];
  page.on("requestfailed", (request) => {
    const reason = request.failure()?.errorText ?? "";
    // The router cancels link prefetches it no longer needs; a cancelled request is not a failed one.
    if (reason === "net::ERR_ABORTED") return;
    failed.push(`${request.url()} ${reason}`);
  });

  await page.goto("/");
  await expect(page.getByRole("heading", { level: 1, name: "Portolan" })).toBeVisible();
  await expect(page.getByRole("link", { name: "Sign in" })).toBeVisible();
  await expect(page.getByTestId("bearing-backdrop")).toBeAttached();
  await page.waitForLoadState("networkidle");

  expect(foreign, "requests to hosts other than the app").toEqual([]);
  expect(failed, "failed requests").toEqual([]);
});

test("the interface fonts are served by the app itself and are in use", async ({ page, baseURL }) => {
  const fontResponses: { url: string; status: number }[] = [];
  page.on("response", (response) => {
    if (/\.woff2(\?|$)/.test(response.url())) fontResponses.push({ url: response.url(), status: response.status() });
  });

  await page.goto("/");
  await page.waitForLoadState("networkidle");
  const usage = await page.evaluate(async () => {
    await document.fonts.ready;
    const heading = document.querySelector("h1");
    const family = heading ? getComputedStyle(heading).fontFamily : "";
    const first = family.split(",")[0].trim().replace(/^["']|["']$/g, "");
    const loaded = Array.from(document.fonts).filter((f) => f.status === "loaded").map((f) => f.family.replace(/^["']|["']$/g, ""));
    return { first, loaded };
  });

  expect(fontResponses.length).toBeGreaterThan(0);
  for (const r of fontResponses) {
    expect(new URL(r.url).host).toBe(new URL(baseURL ?? "").host);
    expect(r.status).toBe(200);
  }
  // The heading's first font family is the shipped one, and the browser has loaded a face of it.
  expect(usage.loaded).toContain(usage.first);
});

test("light theme renders on paper", async ({ page }) => {
  await page.emulateMedia({ colorScheme: "light" });
  await page.goto("/");
  await expect(page.getByRole("heading", { level: 1, name: "Portolan" })).toBeVisible();
  expect(await backgroundOf(page)).toBe(PAPER);
  await page.screenshot({ path: `${SHOTS}/landing-light.png`, fullPage: true });
});

test("dark theme renders on night ink when the system prefers dark", async ({ page }) => {
  await page.emulateMedia({ colorScheme: "dark" });
  await page.goto("/");
  await expect(page.getByRole("heading", { level: 1, name: "Portolan" })).toBeVisible();
  expect(await backgroundOf(page)).toBe(NIGHT);
  await page.screenshot({ path: `${SHOTS}/landing-dark.png`, fullPage: true });
});

test("the theme button overrides the system choice and the choice survives a reload", async ({ page }) => {
  await page.emulateMedia({ colorScheme: "light" });
  await page.goto("/");
  const toggle = page.getByRole("button", { name: /^Theme:/ });
  await toggle.click(); // system → light
  await toggle.click(); // light → dark
  await expect(page.locator("html")).toHaveAttribute("data-theme", "dark");
  expect(await backgroundOf(page)).toBe(NIGHT);
  await page.reload();
  await expect(page.locator("html")).toHaveAttribute("data-theme", "dark");
  expect(await backgroundOf(page)).toBe(NIGHT);
});

test("signed-in pages open with a skip link to the content and keep the header keyboard-reachable", async ({ page }) => {
  await page.emulateMedia({ colorScheme: "dark" });
  await signInAs(page, "owner");
  await page.keyboard.press("Tab");
  const skip = page.getByRole("link", { name: "Skip to content" });
  await expect(skip).toBeFocused();
  await expect(skip).toBeVisible();
  await page.keyboard.press("Enter");
  await expect(page).toHaveURL(/#main-content$/);
  await expect(page.locator("main#main-content")).toBeVisible();

  const menu = page.getByRole("button", { name: /Account menu/ });
  await menu.focus();
  await page.keyboard.press("Enter");
  await expect(menu).toHaveAttribute("aria-expanded", "true");
  await expect(page.getByRole("button", { name: "Sign out" })).toBeVisible();
  await page.keyboard.press("Escape");
  await expect(menu).toHaveAttribute("aria-expanded", "false");
  await expect(menu).toBeFocused();
  await page.screenshot({ path: `${SHOTS}/projects-dark.png`, fullPage: true });
});
