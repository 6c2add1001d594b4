import { expect, type Page } from "@playwright/test";

/** Demo accounts seeded on first start (db/seed.ts); the README lists them too. */
export const DEMO_PASSWORD = "portolan-demo";
export const demoUsers = {
  owner: { email: "olive@portolan.example", password: DEMO_PASSWORD },
  engineer: { email: "emil@portolan.example", password: DEMO_PASSWORD },
  reviewer: { email: "rhea@portolan.example", password: DEMO_PASSWORD },
} as const;

export type DemoRole = keyof typeof demoUsers;

/** Signs in through the form, as a person would: fields by label, then the "Sign in" button. */
export async function signIn(page: Page, email: string, password: string): Promise<void> {
  await page.goto("/sign-in");
  await page.getByLabel("Email").fill(email);
  await page.getByLabel("Password", { exact: true }).fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
}

/** Signs in as one of the demo users and waits for the projects page. */
export async function signInAs(page: Page, role: DemoRole): Promise<void> {
  const user = demoUsers[role];
  await signIn(page, user.email, user.password);
  await expect(page).toHaveURL(/\/projects(\/|$|\?)/);
}

/**
 * Records every request the page makes whose host is not the app's own, so a test can assert that
 * nothing is fetched from elsewhere. Call before navigating.
 */
export function collectForeignRequests(page: Page, allowedHost = "127.0.0.1"): string[] {
  const foreign: string[] = [];
  page.on("request", (request) => {
    const url = new URL(request.url());
    if (url.protocol === "data:" || url.protocol === "blob:") return;
    if (url.hostname !== allowedHost) foreign.push(request.url());
  });
  return foreign;
}

const helmDialog = (page: Page) => page.getByRole("dialog", { name: "Helm" });
const helmInput = (page: Page) => helmDialog(page).getByRole("combobox");

/** Opens the helm (Ctrl+K), types a command and runs it once it is the highlighted entry. */
export async function helmCommand(page: Page, text: string): Promise<void> {
  await page.keyboard.press("Control+k");
  await expect(helmInput(page)).toBeFocused();
  await page.keyboard.type(text);
  await expect(helmDialog(page).locator('[cmdk-item][data-selected="true"]')).toContainText(text.replace(/…$/, ""));
  await page.keyboard.press("Enter");
}

/** Answers the helm's current step (its input is labelled `prompt`): replaces the default with `text`, or keeps it. */
export async function helmAnswer(page: Page, prompt: string | RegExp, text?: string): Promise<void> {
  await expect(helmInput(page)).toHaveAttribute("aria-label", prompt);
  if (text !== undefined) {
    await page.keyboard.press("Control+a");
    await page.keyboard.type(text);
  }
  await page.keyboard.press("Enter");
}

/**
 * Saves the working draft as a named revision, as a person does: the toolbar's "Save revision", a note,
 * then the dialog's "Save revision". Waits for the notice naming the new revision and for the save state
 * "Saved" (nothing beyond the revision). Autosave only writes the working draft: tests that need a
 * revision (stored checks, sign-off, the API's latest revision) call this.
 */
export async function saveRevision(page: Page, note = ""): Promise<void> {
  await page.getByRole("toolbar", { name: "Workspace" }).getByRole("button", { name: "Save revision", exact: true }).click();
  const dialog = page.getByRole("dialog", { name: "Save revision" });
  await expect(dialog).toBeVisible({ timeout: 15_000 });
  if (note) await dialog.getByLabel("Note").fill(note);
  await dialog.getByRole("button", { name: "Save revision", exact: true }).click();
  await expect(dialog).toBeHidden({ timeout: 40_000 });
  await expect(page.getByRole("status").filter({ hasText: /^Saved revision \d+\./ })).toBeVisible({ timeout: 15_000 });
  await expect(page.getByRole("status", { name: /^Save state:/ })).toHaveText("Saved", { timeout: 15_000 });
}

/** Signed in as the demo engineer, open the demo project's Baseline by keyboard, through the helm. */
export async function openDemoBaselineByHelm(page: Page): Promise<void> {
  await signIn(page, demoUsers.engineer.email, demoUsers.engineer.password);
  await expect(page).toHaveURL(/\/projects(\/|$|\?)/, { timeout: 30_000 });
  await helmCommand(page, "Go to project…");
  await helmAnswer(page, "Project", "Kestrel telemetry front end");
  await expect(page).toHaveURL(/\/projects\/[^/]+$/);
  await helmCommand(page, "Open scenario Baseline");
  await expect(page.getByTestId("workspace")).toBeVisible({ timeout: 30_000 });
}
