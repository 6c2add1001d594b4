import { expect, test, type Page } from "@playwright/test";
import { demoUsers, signIn, type DemoRole } from "./helpers";

// One truth for verdicts through the screens (issue 11), on a copy of the demo's "Baseline": the engineer
// sees the inherited project rules on the Rules panel and runs all rules (pass); a project rule tightened
// on the Rules page marks that verdict stale; one re-run fails it; the engineer asks for a sign-off; the
// reviewer sees the failing verdict before any decision button, "Request changes" as the primary button,
// and approves with a waiver that the panel then shows. The limits come from the run shown on screen: the
// rule is tightened to 10 dB above the isolation the first run reports (margin = worst − limit, docs/checks.md).
const DEMO_PROJECT = "Kestrel telemetry front end";

test.describe.configure({ timeout: 240_000 });

async function signInAs(page: Page, role: DemoRole): Promise<void> {
  await signIn(page, demoUsers[role].email, demoUsers[role].password);
  await expect(page).toHaveURL(/\/projects(\/|$|\?)/, { timeout: 60_000 });
}

test("a rule edit marks a verdict stale, a re-run fails it, and the reviewer approves only with a waiver", async ({ browser }) => {
  const stamp = Date.now();
  const ruleName = `e2e-isolation-${stamp}`;
  const engineerContext = await browser.newContext();
  const engineer = await engineerContext.newPage();
  await signInAs(engineer, "engineer");
  const origin = new URL(engineer.url()).origin;
  const { projects } = (await (await engineer.request.get("/api/projects")).json()) as { projects: { id: string; name: string }[] };
  const projectId = projects.find((p) => p.name === DEMO_PROJECT)!.id;
  const { scenarios } = (await (await engineer.request.get(`/api/projects/${projectId}/scenarios`)).json()) as { scenarios: { id: string; name: string }[] };
  const baseline = scenarios.find((s) => s.name === "Baseline")!;
  const copy = await engineer.request.post(`/api/projects/${projectId}/scenarios/${baseline.id}/duplicate`, { data: { name: `Verdicts ${stamp}` }, headers: { origin } });
  expect(copy.status()).toBe(201);
  const scenarioId = ((await copy.json()) as { scenario: { id: string } }).scenario.id;
  const added = await engineer.request.post(`/api/projects/${projectId}/rules`, {
    data: { spec: { kind: "isolation", id: ruleName, from: "TX", to: "RX", band: [2.4e9, 2.48e9], min_db: 30 } },
    headers: { origin },
  });
  expect(added.status()).toBe(201);
  const ruleRowId = ((await added.json()) as { rule: { id: string } }).rule.id;

  try {
    // The Rules panel shows the project's rules as inherited; all rules pass.
    await engineer.goto(`/projects/${projectId}/scenarios/${scenarioId}`);
    const rulesPanel = engineer.getByRole("region", { name: "Rules" }).filter({ has: engineer.getByRole("table", { name: "Effective rules" }) });
    const ruleRow = rulesPanel.locator(`tr[data-rule="${ruleName}"]`);
    await expect(ruleRow).toContainText("project");
    await expect(rulesPanel.locator('tr[data-rule="tx-rx-isolation"]')).toContainText("isolation ≥ 30 dB");
    const checks = engineer.getByRole("region", { name: "Checks" });
    await checks.getByRole("button", { name: "Run all rules" }).click();
    const result = engineer.getByRole("article", { name: "All rules result" });
    await expect(result.getByText("All rules")).toBeVisible({ timeout: 60_000 });
    const row = result.getByRole("row").filter({ hasText: ruleName });
    await expect(row).toBeVisible();
    const worstText = (await row.innerText()).match(/(\d+\.\d+)\s*dB/);
    expect(worstText).not.toBeNull();
    const tightened = Math.ceil(Number(worstText![1])) + 10;
    await expect(checks.getByTestId("stale-mark")).toHaveCount(0);

    // Tightened on the project's Rules page: back on the scenario, the verdict is marked stale.
    await engineer.goto(`/projects/${projectId}/rules`);
    await engineer.getByRole("button", { name: `Edit rule ${ruleName}` }).click();
    const form = engineer.getByRole("form", { name: `Edit rule ${ruleName}` });
    await form.getByLabel("Least isolation (dB)").fill(String(tightened));
    await form.getByRole("button", { name: "Save rule" }).click();
    await expect(engineer.getByRole("row").filter({ hasText: ruleName })).toContainText(`isolation ≥ ${tightened} dB`);
    await engineer.goto(`/projects/${projectId}/scenarios/${scenarioId}`);
    const history = engineer.getByRole("list", { name: "Run history" });
    await expect(history.getByTestId("stale-mark").first()).toBeVisible({ timeout: 30_000 });
    await history.getByRole("button").first().click();
    const stale = engineer.getByText("This verdict is not current: the rules changed since it ran.");
    await expect(stale).toBeVisible();
    await engineer.getByRole("button", { name: "Re-run on the latest revision" }).click();
    await expect(engineer.getByRole("article", { name: "All rules result" }).getByRole("row").filter({ hasText: ruleName })).toContainText("Fail", { timeout: 60_000 });
    await expect(stale).toHaveCount(0);

    // The engineer asks Rhea Reviewer for a sign-off.
    const request = engineer.getByRole("form", { name: "Request sign-off" });
    await request.getByRole("checkbox", { name: /Rhea Reviewer/ }).check();
    await request.getByRole("button", { name: "Request sign-off" }).click();
    await expect(request.getByText("Asked 1 reviewer.")).toBeVisible();
  } finally {
    await engineerContext.close();
  }

  // The reviewer sees the failing verdict first; approving takes a waiver.
  const reviewerContext = await browser.newContext();
  const reviewer = await reviewerContext.newPage();
  await signInAs(reviewer, "reviewer");
  await reviewer.goto(`/projects/${projectId}/scenarios/${scenarioId}`);
  const panel = reviewer.getByRole("region", { name: "Sign-off" });
  await panel.scrollIntoViewIfNeeded();
  const item = panel.getByTestId("signoff-item").filter({ hasText: "Rhea Reviewer" });
  const evidence = item.getByTestId("revision-verdict");
  await expect(evidence.locator(`tr[data-rule="${ruleName}"]`)).toContainText("Fail", { timeout: 60_000 });
  const decision = item.getByRole("form", { name: /Decide sign-off of revision/ });
  await expect(decision.getByRole("button", { name: "Approve", exact: true })).toHaveCount(0);
  const primary = decision.locator('button[type="submit"]');
  await expect(primary).toHaveText("Request changes");
  await decision.getByLabel(`Reason for waiving ${ruleName}`).fill("Bench data for the T/R switch shows the margin.");
  await decision.getByRole("button", { name: "Approve with waiver" }).click();
  await expect(item.getByText("Approved", { exact: true })).toBeVisible();
  await expect(item.getByTestId("signoff-waiver")).toContainText(`${ruleName}: Bench data for the T/R switch shows the margin.`);
  await panel.screenshot({ path: "test-results/screenshots/signoff-waiver.png" });
  await reviewerContext.close();

  // Leave the demo project's rules as the other specs expect them.
  const cleanup = await browser.newContext();
  const owner = await cleanup.newPage();
  await signInAs(owner, "engineer");
  expect((await owner.request.delete(`/api/projects/${projectId}/rules/${ruleRowId}`, { headers: { origin: new URL(owner.url()).origin } })).status()).toBe(204);
  await cleanup.close();
});
