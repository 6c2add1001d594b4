import { expect, test, type Page } from "@playwright/test";
import { demoUsers, signInAs, type DemoRole } from "./helpers";

// Demo data from db/seed.ts: three users and the project below, seeded on first start.
const DEMO_PROJECT = "Kestrel telemetry front end";

async function demoProjectId(page: Page): Promise<string> {
  const response = await page.request.get("/api/projects");
  expect(response.status()).toBe(200);
  const { projects } = (await response.json()) as { projects: { id: string; name: string; role: string }[] };
  const project = projects.find((p) => p.name === DEMO_PROJECT);
  expect(project).toBeDefined();
  return project!.id;
}

function originOf(page: Page): string {
  return new URL(page.url()).origin;
}

for (const role of ["owner", "engineer", "reviewer"] as DemoRole[]) {
  test(`the demo ${role} signs in through the form and sees the projects page with their role`, async ({ page }) => {
    await signInAs(page, role);
    await expect(page.getByRole("heading", { level: 1, name: "Projects" })).toBeVisible();
    const row = page.getByRole("row").filter({ has: page.getByRole("link", { name: DEMO_PROJECT }) });
    await expect(row).toBeVisible();
    await expect(row.getByText(role, { exact: true })).toBeVisible();
  });
}

test("a wrong password is refused with a message and no session", async ({ page }) => {
  await page.goto("/sign-in");
  await page.getByLabel("Email").fill(demoUsers.engineer.email);
  await page.getByLabel("Password", { exact: true }).fill("not the password");
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByRole("alert").filter({ hasText: "Wrong e-mail or password." })).toBeVisible();
  await expect(page).toHaveURL(/\/sign-in/);
  expect((await page.request.get("/api/projects")).status()).toBe(401);
});

test("the owner sees the edit controls that a reviewer does not", async ({ page }) => {
  await signInAs(page, "owner");
  await page.getByRole("link", { name: DEMO_PROJECT }).click();
  await expect(page.getByRole("heading", { name: "Project settings" })).toBeVisible();
  await expect(page.getByRole("button", { name: "Delete project" })).toBeVisible();
  await page.getByRole("link", { name: "Members" }).click();
  await expect(page.getByRole("button", { name: "Send invitation" })).toBeVisible();
  await expect(page.getByLabel("Role of Rhea Reviewer")).toBeVisible();
});

test("a reviewer sees no edit controls, and the API answers 403 to a reviewer's write", async ({ page }) => {
  await signInAs(page, "reviewer");
  await page.getByRole("link", { name: DEMO_PROJECT }).click();
  await expect(page.getByRole("heading", { level: 1, name: DEMO_PROJECT })).toBeVisible();
  await expect(page.getByText("Your role: reviewer")).toBeVisible();
  await expect(page.getByRole("heading", { name: "Project settings" })).toHaveCount(0);
  await expect(page.getByRole("button", { name: "Delete project" })).toHaveCount(0);
  await expect(page.getByRole("link", { name: "Audit log" })).toHaveCount(0);
  await expect(page.getByRole("textbox")).toHaveCount(0);

  await page.getByRole("link", { name: "Members" }).click();
  await expect(page.getByRole("cell", { name: "Olive Owner" })).toBeVisible();
  await expect(page.getByRole("button", { name: "Send invitation" })).toHaveCount(0);
  await expect(page.getByRole("combobox")).toHaveCount(0);
  await expect(page.getByRole("button", { name: /Remove|Save/ })).toHaveCount(0);

  const projectId = await demoProjectId(page);
  const origin = originOf(page);
  const rename = await page.request.patch(`/api/projects/${projectId}`, { data: { name: "Renamed by a reviewer" }, headers: { Origin: origin } });
  expect(rename.status()).toBe(403);
  expect(((await rename.json()) as { error: { code: string } }).error.code).toBe("forbidden");
  const invite = await page.request.post(`/api/projects/${projectId}/invitations`, { data: { email: "someone@example.test", role: "owner" }, headers: { Origin: origin } });
  expect(invite.status()).toBe(403);
  const remove = await page.request.delete(`/api/projects/${projectId}`, { headers: { Origin: origin } });
  expect(remove.status()).toBe(403);
  // Nothing changed.
  const after = await page.request.get(`/api/projects/${projectId}`);
  expect(((await after.json()) as { project: { name: string } }).project.name).toBe(DEMO_PROJECT);
});

test("sign-out ends the session", async ({ page, context }) => {
  await signInAs(page, "engineer");
  const cookie = (await context.cookies()).find((c) => c.name === "portolan_session");
  expect(cookie).toBeDefined();

  await page.getByRole("button", { name: /Account menu/ }).click();
  await page.getByRole("button", { name: "Sign out" }).click();
  await expect(page).toHaveURL(/\/sign-in/);

  // The browser's cookie is gone and the old token no longer works on the server either.
  expect((await context.cookies()).find((c) => c.name === "portolan_session")).toBeUndefined();
  const replay = await page.request.get("/api/auth/session", { headers: { Cookie: `portolan_session=${cookie!.value}` } });
  expect(replay.status()).toBe(401);
  await page.goto("/projects");
  await expect(page).toHaveURL(/\/sign-in/);
});
