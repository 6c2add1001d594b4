// The demo project's scenarios: seeded once, judged by the project's rules (no hidden copies in the
// scenario files), and the portolan CLI's check of their bundles agrees with the story the demo tells
// ("Baseline" meets the rules, "Cheaper switch" fails TX→RX isolation).
import { beforeAll, describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import { countRows, setUpDatabase } from "./helpers";
import { db, runInTransaction } from "@/db/client";
import { seedDemoScenarios } from "@/db/seed-scenarios";
import { parts, rules, scenarioRevisions, scenarios, users } from "@/db/schema";
import { DEMO_USERS, seedDemo } from "@/db/seed";
import { listParts } from "@/db/queries/parts";
import { getScenario, listScenarios } from "@/db/queries/scenarios";
import { exportBundle } from "@/lib/server/bundle/export";
import { resolveAccess } from "@/lib/server/permissions";

let projectId: string;
let engineerId: string;

beforeAll(async () => {
  await setUpDatabase();
  const result = await seedDemo();
  expect(result.seeded).toBe(true);
  projectId = result.projectId!;
  const [engineer] = await db.select({ id: users.id }).from(users).where(eq(users.email, DEMO_USERS[1].email));
  engineerId = engineer.id;
});

/** Export a scenario's latest revision as a bundle, then run `portolan check bundle.zip --json` on it. */
async function runBundleCheck(scenarioId: string): Promise<{ status: number | null; result: { verdict: string; failingRules: string[]; items: { name: string; rerun: string }[] } }> {
  const [row] = await db.select().from(users).where(eq(users.id, engineerId));
  const actor = { id: row.id, email: row.email, name: row.name, isSiteAdmin: row.isSiteAdmin };
  const bundle = await exportBundle({ actor, access: await resolveAccess({ userId: engineerId, projectId }), scenarioId });
  const dir = mkdtempSync(path.join(os.tmpdir(), "portolan-demo-"));
  writeFileSync(path.join(dir, "bundle.zip"), bundle.bytes);
  const run = spawnSync(process.execPath, [path.resolve("node_modules/tsx/dist/cli.mjs"), path.resolve("engine/cli.ts"), "check", "bundle.zip", "--json"], { cwd: dir, encoding: "utf8" });
  if (run.status === 2 || run.stdout.trim() === "") throw new Error(run.stderr);
  return { status: run.status, result: JSON.parse(run.stdout) };
}

describe("demo scenarios", () => {
  it("the demo project has two scenarios, two parts that are passive and reciprocal, and three project rules", async () => {
    const list = await listScenarios({ userId: engineerId, projectId });
    expect(list.map((s) => s.name)).toEqual(["Baseline", "Cheaper switch"]);
    expect(list.every((s) => s.warningCount === 0)).toBe(true);
    const stored = await listParts({ userId: engineerId, projectId });
    expect(stored.map((p) => [p.fileName, p.ports, p.passivity, p.reciprocity])).toEqual([
      ["kestrel-patch-b.s1p", 1, "pass", "pass"],
      ["kestrel-tx-bpf.s2p", 2, "pass", "pass"],
    ]);
    const ruleRows = await db.select().from(rules).where(eq(rules.projectId, projectId));
    expect(ruleRows.map((r) => r.kind).sort()).toEqual(["insertion_loss", "isolation", "match"]);
  });

  it("the demo scenario files carry no copies of the project rules: they inherit them", async () => {
    for (const item of await listScenarios({ userId: engineerId, projectId })) {
      const { revision } = await getScenario({ userId: engineerId, projectId, scenarioId: item.id });
      expect(revision.content.rules ?? []).toEqual([]);
      expect(revision.content.rule_overrides ?? []).toEqual([]);
    }
  });

  it("`portolan check` of their bundles passes Baseline and fails Cheaper switch on TX→RX isolation only", async () => {
    const list = await listScenarios({ userId: engineerId, projectId });
    const verdicts: Record<string, { status: number | null; rules: Record<string, string> }> = {};
    for (const item of list) {
      const { status, result } = await runBundleCheck(item.id);
      const rules = result.items.filter((i) => i.name.startsWith("rule:")).map((i) => [i.name.slice(5), i.rerun]);
      verdicts[item.name] = { status, rules: Object.fromEntries(rules) };
    }
    expect(verdicts.Baseline).toEqual({ status: 0, rules: { "tx-rx-isolation": "pass", "tx-match": "pass", "tx-ant-loss": "pass" } });
    expect(verdicts["Cheaper switch"]).toEqual({ status: 1, rules: { "tx-rx-isolation": "fail", "tx-match": "pass", "tx-ant-loss": "pass" } });
  });

  it("seeding again changes nothing", async () => {
    const before = [await countRows(scenarios), await countRows(scenarioRevisions), await countRows(parts), await countRows(rules)];
    const again = await seedDemo();
    expect(again).toEqual({ seeded: false, projectId });
    // the step itself also skips a project that already has the demo scenarios
    await runInTransaction((tx) => seedDemoScenarios({ tx, projectId, users: { owner: engineerId, engineer: engineerId, reviewer: engineerId } }));
    expect([await countRows(scenarios), await countRows(scenarioRevisions), await countRows(parts), await countRows(rules)]).toEqual(before);
  });
});
