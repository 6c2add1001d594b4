import { readFileSync } from "node:fs";
import { expect, test, type Page } from "@playwright/test";
import { openBundle, reproduceBundle } from "../../engine/bundle";
import { demoUsers, signIn, type DemoRole } from "./helpers";

// Sign-off from the browser on the seeded demo project (db/seed.ts): the engineer asks the reviewer, the
// reviewer downloads the bundle, checks it, approves with a comment, and the sign-offs page shows it.
const DEMO_PROJECT = "Kestrel telemetry front end";

test.describe.configure({ timeout: 180_000 });

/** Sign in through the form; the first sign-in after start waits for the demo seed and argon2 on a busy machine. */
async function signInAs(page: Page, role: DemoRole): Promise<void> {
  await signIn(page, demoUsers[role].email, demoUsers[role].password);
  await expect(page).toHaveURL(/\/projects(\/|$|\?)/, { timeout: 60_000 });
}

async function demoProjectId(page: Page): Promise<string> {
  const response = await page.request.get("/api/projects");
  expect(response.status()).toBe(200);
  const { projects } = (await response.json()) as { projects: { id: string; name: string }[] };
  const project = projects.find((p) => p.name === DEMO_PROJECT);
  expect(project).toBeDefined();
  return project!.id;
}

/** Two 3 dB pads between IN and OUT with an insertion-loss rule (two matched 3 dB pads in cascade lose 6 dB: common practice). */
function padChain(name: string) {
  return {
    format: "portolan.scenario/1",
    name,
    z0: 50,
    frequency: { start: 1e9, stop: 2e9, points: 11 },
    blocks: [
      { id: "PAD1", kind: "attenuator", params: { loss_db: 3 }, position: { x: 0, y: 0 } },
      { id: "PAD2", kind: "attenuator", params: { loss_db: 3 }, position: { x: 240, y: 0 } },
    ],
    links: [["PAD1:2", "PAD2:1"]],
    ports: [
      { name: "IN", at: "PAD1:1" },
      { name: "OUT", at: "PAD2:2" },
    ],
    rules: [{ kind: "insertion_loss", id: "il", from: "IN", to: "OUT", band: [1e9, 2e9], max_db: 6.5 }],
  };
}

test("a reviewer downloads the bundle and signs off from the browser", async ({ browser }) => {
  const name = `Sign-off chain ${Date.now()}`;
  // The engineer creates a scenario and asks Rhea Reviewer to sign it off through the panel.
  const engineerContext = await browser.newContext();
  const engineer = await engineerContext.newPage();
  await signInAs(engineer, "engineer");
  const projectId = await demoProjectId(engineer);
  const created = await engineer.request.post(`/api/projects/${projectId}/scenarios`, {
    data: { name, scenario: padChain(name) },
    headers: { origin: new URL(engineer.url()).origin },
  });
  expect(created.status()).toBe(201);
  const scenarioId = ((await created.json()) as { scenario: { id: string } }).scenario.id;
  await engineer.goto(`/projects/${projectId}/scenarios/${scenarioId}`);
  const request = engineer.getByRole("form", { name: "Request sign-off" });
  await request.getByRole("checkbox", { name: /Rhea Reviewer/ }).check();
  await request.getByLabel("Note to the reviewers").fill("Pad chain for the gate review");
  await request.getByRole("button", { name: "Request sign-off" }).click();
  await expect(request.getByText("Asked 1 reviewer.")).toBeVisible();
  await engineerContext.close();

  // The reviewer opens the scenario, downloads the bundle and checks it.
  const reviewerContext = await browser.newContext({ acceptDownloads: true });
  const reviewer = await reviewerContext.newPage();
  await signInAs(reviewer, "reviewer");
  await reviewer.goto(`/projects/${projectId}/scenarios/${scenarioId}`);
  const panel = reviewer.getByRole("region", { name: "Sign-off" });
  await panel.scrollIntoViewIfNeeded();
  const item = panel.getByTestId("signoff-item").filter({ hasText: "Rhea Reviewer" });
  await expect(item.getByText("Requested", { exact: true })).toBeVisible();
  const downloading = reviewer.waitForEvent("download");
  await panel.getByRole("link", { name: "Download bundle" }).click();
  const download = await downloading;
  expect(download.suggestedFilename()).toMatch(/-r1-bundle\.zip$/);
  const bundle = openBundle(readFileSync(await download.path()));
  expect(bundle.manifest.scenario).toEqual({ id: scenarioId, name });
  expect(bundle.manifest.created_by?.email).toBe("rhea@portolan.example");
  const rerun = reproduceBundle(bundle);
  expect(rerun.reproduced).toBe(true);
  expect(rerun.verdict).toBe("pass");

  // She approves with a comment; the panel and the project's sign-offs page show it approved.
  const decision = item.getByRole("form", { name: "Decide sign-off of revision 1" });
  await decision.getByLabel("Comment").fill("Bundle re-run on my machine: insertion loss 6.0 dB within 6.5 dB.");
  await decision.getByRole("button", { name: "Approve" }).click();
  await expect(item.getByText("Approved", { exact: true })).toBeVisible();
  await expect(item.getByText("Comment: Bundle re-run on my machine")).toBeVisible();
  await panel.screenshot({ path: "test-results/screenshots/signoff-panel-approved.png" });

  await reviewer.goto(`/projects/${projectId}/signoffs`);
  const approved = reviewer.getByTestId("signoffs-approved");
  const row = approved.getByTestId("signoff-row").filter({ hasText: name });
  await expect(row).toHaveCount(1);
  await expect(row.getByText("Approved", { exact: true })).toBeVisible();
  await expect(reviewer.getByTestId("signoffs-requested").getByTestId("signoff-row").filter({ hasText: name })).toHaveCount(0);
  await reviewer.screenshot({ path: "test-results/screenshots/signoffs-page.png", fullPage: true });

  // A later edit by the engineer leaves the approval on record but marks it stale, on both pages.
  const againContext = await browser.newContext();
  const again = await againContext.newPage();
  await signInAs(again, "engineer");
  const current = (await (await again.request.get(`/api/projects/${projectId}/scenarios/${scenarioId}`)).json()) as { revision: { id: string } };
  const edited = padChain(name);
  edited.blocks[1].params.loss_db = 4;
  const saved = await again.request.post(`/api/projects/${projectId}/scenarios/${scenarioId}/revisions`, {
    data: { baseRevisionId: current.revision.id, scenario: edited },
    headers: { origin: new URL(again.url()).origin },
  });
  expect(saved.status()).toBe(201);
  await againContext.close();
  await reviewer.reload();
  const staleRow = reviewer.getByTestId("signoffs-stale").getByTestId("signoff-row").filter({ hasText: name });
  await expect(staleRow.getByText("Stale: scenario changed since")).toBeVisible();
  await expect(staleRow.getByText("Approved", { exact: true })).toBeVisible();
  await reviewer.goto(`/projects/${projectId}/scenarios/${scenarioId}`);
  await expect(reviewer.getByRole("region", { name: "Sign-off" }).getByTestId("signoff-item").filter({ hasText: "Rhea Reviewer" }).getByText("Stale: scenario changed since")).toBeVisible();
  await reviewerContext.close();
});
