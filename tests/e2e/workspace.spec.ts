import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { expect as baseExpect, test, type Locator, type Page } from "@playwright/test";
import { demoUsers, saveRevision, signIn, type DemoRole } from "./helpers";

// The scenario workspace end to end on the seeded demo (db/seed.ts, db/seed-scenarios.ts).
const DEMO_PROJECT = "Kestrel telemetry front end";
const SHOTS = "test-results/screenshots";

test.describe.configure({ timeout: 240_000 });

// The workspace is a heavy client page and the machine is shared: wait longer than the default for it.
const expect = baseExpect.configure({ timeout: 40_000 });

// wide enough for the chart, inspector and results side by side, tall enough to hold them
test.use({ viewport: { width: 1600, height: 1100 } });

async function demoProjectId(page: Page): Promise<string> {
  const response = await page.request.get("/api/projects");
  expect(response.status()).toBe(200);
  const { projects } = (await response.json()) as { projects: { id: string; name: string }[] };
  const project = projects.find((p) => p.name === DEMO_PROJECT);
  expect(project).toBeDefined();
  return project!.id;
}

/** Sign in through the form; the shared machine can take a while to answer the first sign-ins, so wait longer than the default. */
async function signInAs(page: Page, role: DemoRole): Promise<void> {
  await signIn(page, demoUsers[role].email, demoUsers[role].password);
  await expect(page).toHaveURL(/\/projects(\/|$|\?)/, { timeout: 60_000 });
}

const origin = (page: Page) => ({ origin: new URL(page.url()).origin });

const block = (page: Page, id: string): Locator => page.locator(`[aria-label^="Block ${id},"]`);
const handle = (page: Page, ref: string): Locator => page.locator(`[aria-label^="Port ${ref}"]`).first();
// the add-block list's filter field, named by the list's label
const paletteFilter = (page: Page): Locator => page.getByRole("combobox", { name: "Filter block kinds and parts" });
const chart = (page: Page): Locator => page.locator('[aria-label="Chart"]');
/** Put the focus back on the chart (an empty corner of it) so that single-key commands reach the workspace. */
async function focusChart(page: Page): Promise<void> {
  await chart(page).scrollIntoViewIfNeeded();
  await chart(page).click({ position: { x: 12, y: 12 } });
}
const saveState = (page: Page): Locator => page.getByRole("status", { name: /^Save state:/ });

/** Drag with the mouse in small steps, as a person would (React Flow needs the intermediate moves). */
async function drag(page: Page, from: Locator, to: { x: number; y: number }): Promise<void> {
  const box = await from.boundingBox();
  if (!box) throw new Error("nothing to drag");
  await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
  await page.mouse.down();
  await page.mouse.move(to.x, to.y, { steps: 12 });
  await page.mouse.up();
}

async function centreOf(locator: Locator): Promise<{ x: number; y: number }> {
  const box = await locator.boundingBox();
  if (!box) throw new Error("not on screen");
  return { x: box.x + box.width / 2, y: box.y + box.height / 2 };
}

/** An invented 2-port: a lossy line, |S21| falling linearly from 0.9 to 0.7 over 2–3 GHz, phase −40° per 100 MHz. */
function cableTouchstone(): string {
  const lines = ["! E2E test cable (invented data)", "# GHz S MA R 50"];
  for (let k = 0; k <= 10; k++) {
    const f = 2 + k * 0.1;
    const s21 = 0.9 - 0.02 * k;
    const ang = -40 * k;
    lines.push(`${f.toFixed(1)} 0.05 0 ${s21.toFixed(4)} ${ang} ${s21.toFixed(4)} ${ang} 0.05 0`);
  }
  return `${lines.join("\n")}\n`;
}

/** |S_ij| in dB at the plan point nearest `hz`, from the portolan CLI's JSON for the saved scenario. */
function cliDb(scenario: unknown, parts: Record<string, string>, i: number, j: number, hz: number): number {
  const dir = mkdtempSync(path.join(os.tmpdir(), "portolan-e2e-"));
  mkdirSync(path.join(dir, "parts"));
  for (const [file, text] of Object.entries(parts)) writeFileSync(path.join(dir, file), text);
  writeFileSync(path.join(dir, "scenario.json"), JSON.stringify(scenario));
  const out = execFileSync(process.execPath, [path.resolve("node_modules/tsx/dist/cli.mjs"), path.resolve("engine/cli.ts"), "solve", "scenario.json", "--json"], {
    cwd: dir,
    encoding: "utf8",
  });
  const solved = JSON.parse(out) as { frequencies: number[]; s: [number, number][][][] };
  let k = 0;
  for (let q = 1; q < solved.frequencies.length; q++) if (Math.abs(solved.frequencies[q] - hz) < Math.abs(solved.frequencies[k] - hz)) k = q;
  const [re, im] = solved.s[k][i][j];
  return 20 * Math.log10(Math.hypot(re, im));
}

