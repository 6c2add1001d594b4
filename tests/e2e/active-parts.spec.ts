import { expect as baseExpect, test, type Page } from "@playwright/test";
import { demoUsers, signIn } from "./helpers";

// Measured active parts on the parts page and in the workspace (inspector flag, stability, interpolation note),
// on the seeded demo project (db/seed.ts).
const DEMO_PROJECT = "Kestrel telemetry front end";
test.describe.configure({ timeout: 240_000 });
// the workspace is a heavy client page on a shared machine
const expect = baseExpect.configure({ timeout: 40_000 });
test.use({ viewport: { width: 1600, height: 1100 } });

/**
 * An invented amplifier, S11 = S22 = 0.3, S21 = 10 (20 dB), S12 = 0.218, at 1, 2 and 3 GHz: σmax = 10.0092
 * (numpy.linalg.svd of [[0.3, 0.218], [10, 0.3]]), and |Δ| = |0.09 − 2.18| = 2.09, potentially unstable.
 */
const AMP = ["! E2E amplifier (invented data)", "# GHz S RI R 50", ...[1, 2, 3].map((f) => `${f} 0.3 0 10 0 0.218 0 0.3 0`)].join("\n") + "\n";

const origin = (page: Page) => ({ origin: new URL(page.url()).origin });

async function demoProjectId(page: Page): Promise<string> {
  const { projects } = (await (await page.request.get("/api/projects")).json()) as { projects: { id: string; name: string }[] };
  const project = projects.find((p) => p.name === DEMO_PROJECT);
  expect(project).toBeDefined();
  return project!.id;
}

test("an uploaded amplifier is shown as an active part with its reason, can be marked in the inspector, and its interpolation is noted", async ({ page }) => {
  await signIn(page, demoUsers.engineer.email, demoUsers.engineer.password);
  await expect(page).toHaveURL(/\/projects(\/|$|\?)/, { timeout: 60_000 });
  const projectId = await demoProjectId(page);

  await page.goto(`/projects/${projectId}/parts`);
  await page.getByLabel("Touchstone file").setInputFiles({ name: "e2e-amp.s2p", mimeType: "text/plain", buffer: Buffer.from(AMP) });
  await page.getByRole("button", { name: "Upload part" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Uploaded e2e-amp.s2p" })).toBeVisible();
  const row = page.getByRole("row").filter({ hasText: "e2e-amp.s2p" });
  await expect(row.getByText("Active part", { exact: true })).toBeVisible();
  await expect(row.getByText(/its data shows gain: largest singular value 10\.009 \(20\.01 dB\) at 1 GHz; checked for stability/)).toBeVisible();

  // a scenario placing it on a plan between its data points
  const created = await page.request.post(`/api/projects/${projectId}/scenarios`, { data: { name: "E2E amplifier", template: "blank" }, headers: origin(page) });
  expect(created.status()).toBe(201);
  const scenarioId = ((await created.json()) as { scenario: { id: string } }).scenario.id;
  const current = (await (await page.request.get(`/api/projects/${projectId}/scenarios/${scenarioId}`)).json()) as { revision: { id: string } };
  const scenario = {
    format: "portolan.scenario/1",
    name: "E2E amplifier",
    z0: 50,
    frequency: { start: 1.5e9, stop: 2.5e9, points: 3 },
    blocks: [{ id: "LNA", kind: "touchstone", file: "parts/e2e-amp.s2p", position: { x: 200, y: 200 } }],
    links: [],
    ports: [{ name: "IN", at: "LNA:1" }, { name: "OUT", at: "LNA:2" }],
  };
  const saved = await page.request.post(`/api/projects/${projectId}/scenarios/${scenarioId}/revisions`, { data: { baseRevisionId: current.revision.id, scenario }, headers: origin(page) });
  expect(saved.status()).toBe(201);

  await page.goto(`/projects/${projectId}/scenarios/${scenarioId}`);
  const notes = page.getByRole("list", { name: "Notes" });
  await expect(notes).toContainText("block LNA: part data interpolated onto 2 of 3 plan points, linearly in real and imaginary parts");

  await page.locator('[aria-label^="Block LNA,"]').click();
  const flag = page.getByLabel("Active or passive");
  await expect(flag).toHaveValue("auto");
  await expect(page.getByText(/Active by default: its data shows gain: largest singular value 10\.009/)).toBeVisible();
  await flag.selectOption("active");
  await expect(flag).toHaveValue("active");
});
