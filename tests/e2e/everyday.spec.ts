import { expect as baseExpect, test, type Locator, type Page } from "@playwright/test";
import { demoUsers, signIn, type DemoRole } from "./helpers";

// Everyday flows of issue 18 on the seeded demo (db/seed.ts): edits that are never lost, links that
// land after sign-in, not-found pages, keyboard paths.
const DEMO_PROJECT = "Kestrel telemetry front end";

test.describe.configure({ timeout: 180_000 });
const expect = baseExpect.configure({ timeout: 40_000 });
test.use({ viewport: { width: 1600, height: 1100 } });

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

const origin = (page: Page) => ({ origin: new URL(page.url()).origin });
const block = (page: Page, id: string): Locator => page.locator(`[aria-label^="Block ${id},"]`);
const saveState = (page: Page): Locator => page.getByRole("status", { name: /^Save state:/ });

async function createScenario(page: Page, projectId: string, name: string, template = "pad-chain"): Promise<string> {
  const response = await page.request.post(`/api/projects/${projectId}/scenarios`, { data: { name, template }, headers: origin(page) });
  expect(response.status()).toBe(201);
  return ((await response.json()) as { scenario: { id: string } }).scenario.id;
}

/** The blocks of the person's working draft on the server (autosave writes the draft, never a revision). */
async function draftBlockIds(page: Page, projectId: string, scenarioId: string): Promise<string[]> {
  const body = (await (await page.request.get(`/api/projects/${projectId}/scenarios/${scenarioId}/draft`)).json()) as { draft: { content: { blocks: { id: string }[] } } | null };
  return body.draft?.content.blocks.map((b) => b.id) ?? [];
}

async function addLoad(page: Page): Promise<void> {
  await page.getByRole("button", { name: /^Add block/ }).click();
  await page.getByRole("option", { name: /^Load/ }).click();
  await expect(block(page, "LOAD1")).toBeVisible();
}

test.describe("1. no edit is lost", () => {
  test("an in-app link asks first, and leaving saves the edits instead of dropping them", async ({ page }) => {
    await signInAs(page, "engineer");
    const projectId = await demoProjectId(page);
    const scenarioId = await createScenario(page, projectId, "E2E leave guard");
    await page.goto(`/projects/${projectId}/scenarios/${scenarioId}`);
    await expect(block(page, "PAD1")).toBeVisible();
    // hold the autosave (of the working draft) so that the edit is certainly unsaved when the link is clicked
    let release: () => void = () => undefined;
    const held = new Promise<void>((resolve) => (release = resolve));
    await page.route(`**/scenarios/${scenarioId}/draft`, async (route) => {
      await held;
      await route.continue();
    });
    await addLoad(page);

    // "no" keeps the page and the edit
    page.once("dialog", (dialog) => {
      expect(dialog.message()).toContain("unsaved edits");
      void dialog.dismiss();
    });
    await page.getByRole("navigation", { name: "Project sections" }).getByRole("link", { name: "Parts", exact: true }).click();
    await expect(page).toHaveURL(new RegExp(`/scenarios/${scenarioId}$`));
    await expect(block(page, "LOAD1")).toBeVisible();

    // "yes" leaves; the pending edit goes out as it leaves
    page.once("dialog", (dialog) => void dialog.accept());
    await page.getByRole("navigation", { name: "Project sections" }).getByRole("link", { name: "Parts", exact: true }).click();
    await expect(page).toHaveURL(new RegExp(`/projects/${projectId}/parts$`));
    release();
    await expect.poll(() => draftBlockIds(page, projectId, scenarioId), { timeout: 30_000 }).toContain("LOAD1");
    await page.unroute(`**/scenarios/${scenarioId}/draft`);
    await page.goto(`/projects/${projectId}/scenarios/${scenarioId}`);
    await expect(block(page, "LOAD1")).toBeVisible();
    await expect(saveState(page)).toHaveText("Draft saved");
  });

  test("edits of a closed tab are kept as the working draft and offered back", async ({ browser }) => {
    const context = await browser.newContext({ viewport: { width: 1600, height: 1100 } });
    const page = await context.newPage();
    await signInAs(page, "engineer");
    const projectId = await demoProjectId(page);
    const scenarioId = await createScenario(page, projectId, "E2E closed tab");
    // the server never gets the edit: every draft write of this tab fails (as with a lost connection)
    await page.route(`**/scenarios/${scenarioId}/draft`, (route) => route.abort());
    await page.goto(`/projects/${projectId}/scenarios/${scenarioId}`);
    await expect(block(page, "PAD1")).toBeVisible();
    await addLoad(page);
    await expect(saveState(page)).toHaveText("Draft kept in this browser");
    await page.close(); // a closed tab: no question asked (runBeforeUnload is off)

    const again = await context.newPage();
    await again.goto(`/projects/${projectId}/scenarios/${scenarioId}`);
    const offer = again.getByRole("status").filter({ hasText: "Unsaved edits from an earlier visit" });
    await expect(offer).toBeVisible();
    await expect(block(again, "LOAD1")).toHaveCount(0);
    await offer.getByRole("button", { name: "Restore my edits" }).click();
    await expect(block(again, "LOAD1")).toBeVisible();
    await expect(saveState(again)).toHaveText("Draft saved", { timeout: 20_000 });
    expect(await draftBlockIds(again, projectId, scenarioId)).toContain("LOAD1");
    // on the server now: the draft reopens by itself and nothing is offered any more
    await again.reload();
    await expect(block(again, "LOAD1")).toBeVisible();
    await expect(again.getByText("Unsaved edits from an earlier visit")).toHaveCount(0);
    await context.close();
  });
});

