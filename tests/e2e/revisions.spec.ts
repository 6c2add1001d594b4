import { expect as baseExpect, test, type Browser, type Locator, type Page, type TestInfo } from "@playwright/test";
import { demoUsers, saveRevision, signIn, type DemoRole } from "./helpers";

// Revisions people can read (issue 15 item 4), on the seeded demo (db/seed.ts): autosave keeps a working
// draft (never a revision), a named revision is saved deliberately with a note (Ctrl/Cmd+S), the history
// reads in words, edits of two people to different blocks merge, and a real conflict asks. Screenshots
// are kept as test artefacts (testInfo.attach).
const DEMO_PROJECT = "Kestrel telemetry front end";

test.describe.configure({ timeout: 240_000 });
const expect = baseExpect.configure({ timeout: 40_000 });
test.use({ viewport: { width: 1600, height: 1100 } });

async function signInAs(page: Page, role: DemoRole): Promise<void> {
  await signIn(page, demoUsers[role].email, demoUsers[role].password);
  await expect(page).toHaveURL(/\/projects(\/|$|\?)/, { timeout: 60_000 });
}

async function openAs(browser: Browser, role: DemoRole): Promise<Page> {
  const context = await browser.newContext();
  const page = await context.newPage();
  await signInAs(page, role);
  return page;
}

async function demoProjectId(page: Page): Promise<string> {
  const response = await page.request.get("/api/projects");
  expect(response.status()).toBe(200);
  const { projects } = (await response.json()) as { projects: { id: string; name: string }[] };
  return projects.find((p) => p.name === DEMO_PROJECT)!.id;
}

const origin = (page: Page) => ({ origin: new URL(page.url()).origin });
const block = (page: Page, id: string): Locator => page.locator(`[aria-label^="Block ${id},"]`);
const saveState = (page: Page): Locator => page.getByRole("status", { name: /^Save state:/ });

async function createScenario(page: Page, projectId: string, name: string): Promise<string> {
  const response = await page.request.post(`/api/projects/${projectId}/scenarios`, { data: { name, template: "pad-chain" }, headers: origin(page) });
  expect(response.status()).toBe(201);
  return ((await response.json()) as { scenario: { id: string } }).scenario.id;
}

type Latest = { revision: { number: number; note: string | null; content: { blocks: { id: string; params?: Record<string, unknown> }[] } } };
async function latest(page: Page, projectId: string, scenarioId: string): Promise<Latest["revision"]> {
  return ((await (await page.request.get(`/api/projects/${projectId}/scenarios/${scenarioId}`)).json()) as Latest).revision;
}

async function addLoad(page: Page): Promise<void> {
  await page.getByRole("button", { name: /^Add block/ }).click();
  await page.getByRole("option", { name: /^Load/ }).click();
  await expect(block(page, "LOAD1")).toBeVisible();
}

/** Type a new loss into a pad's parameters in the inspector (select the block first). */
async function setLoss(page: Page, id: string, value: string): Promise<void> {
  await block(page, id).click();
  const field = page.getByRole("form", { name: `Parameters of ${id}` }).getByLabel("Loss (dB)");
  await field.fill(value);
}

async function attach(testInfo: TestInfo, name: string, page: Page): Promise<void> {
  await testInfo.attach(name, { body: await page.screenshot({ fullPage: true }), contentType: "image/png" });
}