/** A figure as the workspace prints it (real minus sign) → number. */
const figure = (text: string): number => Number(text.replace("−", "-").replace(/[^0-9.+-]/g, ""));

test("an engineer builds a system with mouse and keyboard, places an uploaded part, and reads the value portolan solve gives", async ({ page }) => {
  await signInAs(page, "engineer");
  const projectId = await demoProjectId(page);

  // upload a part through the parts page
  await page.goto(`/projects/${projectId}/parts`);
  await page.getByLabel("Touchstone file").setInputFiles({ name: "e2e-cable.s2p", mimeType: "text/plain", buffer: Buffer.from(cableTouchstone()) });
  await page.getByLabel("Part name (optional)").fill("E2E cable");
  await page.getByRole("button", { name: "Upload part" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Uploaded e2e-cable.s2p: 2 ports, 11 points." })).toBeVisible();
  const row = page.getByRole("row").filter({ hasText: "e2e-cable.s2p" });
  await expect(row.getByText("Passive")).toBeVisible();
  await expect(row.getByText("Reciprocal", { exact: true })).toBeVisible();
  await page.screenshot({ path: `${SHOTS}/parts-page.png`, fullPage: true });

  // a new, empty scenario from the scenarios page
  await page.getByRole("navigation", { name: "Project sections" }).getByRole("link", { name: "Scenarios" }).click();
  await page.getByLabel("New scenario name").fill("E2E chain");
  await page.getByRole("button", { name: "Create scenario" }).click();
  await expect(page).toHaveURL(/\/scenarios\/[0-9a-f-]+$/);
  await expect(page.getByText("An empty chart.")).toBeVisible();
  await expect(saveState(page)).toHaveText("Saved");

  // mouse: the Add block button, then a click on the kind
  await page.getByRole("button", { name: /^Add block/ }).click();
  await page.getByRole("option", { name: /^Attenuator/ }).click();
  await expect(block(page, "PAD1")).toBeVisible();
  await chart(page).scrollIntoViewIfNeeded();
  const pad1 = await centreOf(block(page, "PAD1"));
  await drag(page, block(page, "PAD1"), { x: pad1.x - 260, y: pad1.y });

  // keyboard: A opens the add-block list, type to filter, Enter adds
  await focusChart(page);
  await page.keyboard.press("a");
  await paletteFilter(page).fill("attenuator");
  await page.keyboard.press("Enter");
  await expect(block(page, "PAD2")).toBeVisible();

  // mouse: drag a link from PAD1 port 2 to PAD2 port 1
  await chart(page).scrollIntoViewIfNeeded();
  await drag(page, handle(page, "PAD1:2"), await centreOf(handle(page, "PAD2:1")));
  await expect(page.locator('[aria-label^="Link PAD1:2 to PAD2:1"], [aria-label^="Link PAD2:1 to PAD1:2"]')).toHaveCount(1);

  // keyboard: place the part from the add-block list, link it through the inspector's port list
  await focusChart(page);
  await page.keyboard.press("a");
  await paletteFilter(page).fill("E2E cable");
  await page.keyboard.press("Enter");
  const partBlock = page.locator('[aria-label^="Block E2E_CABLE"]');
  await expect(partBlock).toBeVisible();
  const partId = ((await partBlock.getAttribute("aria-label")) ?? "").replace(/^Block ([^,]+),.*$/, "$1");
  const inspector = page.getByRole("complementary", { name: "Inspector" });
  await inspector.getByRole("combobox", { name: `Link ${partId}:1 to` }).selectOption("PAD2:2");
  await expect(page.locator(`[aria-label^="Link PAD2:2 to ${partId}:1"], [aria-label^="Link ${partId}:1 to PAD2:2"]`)).toHaveCount(1);

  // system ports: mouse (the port's menu) at PAD1:1, keyboard (the inspector) at the part's port 2
  await handle(page, "PAD1:1").click({ button: "right" });
  await page.getByRole("menuitem", { name: "Mark as system port" }).click();
  await expect(page.locator('[data-system-port="P1"]')).toBeVisible();
  await block(page, partId).click();
  await inspector.getByRole("button", { name: `Mark ${partId}:2 as a system port` }).click();
  await expect(page.locator('[data-system-port="P2"]')).toBeVisible();

  // autosave keeps the working draft; the CLI comparison below reads a saved revision, saved deliberately
  await expect(saveState(page)).toHaveText("Draft saved", { timeout: 15_000 });
  await saveRevision(page, "Two pads and the cable");

  // read S21 at 2.45 GHz: the matrix cell picks the trace, a marker reads it
  const results = page.getByRole("region", { name: "Results" });
  await results.getByRole("button", { name: /^S21 \(P1 → P2\)/ }).click();
  await results.getByLabel("Marker frequency").fill("2.45 GHz");
  await results.getByRole("button", { name: "Add marker" }).click();
  const markerRow = results.getByRole("table", { name: "Markers" }).getByRole("row").nth(1);
  await expect(markerRow).toContainText("2.45 GHz");
  const shown = figure((await markerRow.getByRole("cell").nth(2).innerText()).trim());
  await page.screenshot({ path: `${SHOTS}/workspace-built.png`, fullPage: true });

  // the same number from the CLI, on the saved scenario and the project's part file
  const scenarioId = new URL(page.url()).pathname.split("/").pop()!;
  const saved = (await (await page.request.get(`/api/projects/${projectId}/scenarios/${scenarioId}`)).json()) as { revision: { content: unknown } };
  const { parts } = (await (await page.request.get(`/api/projects/${projectId}/parts?text=1`)).json()) as { parts: { fileName: string; text: string }[] };
  const partFiles = Object.fromEntries(parts.map((p) => [`parts/${p.fileName}`, p.text]));
  const reference = cliDb(saved.revision.content, partFiles, 1, 0, 2.45e9);
  // two 3 dB pads and the cable: about −6 dB − |S21| of the cable in dB; the CLI decides the exact figure
  expect(Math.abs(shown - reference)).toBeLessThanOrEqual(0.01);

  // the part is now in use: deleting it is refused with the scenario's name
  const partsList = (await (await page.request.get(`/api/projects/${projectId}/parts`)).json()) as { parts: { id: string; fileName: string }[] };
  const cable = partsList.parts.find((p) => p.fileName === "e2e-cable.s2p")!;
  const refused = await page.request.delete(`/api/projects/${projectId}/parts/${cable.id}`, { headers: origin(page) });
  expect(refused.status()).toBe(409);
  expect(((await refused.json()) as { scenarios: string[] }).scenarios).toContain("E2E chain");

  // reload: the system comes back from the saved revision
  await page.reload();
  await expect(block(page, partId)).toBeVisible();
  await expect(page.locator('[data-system-port="P2"]')).toBeVisible();
});

// Two sessions editing one scenario (merge of different blocks, a real conflict) are stories of
// tests/e2e/revisions.spec.ts.

test("a reviewer sees the demo workspace read-only, and the server refuses their writes", async ({ page }) => {
  await signInAs(page, "reviewer");
  const projectId = await demoProjectId(page);
  await page.goto(`/projects/${projectId}/scenarios`);
  await expect(page.getByRole("form", { name: "New scenario" })).toHaveCount(0);
  await page.getByRole("link", { name: "Baseline" }).click();
  await expect(block(page, "TR")).toBeVisible();
  await expect(page.getByText("Read only", { exact: true })).toBeVisible();
  await expect(page.getByRole("button", { name: /^Add block/ })).toBeDisabled();
  await expect(page.getByRole("button", { name: "Save revision" })).toHaveCount(0);
  await expect(page.getByRole("button", { name: "TR: select throw 2" })).toBeDisabled();
  await expect(page.getByRole("region", { name: "Results" }).getByRole("button", { name: /^S21 \(TX → RX\)/ })).toBeVisible({ timeout: 20_000 });
  await page.screenshot({ path: `${SHOTS}/workspace-reviewer-baseline.png`, fullPage: true });

  const scenarioId = new URL(page.url()).pathname.split("/").pop()!;
  const current = (await (await page.request.get(`/api/projects/${projectId}/scenarios/${scenarioId}`)).json()) as { revision: { id: string; content: unknown } };
  const save = await page.request.post(`/api/projects/${projectId}/scenarios/${scenarioId}/revisions`, {
    data: { baseRevisionId: current.revision.id, scenario: current.revision.content },
    headers: origin(page),
  });
  expect(save.status()).toBe(403);
  const rename = await page.request.patch(`/api/projects/${projectId}/scenarios/${scenarioId}`, { data: { name: "Mine now" }, headers: origin(page) });
  expect(rename.status()).toBe(403);
});