test.describe("2. links land where they point", () => {
  test("a signed-out person opening a scenario link signs in and lands on that scenario", async ({ browser }) => {
    const owner = await browser.newContext();
    const ownerPage = await owner.newPage();
    await signInAs(ownerPage, "owner");
    const projectId = await demoProjectId(ownerPage);
    const scenarioId = await createScenario(ownerPage, projectId, "E2E deep link");
    await owner.close();

    const context = await browser.newContext();
    const page = await context.newPage();
    const target = `/projects/${projectId}/scenarios/${scenarioId}`;
    await page.goto(target);
    await expect(page).toHaveURL((u) => u.pathname === "/sign-in" && u.searchParams.get("next") === target);
    await page.getByLabel("Email").fill(demoUsers.engineer.email);
    await page.getByLabel("Password", { exact: true }).fill(demoUsers.engineer.password);
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page).toHaveURL((u) => u.pathname === target, { timeout: 60_000 });
    await expect(block(page, "PAD1")).toBeVisible();
    await context.close();
  });

  test("a next pointing at another site is ignored", async ({ page }) => {
    await page.goto("/sign-in?next=https%3A%2F%2Fevil.example%2Fx");
    await page.getByLabel("Email").fill(demoUsers.reviewer.email);
    await page.getByLabel("Password", { exact: true }).fill(demoUsers.reviewer.password);
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page).toHaveURL((u) => u.origin === new URL(page.url()).origin && u.pathname === "/projects", { timeout: 60_000 });
  });
});

test.describe("6. not found is not found", () => {
  test("missing pages, bad ids and projects the person cannot see answer 404 with a branded page and a way back", async ({ browser }) => {
    // a project the engineer is not a member of
    const ownerContext = await browser.newContext();
    const ownerPage = await ownerContext.newPage();
    await signInAs(ownerPage, "owner");
    const created = await ownerPage.request.post("/api/projects", { data: { name: "E2E private project" }, headers: origin(ownerPage) });
    expect(created.status()).toBe(201);
    const privateId = ((await created.json()) as { project: { id: string } }).project.id;
    await ownerContext.close();

    const context = await browser.newContext();
    const page = await context.newPage();
    await signInAs(page, "engineer");
    const projectId = await demoProjectId(page);
    for (const path of ["/no-such-page", `/projects/${projectId}/scenarios/no-such-scenario`, `/projects/${privateId}`, `/projects/${privateId}/scenarios`, "/projects/no-such-project"]) {
      const response = await page.goto(path);
      expect(response?.status(), path).toBe(404);
      await expect(page.getByRole("main")).toBeVisible();
      await expect(page.getByRole("heading", { name: /not found/i })).toBeVisible();
      await expect(page.getByRole("link", { name: "Back to your projects" })).toBeVisible();
    }
    // the way back works
    await page.getByRole("link", { name: "Back to your projects" }).click();
    await expect(page).toHaveURL(/\/projects$/);
    // a page that exists still answers 200
    expect((await page.goto(`/projects/${projectId}/scenarios`))?.status()).toBe(200);
    await context.close();
  });
});