test("edits survive a reload as the working draft, not as a revision; discarding asks first", async ({ page }, testInfo) => {
  await signInAs(page, "engineer");
  const projectId = await demoProjectId(page);
  const scenarioId = await createScenario(page, projectId, "E2E draft");
  await page.goto(`/projects/${projectId}/scenarios/${scenarioId}`);
  await expect(block(page, "PAD1")).toBeVisible();
  await expect(saveState(page)).toHaveText("Saved");

  await addLoad(page);
  await expect(saveState(page)).toHaveText("Draft saved", { timeout: 20_000 });
  // a draft, never a revision: the scenario is still at revision 1
  expect((await latest(page, projectId, scenarioId)).number).toBe(1);

  await page.reload();
  await expect(block(page, "LOAD1")).toBeVisible();
  await expect(saveState(page)).toHaveText("Draft saved");
  const banner = page.getByRole("status").filter({ hasText: "Working draft: your changes are not in revision 1 yet" });
  await expect(banner).toBeVisible();
  await expect(banner).toContainText("Reopened your draft from");
  // the checks area says what stored checks judge
  await expect(page.getByRole("status").filter({ hasText: "Your draft has changes not in revision 1" }).first()).toBeVisible();
  await attach(testInfo, "draft-after-reload", page);

  // the same person on another device (a new browser context) gets the draft from the server
  const other = await page.context().browser()!.newContext({ viewport: { width: 1600, height: 1100 } });
  const second = await other.newPage();
  await signInAs(second, "engineer");
  await second.goto(`/projects/${projectId}/scenarios/${scenarioId}`);
  await expect(block(second, "LOAD1")).toBeVisible();
  await other.close();

  // nobody else sees it: the owner opens revision 1
  const owner = await openAs(page.context().browser()!, "owner");
  await owner.goto(`/projects/${projectId}/scenarios/${scenarioId}`);
  await expect(block(owner, "PAD2")).toBeVisible();
  await expect(block(owner, "LOAD1")).toHaveCount(0);
  await owner.context().close();

  // sign-off is of a saved revision: with the draft beyond it, the request says so and waits
  const request = page.getByRole("form", { name: "Request sign-off" });
  await expect(request).toContainText("Your draft has changes not in revision 1");
  await expect(request.getByRole("button", { name: "Request sign-off" })).toBeDisabled();
  await testInfo.attach("signoff-waits-for-revision", { body: await request.screenshot(), contentType: "image/png" });

  // discard is explicit and confirmed
  await banner.getByRole("button", { name: "Discard draft" }).click();
  const confirm = page.getByRole("dialog", { name: "Discard your draft?" });
  await expect(confirm).toBeVisible();
  await confirm.getByRole("button", { name: "Discard draft" }).click();
  await expect(block(page, "LOAD1")).toHaveCount(0);
  await expect(saveState(page)).toHaveText("Saved");
  await expect(request.getByRole("button", { name: "Request sign-off" })).toBeEnabled();
  await page.reload();
  await expect(block(page, "PAD2")).toBeVisible();
  await expect(block(page, "LOAD1")).toHaveCount(0);
});

test("Ctrl+S saves a named revision with a note; the history shows note, author, time and what changed", async ({ page }, testInfo) => {
  await signInAs(page, "engineer");
  const projectId = await demoProjectId(page);
  const scenarioId = await createScenario(page, projectId, "E2E named revision");
  await page.goto(`/projects/${projectId}/scenarios/${scenarioId}`);
  await expect(block(page, "PAD1")).toBeVisible();

  await setLoss(page, "PAD2", "6");
  await addLoad(page);
  await expect(saveState(page)).toHaveText("Draft saved", { timeout: 20_000 });

  // Ctrl+S opens the dialog (not the browser's "save page"), which previews the changes in words
  await page.keyboard.press("Control+s");
  const dialog = page.getByRole("dialog", { name: "Save revision" });
  await expect(dialog).toBeVisible();
  await expect(dialog.getByRole("list", { name: "Changes in this revision" })).toContainText("PAD2 loss_db: 3 dB → 6 dB");
  await expect(dialog.getByLabel("Note")).toBeFocused();
  await page.keyboard.type("Heavier output pad and a termination");
  await attach(testInfo, "save-revision-dialog", page);
  // Ctrl+S again commits
  await page.keyboard.press("Control+s");
  await expect(dialog).toBeHidden();
  await expect(page.getByRole("status").filter({ hasText: "Saved revision 2." })).toBeVisible();
  await expect(saveState(page)).toHaveText("Saved");
  const saved = await latest(page, projectId, scenarioId);
  expect(saved.number).toBe(2);
  expect(saved.note).toBe("Heavier output pad and a termination");

  await page.getByRole("button", { name: "Revision history" }).click();
  const row = page.getByTestId("revision-row").filter({ hasText: "r2" });
  await expect(row).toContainText("Heavier output pad and a termination");
  await expect(row).toContainText("Emil Engineer");
  await expect(row).toContainText("PAD2 loss_db: 3 dB → 6 dB");
  await expect(row).toContainText("added LOAD1 (load)");
  await expect(row).toContainText(/\d{2}:\d{2}:\d{2} UTC/);
  await attach(testInfo, "revision-history", page);
  // restore stays
  await expect(page.getByRole("button", { name: "Restore revision 1" })).toBeEnabled();
});

