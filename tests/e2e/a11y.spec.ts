import AxeBuilder from "@axe-core/playwright";
import { expect as baseExpect, test, type Page } from "@playwright/test";
import { demoUsers, signIn, type DemoRole } from "./helpers";

// Automated accessibility scan (axe-core through its Playwright integration) of every page the browser
// tests visit, signed out and for each demo role. Fails on serious or critical violations of WCAG 2.1
// A/AA rules (axe's wcag2a, wcag2aa, wcag21a, wcag21aa tags).
const expect = baseExpect.configure({ timeout: 40_000 });
test.describe.configure({ timeout: 240_000 });
test.use({ viewport: { width: 1600, height: 1100 } });

const DEMO_PROJECT = "Kestrel telemetry front end";

async function scan(page: Page, where: string): Promise<void> {
  const { violations } = await new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"]).analyze();
  const bad = violations.filter((v) => v.impact === "serious" || v.impact === "critical");
  const summary = bad.map((v) => `${where}: ${v.id} (${v.impact}) ×${v.nodes.length}: ${v.help} — ${v.nodes.slice(0, 3).map((n) => n.target.join(" ")).join(" | ")}`);
  expect(summary, summary.join("\n")).toEqual([]);
}

async function visit(page: Page, path: string, ready?: (page: Page) => Promise<void>): Promise<void> {
  const response = await page.goto(path);
  expect(response, path).not.toBeNull();
  await page.waitForLoadState("networkidle");
  if (ready) await ready(page);
  await scan(page, path);
}

test("signed-out pages have no serious or critical accessibility violations", async ({ page }) => {
  for (const path of ["/", "/sign-in", "/sign-up", "/forgot-password", "/invite/not-a-real-token-000000000000000000000000", "/no-such-page"]) await visit(page, path);
});

for (const role of ["owner", "engineer", "reviewer"] as const satisfies readonly DemoRole[]) {
  test(`every signed-in page, as ${role}, has no serious or critical accessibility violations`, async ({ page }) => {
    await signIn(page, demoUsers[role].email, demoUsers[role].password);
    await expect(page).toHaveURL(/\/projects(\/|$|\?)/, { timeout: 60_000 });
    const { projects } = (await (await page.request.get("/api/projects")).json()) as { projects: { id: string; name: string }[] };
    const project = projects.find((p) => p.name === DEMO_PROJECT)!;
    const base = `/projects/${project.id}`;
    const { scenarios } = (await (await page.request.get(`/api/projects/${project.id}/scenarios`)).json()) as { scenarios: { id: string }[] };

    await visit(page, "/projects");
    await visit(page, "/account");
    for (const tab of ["", "/scenarios", "/parts", "/rules", "/compare", "/members", "/signoffs", ...(role === "owner" ? ["/audit"] : [])]) await visit(page, `${base}${tab}`);
    // the workspace with its chart and results (port handles, port matrix)
    await visit(page, `${base}/scenarios/${scenarios[0].id}`, async (p) => {
      await expect(p.locator('[aria-label^="Port "]').first()).toBeVisible();
    });
    await visit(page, `${base}/scenarios/no-such-scenario`);
    await visit(page, "/projects/no-such-project");
    // the helm open over the page
    await page.getByRole("button", { name: /^Helm/ }).click();
    await expect(page.getByRole("dialog")).toBeVisible();
    await scan(page, `${base} with the helm open`);
  });
}