test.describe("7. keyboard", () => {
  test("the link-target select waits for Enter, and the focus lands on Unlink after linking", async ({ page }) => {
    await signInAs(page, "engineer");
    const projectId = await demoProjectId(page);
    const scenarioId = await createScenario(page, projectId, "E2E keyboard link");
    await page.goto(`/projects/${projectId}/scenarios/${scenarioId}`);
    await expect(block(page, "PAD1")).toBeVisible();
    await addLoad(page);
    await page.getByRole("button", { name: /^Add block/ }).click();
    await page.getByRole("option", { name: /^Antenna One-port/ }).click();
    await expect(block(page, "ANT1")).toBeVisible();
    // the new block has the focus, so the inspector shows its ports; LOAD1:1 is the free port to link to
    await expect(page.locator('.react-flow__node[data-id="ANT1"]')).toBeFocused();
    const select = page.getByRole("combobox", { name: "Link ANT1:1 to" });
    await select.focus();
    await page.keyboard.press("ArrowDown");
    // one arrow key only chooses: nothing is linked yet
    await expect(page.getByRole("button", { name: /^Unlink ANT1:1/ })).toHaveCount(0);
    await expect(select).toBeVisible();
    const chosen = await select.inputValue();
    expect(chosen).not.toBe("");
    await page.keyboard.press("Enter");
    const unlink = page.getByRole("button", { name: `Unlink ANT1:1 from ${chosen}` });
    await expect(unlink).toBeVisible();
    await expect(unlink).toBeFocused();
  });

  test("in the helm, typing a command's exact name and Enter runs that command", async ({ page }) => {
    await signInAs(page, "engineer");
    const projectId = await demoProjectId(page);
    const scenarioId = await createScenario(page, projectId, "E2E helm ranking");
    await page.goto(`/projects/${projectId}/scenarios/${scenarioId}`);
    await expect(block(page, "PAD1")).toBeVisible();
    const opener = page.getByRole("button", { name: /^Helm/ });
    await opener.focus();
    await page.keyboard.press("Enter");
    const dialog = page.getByRole("dialog");
    await expect(dialog).toBeVisible();
    await page.keyboard.type("isolation");
    await expect(dialog.getByRole("option").first()).toContainText("Run isolation check");
    // closing the helm gives the focus back to where it was
    await page.keyboard.press("Escape");
    await expect(dialog).toHaveCount(0);
    await expect(opener).toBeFocused();
  });

  test("the last owner is not offered to leave the project", async ({ page }) => {
    await signInAs(page, "owner");
    const created = await page.request.post("/api/projects", { data: { name: "E2E sole owner" }, headers: origin(page) });
    const id = ((await created.json()) as { project: { id: string } }).project.id;
    await page.goto(`/projects/${id}/members`);
    await expect(page.getByText("Only owner: make someone else owner to leave")).toBeVisible();
    await expect(page.getByRole("button", { name: /^Leave/ })).toHaveCount(0);
  });
});