test("two people editing different blocks: the second save merges and says with whose revision", async ({ browser }, testInfo) => {
  const first = await openAs(browser, "engineer");
  const projectId = await demoProjectId(first);
  const scenarioId = await createScenario(first, projectId, "E2E merge");
  const url = `/projects/${projectId}/scenarios/${scenarioId}`;
  await first.goto(url);
  await expect(block(first, "PAD1")).toBeVisible();
  const second = await openAs(browser, "owner");
  await second.goto(url);
  await expect(block(second, "PAD2")).toBeVisible();

  // the owner adds a load and saves revision 2 first
  await addLoad(second);
  await saveRevision(second, "termination");

  // the engineer, still on revision 1, changes PAD1 and saves: merged, both edits on the chart
  await setLoss(first, "PAD1", "10");
  await saveRevision(first, "input pad 10 dB");
  await expect(first.getByRole("status").filter({ hasText: "Saved revision 3. Merged with revision 2 by Olive Owner." })).toBeVisible();
  await expect(block(first, "LOAD1")).toBeVisible();
  await attach(testInfo, "merged", first);
  const merged = await latest(first, projectId, scenarioId);
  expect(merged.number).toBe(3);
  expect(merged.content.blocks.map((b) => b.id)).toEqual(["PAD1", "PAD2", "LOAD1"]);
  expect(merged.content.blocks[0].params?.loss_db).toBe(10);
  await first.getByRole("button", { name: "Revision history" }).click();
  await expect(first.getByTestId("revision-row").filter({ hasText: "r3" })).toContainText("merged with r2");
  await first.context().close();
  await second.context().close();
});

test("a real conflict (the same parameter) asks mine or theirs, and the choice is saved", async ({ browser }, testInfo) => {
  const first = await openAs(browser, "engineer");
  const projectId = await demoProjectId(first);
  const scenarioId = await createScenario(first, projectId, "E2E real conflict");
  const url = `/projects/${projectId}/scenarios/${scenarioId}`;
  await first.goto(url);
  await expect(block(first, "PAD1")).toBeVisible();
  const second = await openAs(browser, "owner");
  await second.goto(url);
  await expect(block(second, "PAD1")).toBeVisible();

  await setLoss(second, "PAD1", "12");
  await saveRevision(second);

  await setLoss(first, "PAD1", "8");
  await first.getByRole("toolbar", { name: "Workspace" }).getByRole("button", { name: "Save revision", exact: true }).click();
  await first.getByRole("dialog", { name: "Save revision" }).getByRole("button", { name: "Save revision", exact: true }).click();
  const ask = first.getByRole("dialog", { name: "Choose yours or theirs" });
  await expect(ask).toBeVisible();
  await expect(ask).toContainText("Revision 2 by Olive Owner");
  const conflict = ask.getByRole("group", { name: "Conflict: PAD1 loss_db" });
  await expect(conflict).toContainText("Mine: 8 dB");
  await expect(conflict).toContainText("Theirs: 12 dB");
  await attach(testInfo, "conflict-dialog", first);
  await conflict.getByLabel(/^Theirs/).check();
  await ask.getByRole("button", { name: "Save merged revision" }).click();
  await expect(ask).toBeHidden();
  await expect(first.getByRole("status").filter({ hasText: "Saved revision 3. Merged with revision 2 by Olive Owner (1 conflict settled by you)." })).toBeVisible();
  const saved = await latest(first, projectId, scenarioId);
  expect(saved.content.blocks[0].params?.loss_db).toBe(12);
  await first.context().close();
  await second.context().close();
});
