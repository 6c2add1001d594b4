import { expect as baseExpect, test, type Page, type TestInfo } from "@playwright/test";
import { demoUsers, saveRevision, signIn } from "./helpers";

// Issue 15 item 2, as an engineer on the seeded demo project (db/seed.ts): upload a new version of a part,
// see "newer version available" in the scenario list and the inspector, move the block, then read the part
// page (traces, figures, where it is used, versions) and delete the version nothing uses any more.
const DEMO_PROJECT = "Kestrel telemetry front end";
test.describe.configure({ timeout: 240_000 });
// the workspace is a heavy client page on a shared machine
const expect = baseExpect.configure({ timeout: 40_000 });
test.use({ viewport: { width: 1440, height: 900 } });

/** An invented matched pad: S11 = S22 = 0, S21 = S12 = `through` at 1, 2 and 3 GHz, 50 Ω. */
const pad = (through: number) => ["! E2E pad (invented data)", "# GHz S RI R 50", ...[1, 2, 3].map((f) => `${f} 0 0 ${through} 0 ${through} 0 0 0`)].join("\n") + "\n";

const origin = (page: Page) => ({ origin: new URL(page.url()).origin });

async function shot(page: Page, testInfo: TestInfo, name: string): Promise<void> {
  await testInfo.attach(name, { body: await page.screenshot({ fullPage: true }), contentType: "image/png" });
}

test("an engineer uploads version 2 of a part, moves a block to it and reads the part page", async ({ page }, testInfo) => {
  await signIn(page, demoUsers.engineer.email, demoUsers.engineer.password);
  await expect(page).toHaveURL(/\/projects(\/|$|\?)/, { timeout: 60_000 });
  const { projects } = (await (await page.request.get("/api/projects")).json()) as { projects: { id: string; name: string }[] };
  const projectId = projects.find((p) => p.name === DEMO_PROJECT)!.id;

  // version 1, placed by a scenario
  await page.goto(`/projects/${projectId}/parts`);
  await page.getByLabel("Touchstone file").setInputFiles({ name: "e2e-pad.s2p", mimeType: "text/plain", buffer: Buffer.from(pad(0.5)) });
  await page.getByRole("button", { name: "Upload part" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Uploaded e2e-pad.s2p" })).toBeVisible();
  const created = await page.request.post(`/api/projects/${projectId}/scenarios`, { data: { name: "E2E versions", template: "blank" }, headers: origin(page) });
  expect(created.status()).toBe(201);
  const scenarioId = ((await created.json()) as { scenario: { id: string } }).scenario.id;
  const latest = async () => (await (await page.request.get(`/api/projects/${projectId}/scenarios/${scenarioId}`)).json()) as { revision: { id: string; content: { blocks: { id: string; part_version?: number }[] } } };
  const scenario = {
    format: "portolan.scenario/1",
    name: "E2E versions",
    z0: 50,
    frequency: { start: 1e9, stop: 3e9, points: 3 },
    blocks: [{ id: "PAD", kind: "touchstone", file: "parts/e2e-pad.s2p", position: { x: 240, y: 200 } }],
    links: [],
    ports: [
      { name: "IN", at: "PAD:1" },
      { name: "OUT", at: "PAD:2" },
    ],
  };
  const saved = await page.request.post(`/api/projects/${projectId}/scenarios/${scenarioId}/revisions`, { data: { baseRevisionId: (await latest()).revision.id, scenario }, headers: origin(page) });
  expect(saved.status()).toBe(201);

  // version 2 from the part's row: the file chosen may have another name, the part keeps its own
  await page.reload();
  const row = page.getByRole("row").filter({ hasText: "e2e-pad.s2p" });
  await row.getByLabel("New version of e2e-pad.s2p", { exact: true }).setInputFiles({ name: "pad-vendor-rev-b.s2p", mimeType: "text/plain", buffer: Buffer.from(pad(0.25)) });
  await expect(row.getByRole("status")).toContainText("Version 2 of e2e-pad.s2p");
  await expect(row.getByTestId("part-version-count")).toHaveText("version 2 · 2 versions");
  await shot(page, testInfo, "parts-list-with-version-2");

  // the scenario list counts the block that is behind
  await page.goto(`/projects/${projectId}/scenarios`);
  await expect(page.getByRole("row").filter({ hasText: "E2E versions" }).getByText("1 block behind")).toBeVisible();
  await shot(page, testInfo, "scenario-list-blocks-behind");

  // the inspector says so, and one action moves the block (an edit of the working draft); saved as a
  // named revision, the move is in the scenario
  await page.goto(`/projects/${projectId}/scenarios/${scenarioId}`);
  await page.locator('[aria-label^="Block PAD,"]').click();
  const notice = page.getByRole("status", { name: "Newer version available" });
  await expect(notice).toContainText("PAD uses version 1 of e2e-pad.s2p; the library has version 2.");
  await shot(page, testInfo, "inspector-newer-version-available");
  await notice.getByRole("button", { name: "Move to version 2" }).click();
  await expect(page.getByTestId("part-version")).toContainText("Uses version 2 of e2e-pad.s2p (the latest)");
  await saveRevision(page, "PAD moved to version 2 of e2e-pad.s2p");
  await expect.poll(async () => (await latest()).revision.content.blocks[0].part_version, { timeout: 40_000 }).toBe(2);
  await shot(page, testInfo, "inspector-after-move");

  // the part page, from the parts list
  await page.goto(`/projects/${projectId}/parts`);
  await page.getByRole("link", { name: "e2e-pad", exact: true }).click();
  await expect(page.getByRole("heading", { name: "e2e-pad", level: 2 })).toBeVisible();
  await expect(page.getByRole("img", { name: "Trace plot of |S11|, |S12|, |S21|, |S22| in dB" })).toBeVisible();
  const figures = page.getByRole("definition").filter({ hasText: "largest singular value" });
  await expect(figures).toContainText("0.2500"); // σmax of [[0, 0.25], [0.25, 0]] is 0.25
  // 20·log10(0.5 / 0.25) = 6.02 dB: the largest change of |S12| and |S21| against version 1
  await expect(page.getByTestId("max-change")).toContainText(/largest change of \|S(12|21)\| 6\.02 dB/);
  const uses = page.getByRole("table", { name: "Where it is used" });
  await expect(uses.getByRole("row").filter({ hasText: "E2E versions" })).toContainText("PAD");
  await expect(uses.getByRole("link", { name: "E2E versions" })).toHaveAttribute("href", `/projects/${projectId}/scenarios/${scenarioId}`);
  const versions = page.getByRole("table", { name: "Versions" });
  await expect(versions.locator("tbody tr")).toHaveCount(2);
  await expect(versions.locator('tr[data-version="2"]')).toContainText("in use by E2E versions");
  await expect(versions.locator('tr[data-version="2"]')).toContainText("σmax 0.5000 → 0.2500");
  await shot(page, testInfo, "part-page-versions");

  // version 1 is used by nothing now: it can go; version 2 stays
  await versions.getByRole("button", { name: "Delete version 1" }).click();
  await page.getByRole("button", { name: "Delete version", exact: true }).click();
  await expect(versions.locator("tbody tr")).toHaveCount(1);
  await expect(versions.locator('tr[data-version="2"]')).toBeVisible();
  await shot(page, testInfo, "part-page-after-deleting-version-1");
});