test.describe("4. accounts", () => {
  test("a person renames their account and signs out another browser from the sessions list", async ({ browser }) => {
    const other = await browser.newContext();
    const otherPage = await other.newPage();
    await signInAs(otherPage, "reviewer");

    const context = await browser.newContext();
    const page = await context.newPage();
    await signInAs(page, "reviewer");
    await page.goto("/account");
    const sessions = page.getByRole("list", { name: "Your sessions" });
    await expect(sessions.getByText("This browser")).toBeVisible();
    const others = sessions.getByRole("button", { name: /^Sign out/ });
    expect(await others.count()).toBeGreaterThanOrEqual(1);
    // end every other session: the other browser is signed out
    while ((await others.count()) > 0) {
      await others.first().click();
      await expect(page.getByText("That session has ended")).toBeVisible();
    }
    expect((await otherPage.request.get("/api/auth/session")).status()).toBe(401);

    await page.getByRole("region", { name: "Name" }).getByLabel("Name").fill("Rhea Reviewer-Renamed");
    await page.getByRole("button", { name: "Save name" }).click();
    await expect(page.getByText("Your name is now Rhea Reviewer-Renamed.")).toBeVisible();
    // the wrong current password is refused, naming the field
    const password = page.getByRole("region", { name: "Password" });
    await password.getByLabel("Current password").fill("not the password");
    await password.getByLabel("New password").fill("a brand new long password");
    await password.getByRole("button", { name: "Change password" }).click();
    await expect(password.getByText("The current password is not right.")).toBeVisible();
    // a new address waits for the link mailed to it
    const email = page.getByRole("region", { name: "E-mail address" });
    await email.getByLabel("New e-mail address").fill("rhea.new@portolan.example");
    await email.getByLabel("Current password").fill(demoUsers.reviewer.password);
    await email.getByRole("button", { name: "Send confirmation link" }).click();
    await expect(email.getByText(/We sent a link to rhea\.new@portolan\.example/)).toBeVisible();
    await context.close();
    await other.close();
  });
});

