import { expect as baseExpect, test, type Page } from "@playwright/test";
import { signInAs } from "./helpers";

// The app under its Content-Security-Policy (proxy.ts): the workspace (React Flow chart, SVG result plots,
// the engine's Web Worker, the shipped fonts) and the Account page work, and the browser reports no CSP
// violation. Also the headers on a page and the 404 status of a project page for a non-member.

test.describe.configure({ timeout: 180_000 });
const expect = baseExpect.configure({ timeout: 40_000 });
test.use({ viewport: { width: 1600, height: 1100 } });

const DEMO_PROJECT = "Kestrel telemetry front end";

/** Collects CSP violations two ways: the console messages Chromium prints and the DOM's securitypolicyviolation events. */
function watchCsp(page: Page): string[] {
  const violations: string[] = [];
  page.on("console", (message) => {
    const text = message.text();
    if (/Content Security Policy|Refused to (load|execute|apply|create|connect|frame)/i.test(text)) violations.push(text);
  });
  void page.addInitScript(() => {
    document.addEventListener("securitypolicyviolation", (event) => {
      console.error(`Refused to apply (securitypolicyviolation): ${event.violatedDirective} ${event.blockedURI} at ${event.sourceFile}:${event.lineNumber}:${event.columnNumber}`);
    });
  });
  return violations;
}

async function demoProject(page: Page): Promise<{ projectId: string; scenarioId: string }> {
  const projects = (await (await page.request.get("/api/projects")).json()) as { projects: { id: string; name: string }[] };
  const projectId = projects.projects.find((p) => p.name === DEMO_PROJECT)!.id;
  const list = (await (await page.request.get(`/api/projects/${projectId}/scenarios`)).json()) as { scenarios: { id: string; name: string }[] };
  return { projectId, scenarioId: list.scenarios[0].id };
}

test("the workspace works under the Content-Security-Policy with no violations", async ({ page }) => {
  const violations = watchCsp(page);
  await signInAs(page, "owner");
  const { projectId, scenarioId } = await demoProject(page);

  const response = await page.goto(`/projects/${projectId}/scenarios/${scenarioId}`);
  expect(response?.status()).toBe(200);
  const headers = response!.headers();
  // Scripts by nonce, never framed (proxy.ts); and the other headers of issue 12 item 6.
  expect(headers["content-security-policy"]).toMatch(/script-src 'self' 'nonce-[A-Za-z0-9+/=]+' 'strict-dynamic'/);
  expect(headers["content-security-policy"]).toContain("frame-ancestors 'none'");
  expect(headers["x-content-type-options"]).toBe("nosniff");
  expect(headers["referrer-policy"]).toBe("strict-origin-when-cross-origin");
  expect(headers["x-powered-by"]).toBeUndefined();
  // Served over http here, so no HSTS.
  expect(headers["strict-transport-security"]).toBeUndefined();

  // React Flow drew the blocks, the engine worker solved, and the results drew their trace plot (SVG).
  await expect(page.locator('[aria-label^="Block "]').first()).toBeVisible();
  const results = page.getByRole("region", { name: "Results" });
  await expect(results.locator('svg[data-plot="trace"]').first()).toBeVisible();
  // The shipped fonts loaded from our own origin.
  const fontsLoaded = await page.evaluate(async () => {
    await document.fonts.ready;
    return [...document.fonts].filter((face) => face.status === "loaded").length;
  });
  expect(fontsLoaded).toBeGreaterThan(0);

  // The inline theme script ran (it carries the nonce): switching the theme and reloading keeps it.
  await page.evaluate(() => localStorage.setItem("portolan-theme", "dark"));
  await page.reload();
  await expect(page.locator("html")).toHaveAttribute("data-theme", "dark");
  await expect(page.locator('[aria-label^="Block "]').first()).toBeVisible();

  expect(violations).toEqual([]);
});

test("a personal API token made on the Account page is shown once and reads the project API", async ({ page, playwright }) => {
  const violations = watchCsp(page);
  await signInAs(page, "reviewer");
  const { projectId, scenarioId } = await demoProject(page);
  await page.goto("/account");
  await page.getByLabel("Token name").fill("e2e pipeline");
  await page.getByRole("checkbox", { name: new RegExp(DEMO_PROJECT) }).check();
  await page.getByRole("button", { name: "Create token" }).click();
  const shown = page.getByTestId("new-api-token");
  await expect(shown).toBeVisible();
  const token = (await shown.innerText()).trim();
  expect(token).toMatch(/^ptl_/);

  // A script without cookies: the token reads the scenario...
  const api = await playwright.request.newContext({ baseURL: new URL(page.url()).origin });
  const read = await api.get(`/api/projects/${projectId}/scenarios/${scenarioId}`, { headers: { authorization: `Bearer ${token}` } });
  expect(read.status()).toBe(200);
  // ...but is read-only (the default ceiling), and cannot list tokens.
  const run = await api.post(`/api/projects/${projectId}/scenarios/${scenarioId}/check-runs`, {
    headers: { authorization: `Bearer ${token}` },
    data: { check: "isolation", inputs: { from: "TX", to: "RX", band: [2.4e9, 2.48e9], min_db: 30 } },
  });
  expect(run.status()).toBe(403);
  expect((await api.get("/api/account/tokens", { headers: { authorization: `Bearer ${token}` } })).status()).toBe(403);

  // After a reload the list shows the token by name and prefix only; revoking it ends it.
  await page.reload();
  await expect(page.getByTestId("new-api-token")).toHaveCount(0);
  await expect(page.getByRole("cell", { name: /^e2e pipeline ptl_/ })).toBeVisible();
  await expect(page.getByText(token)).toHaveCount(0);
  await page.getByRole("button", { name: "Revoke e2e pipeline" }).click();
  await expect(page.getByRole("cell", { name: "revoked" })).toBeVisible();
  expect((await api.get(`/api/projects/${projectId}/scenarios/${scenarioId}`, { headers: { authorization: `Bearer ${token}` } })).status()).toBe(401);
  await api.dispose();
  expect(violations).toEqual([]);
});

test("a project page that the person may not see answers 404", async ({ page }) => {
  await signInAs(page, "engineer");
  const response = await page.goto("/projects/00000000-0000-4000-8000-000000000000/scenarios");
  expect(response?.status()).toBe(404);
  const { projectId } = await demoProject(page);
  // Engineers may not read the audit log.
  expect((await page.goto(`/projects/${projectId}/audit`))?.status()).toBe(404);
});
