// Project rules: list, create, edit, delete with the rule.edit permission; validation; the merge with a
// scenario's own rules used by "Run all rules".
import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { call, countRows, makeRequest, setUpDatabase, type ErrorJson } from "./helpers";
import * as rulesRoute from "@/app/api/projects/[projectId]/rules/route";
import * as ruleRoute from "@/app/api/projects/[projectId]/rules/[ruleId]/route";
import { db } from "@/db/client";
import { auditEvents, rules, users } from "@/db/schema";
import { DEMO_USERS, seedDemo } from "@/db/seed";
import { createSessionForUser } from "@/lib/server/auth/session";
import type { RuleView } from "@/db/queries/rules";
import { effectiveRuleSet } from "@/engine/checks";
import type { RuleSpec } from "@/engine/types";

let projectId: string;
const cookies: Record<"owner" | "engineer" | "reviewer", string> = { owner: "", engineer: "", reviewer: "" };

beforeAll(async () => {
  await setUpDatabase();
  projectId = (await seedDemo()).projectId!;
  for (const demo of DEMO_USERS) {
    const [row] = await db.select({ id: users.id }).from(users).where(eq(users.email, demo.email));
    cookies[demo.role] = `portolan_session=${(await createSessionForUser(row.id)).token}`;
  }
});

const url = () => `/api/projects/${projectId}/rules`;
const list = async (cookie: string) => {
  const res = await call(rulesRoute.GET, makeRequest("GET", url(), { cookie }), { projectId });
  expect(res.status).toBe(200);
  return ((await res.json()) as { rules: RuleView[] }).rules;
};
const create = (cookie: string, body: unknown) => call(rulesRoute.POST, makeRequest("POST", url(), { cookie, body }), { projectId });
const update = (cookie: string, ruleId: string, body: unknown) => call(ruleRoute.PUT, makeRequest("PUT", `${url()}/${ruleId}`, { cookie, body }), { projectId, ruleId });
const remove = (cookie: string, ruleId: string) => call(ruleRoute.DELETE, makeRequest("DELETE", `${url()}/${ruleId}`, { cookie }), { projectId, ruleId });

const RX_MATCH = { kind: "match", id: "rx-match", port: "RX", band: [2.4e9, 2.48e9], max_vswr: 1.5 };