test.describe("5. readable audit", () => {
  test("the owner reads the project log in words, filters it by kind and downloads it as CSV", async ({ page }) => {
    await signInAs(page, "owner");
    const projectId = await demoProjectId(page);
    await createScenario(page, projectId, "E2E audit words");
    await page.goto(`/projects/${projectId}/audit`);
    await expect(page.getByRole("cell", { name: "Created the scenario E2E audit words from pad-chain" })).toBeVisible();
    await expect(page.getByText(/[{}]"/)).toHaveCount(0);
    await page.getByLabel("Kind").selectOption("member");
    await page.getByRole("button", { name: "Filter" }).click();
    await expect(page).toHaveURL(/kind=member/);
    await expect(page.getByRole("cell", { name: /E2E audit words/ })).toHaveCount(0);
    const csv = await page.request.get(`/api/projects/${projectId}/audit?format=csv`);
    expect(csv.status()).toBe(200);
    expect(csv.headers()["content-type"]).toContain("text/csv");
    const text = await csv.text();
    expect(text.split("\r\n")[0]).toBe("time_utc,person,email,what,action,target");
    expect(text).toContain("Created the scenario E2E audit words from pad-chain");
  });
});

test.describe("8. small screens", () => {
  test.use({ viewport: { width: 390, height: 844 } });

  test("at 390 px the header folds into a menu with sign-out on screen, and pages do not scroll sideways", async ({ page }) => {
    await signInAs(page, "owner");
    const projectId = await demoProjectId(page);
    for (const path of ["/projects", "/account", `/projects/${projectId}`, `/projects/${projectId}/members`, `/projects/${projectId}/audit`]) {
      await page.goto(path);
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
      expect(overflow, path).toBeLessThanOrEqual(0);
    }
    await expect(page.getByRole("navigation", { name: "Main", exact: true })).toBeHidden();
    await page.getByRole("button", { name: /Account menu/ }).click();
    const signOut = page.getByRole("button", { name: "Sign out" });
    await expect(signOut).toBeInViewport();
    await page.getByRole("navigation", { name: "Main (menu)" }).getByRole("link", { name: "Account" }).click();
    await expect(page).toHaveURL(/\/account$/);
  });
});

test.describe("3. reviewer's path", () => {
  test("the sign-offs list shows the requester's note, a Review action and the revision's evidence; run history names who ran", async ({ browser }) => {
    const eng = await browser.newContext();
    const engPage = await eng.newPage();
    await signInAs(engPage, "engineer");
    const projectId = await demoProjectId(engPage);
    const scenarioId = await createScenario(engPage, projectId, "E2E reviewer path");
    const members = (await (await engPage.request.get(`/api/projects/${projectId}/members`)).json()) as { members: { userId: string; email: string }[] };
    const rhea = members.members.find((m) => m.email === demoUsers.reviewer.email)!;
    const requested = await engPage.request.post(`/api/projects/${projectId}/signoffs`, {
      data: { scenarioId, reviewerIds: [rhea.userId], note: "Please check the pad loss at 2.4 GHz." },
      headers: origin(engPage),
    });
    expect(requested.status()).toBe(201);
    await eng.close();

    const context = await browser.newContext();
    const page = await context.newPage();
    await signInAs(page, "reviewer");
    await page.goto(`/projects/${projectId}/signoffs`);
    const row = page.getByTestId("signoff-row").filter({ hasText: "E2E reviewer path" });
    await expect(row.getByText("Please check the pad loss at 2.4 GHz.")).toBeVisible();
    const evidence = await page.request.get((await row.getByRole("link", { name: /^Evidence/ }).getAttribute("href"))!);
    expect(evidence.status()).toBe(200);
    expect(evidence.headers()["content-type"]).toContain("application/zip");
    await row.getByRole("link", { name: /^Review/ }).click();
    await expect(page).toHaveURL(new RegExp(`/scenarios/${scenarioId}`));
    await expect(page.getByRole("region", { name: "Sign-off" })).toBeVisible();
    await context.close();
  });
});

test.describe("4. site admin", () => {
  // The demo has no site admin (demo accounts lose it at start): this story makes Olive one directly in
  // the e2e database for its duration, and takes it back at the end.
  async function setSiteAdmin(email: string, on: boolean): Promise<void> {
    const { createClient } = await import("@libsql/client");
    // the database playwright.config.ts gives the server (one per E2E_PORT)
    const port = Number(process.env.E2E_PORT ?? 3210);
    const client = createClient({ url: `file:${port === 3210 ? "data/e2e-playwright.db" : `data/e2e-playwright-${port}.db`}` });
    await client.execute({ sql: "UPDATE users SET is_site_admin = ? WHERE email = ?", args: [on ? 1 : 0, email] });
    client.close();
  }

  test("deactivating an account ends its sessions at once, after a confirmation; the admin pages pass the accessibility scan", async ({ browser }) => {
    await setSiteAdmin(demoUsers.owner.email, true);
    try {
      const emil = await browser.newContext();
      const emilPage = await emil.newPage();
      await signInAs(emilPage, "engineer");
      expect((await emilPage.request.get("/api/auth/session")).status()).toBe(200);

      const context = await browser.newContext();
      const page = await context.newPage();
      await signInAs(page, "owner");
      const AxeBuilder = (await import("@axe-core/playwright")).default;
      for (const path of ["/admin/users", "/admin/settings", "/admin/audit"]) {
        await page.goto(path);
        const { violations } = await new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"]).analyze();
        expect(violations.filter((v) => v.impact === "serious" || v.impact === "critical").map((v) => `${path}: ${v.id}`)).toEqual([]);
      }
      await page.goto("/admin/users");
      const row = page.getByRole("row").filter({ hasText: demoUsers.engineer.email });
      await expect(row.getByRole("list", { name: /^Projects of/ })).toContainText(DEMO_PROJECT);
      await row.getByRole("button", { name: /^Deactivate/ }).click();
      const dialog = page.getByRole("dialog");
      await expect(dialog).toContainText("signed out everywhere at once");
      await dialog.getByRole("button", { name: "Deactivate" }).click();
      await expect(row.getByText("deactivated")).toBeVisible();
      expect((await emilPage.request.get("/api/auth/session")).status()).toBe(401);

      await page.goto("/admin/audit");
      await expect(page.getByRole("cell", { name: new RegExp(`^Deactivated ${demoUsers.engineer.email.replace(".", "\\.")}`) })).toBeVisible();

      await page.goto("/admin/users");
      await page.getByRole("row").filter({ hasText: demoUsers.engineer.email }).getByRole("button", { name: /^Reactivate/ }).click();
      await page.getByRole("dialog").getByRole("button", { name: "Reactivate" }).click();
      await expect(page.getByRole("row").filter({ hasText: demoUsers.engineer.email }).getByText("active", { exact: true })).toBeVisible();
      await emil.close();
      await context.close();
    } finally {
      await setSiteAdmin(demoUsers.owner.email, false);
    }
  });
});