describe("project rules", () => {
  it("everyone in the project reads the demo rules in the order they were made", async () => {
    const got = await list(cookies.reviewer);
    expect(got.map((r) => r.spec.id)).toEqual(["tx-rx-isolation", "tx-match", "tx-ant-loss"]);
  });

  it("an engineer creates, edits and deletes a rule, each with an audit event", async () => {
    const created = await create(cookies.engineer, { spec: RX_MATCH });
    expect(created.status).toBe(201);
    const { rule } = (await created.json()) as { rule: RuleView };
    expect(rule.spec).toEqual(RX_MATCH);
    expect(rule.createdByName).toBe("Emil Engineer");

    const edited = await update(cookies.engineer, rule.id, { spec: { ...RX_MATCH, max_vswr: 2 } });
    expect(edited.status).toBe(200);
    expect(((await edited.json()) as { rule: RuleView }).rule.spec).toMatchObject({ max_vswr: 2 });

    expect((await remove(cookies.engineer, rule.id)).status).toBe(204);
    expect((await list(cookies.engineer)).some((r) => r.id === rule.id)).toBe(false);
    const events = await db.select().from(auditEvents).where(eq(auditEvents.projectId, projectId));
    expect(events.map((e) => e.action).filter((a) => a.startsWith("rule."))).toEqual(["rule.create", "rule.update", "rule.delete"]);
  });

  it("a reviewer may read rules but not create, edit or delete them (403), and nothing changes", async () => {
    const before = await countRows(rules);
    const [first] = await list(cookies.reviewer);
    expect((await create(cookies.reviewer, { spec: RX_MATCH })).status).toBe(403);
    expect((await update(cookies.reviewer, first.id, { spec: { ...first.spec, min_db: 10 } })).status).toBe(403);
    expect((await remove(cookies.reviewer, first.id)).status).toBe(403);
    expect(await countRows(rules)).toBe(before);
    const [still] = await db.select().from(rules).where(eq(rules.id, first.id));
    expect(still.spec).toEqual(first.spec);
  });

  it("invalid rules are 400 with a message per field, and a taken name is 409", async () => {
    const before = await countRows(rules);
    const bad: [unknown, string][] = [
      [{ spec: { ...RX_MATCH, max_vswr: undefined } }, "spec.min_return_loss_db"], // a match rule needs a limit
      [{ spec: { ...RX_MATCH, band: [2.48e9, 2.4e9] } }, "spec.band"],
      [{ spec: { ...RX_MATCH, id: "has spaces" } }, "spec.id"],
      [{ spec: { kind: "isolation", id: "iso", from: "TX", to: "RX", band: [2.4e9, 2.48e9] } }, "spec.min_db"],
      [{ spec: { kind: "drive", id: "drv", sources: [] } }, "spec.sources"],
      [{ spec: { kind: "group_delay", id: "g" } }, "spec.kind"], // not a rule kind ("gain" became one with the line-up)
    ];
    for (const [body, field] of bad) {
      const res = await create(cookies.engineer, body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      const err = (await res.json()) as ErrorJson;
      expect(Object.keys(err.error.fields ?? {}), JSON.stringify(err)).toContain(field);
    }
    const taken = await create(cookies.engineer, { spec: { ...RX_MATCH, id: "tx-match" } });
    expect(taken.status).toBe(409);
    expect(await countRows(rules)).toBe(before);
  });

  it("a rule of another project is not found", async () => {
    expect((await update(cookies.engineer, "no-such-rule", { spec: RX_MATCH })).status).toBe(404);
    expect((await remove(cookies.engineer, "no-such-rule")).status).toBe(404);
  });
});

describe("effectiveRuleSet (project rules, overrides, opt-outs and a scenario's own rules)", () => {
  const iso: RuleSpec = { kind: "isolation", id: "iso", from: "TX", to: "RX", band: [2.4e9, 2.48e9], min_db: 30 };
  const loss: RuleSpec = { kind: "insertion_loss", id: "loss", from: "TX", to: "ANT", band: [2.4e9, 2.48e9], max_db: 3 };
  const ports = [{ name: "TX" }, { name: "RX" }, { name: "ANT" }];

  it("inherits the project rules in order and drops a hidden identical copy", () => {
    const set = effectiveRuleSet([iso, loss], { ports, rules: [{ ...iso }] });
    expect(set.rules.map((r) => [r.id, r.source])).toEqual([
      ["iso", "project"],
      ["loss", "project"],
    ]);
  });

  it("shows an override with both limits and who changed it; a hidden different copy reads as an override", () => {
    const over = effectiveRuleSet([iso, loss], { ports, rule_overrides: [{ ...iso, id: "iso", min_db: 40, by: "emil@portolan.example", at: "2026-12-01T10:00:00Z" }] });
    expect(over.rules[0]).toMatchObject({ id: "iso", source: "scenario-override", rule: { min_db: 40 }, project_rule: { min_db: 30 }, by: "emil@portolan.example" });
    expect(over.rules[0].rule).not.toHaveProperty("by");
    const legacy = effectiveRuleSet([iso, loss], { ports, rules: [{ ...iso, min_db: 40 }] });
    expect(legacy.rules[0]).toMatchObject({ id: "iso", source: "scenario-override", rule: { min_db: 40 }, project_rule: { min_db: 30 } });
  });

  it("lists an opted-out project rule with its reason and does not judge by it", () => {
    const set = effectiveRuleSet([iso, loss], { ports, rule_opt_outs: [{ id: "loss", reason: "ANT is a test fixture here", by: "emil" }] });
    expect(set.rules.map((r) => r.id)).toEqual(["iso"]);
    expect(set.opted_out).toEqual([{ id: "loss", reason: "ANT is a test fixture here", by: "emil", at: undefined, project_rule: loss }]);
  });

  it("appends scenario-only rules (unnamed ones named by place) and lists rules naming missing ports as not run", () => {
    const unnamed: RuleSpec = { kind: "match", port: "LNA", band: [2.4e9, 2.48e9], max_vswr: 2 };
    const set = effectiveRuleSet([iso], { ports, rules: [unnamed] });
    expect(set.rules.map((r) => [r.id, r.source])).toEqual([
      ["iso", "project"],
      ["rules[0]", "scenario"],
    ]);
    expect(set.rules[1].not_run).toBe('the scenario has no system port "LNA"');
    expect(set.rules[0].not_run).toBeUndefined();
  });
});
