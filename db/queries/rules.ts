import "server-only";
import { randomUUID } from "node:crypto";
import { and, asc, eq, sql } from "drizzle-orm";
import { db, runInTransaction, type Executor } from "@/db/client";
import { rules, users } from "@/db/schema";
import type { RuleSpec } from "@/engine/types";
import { recordAudit } from "@/lib/server/audit";
import type { SessionUser } from "@/lib/server/auth/session";
import { AppError } from "@/lib/base/errors";
import { authorize } from "@/lib/server/permissions";

/** A project rule as the API returns it. `spec.id` is the rule's name, unique in the project. */
export type RuleView = {
  id: string;
  kind: RuleSpec["kind"];
  spec: RuleSpec;
  createdByName: string | null;
  createdAt: Date;
  updatedAt: Date;
};

async function selectRules(executor: Executor, projectId: string): Promise<RuleView[]> {
  const rows = await executor
    .select({ id: rules.id, kind: rules.kind, spec: rules.spec, createdAt: rules.createdAt, updatedAt: rules.updatedAt, createdByName: users.name })
    .from(rules)
    .leftJoin(users, eq(users.id, rules.createdBy))
    .where(eq(rules.projectId, projectId))
    // insertion order breaks ties between rules created in the same millisecond (the demo seed)
    .orderBy(asc(rules.createdAt), asc(sql`${rules}.rowid`));
  return rows.map((r) => ({ ...r, spec: r.spec }));
}

/** The project's rules, oldest first (anyone in the project). */
export async function listRules({ userId, projectId }: { userId: string; projectId: string }): Promise<RuleView[]> {
  await authorize({ userId, projectId, action: "rule.read" });
  return selectRules(db, projectId);
}

/** The project's rule specs, for the checks (no permission check: callers authorise first). */
export async function projectRuleSpecs({ projectId, executor = db }: { projectId: string; executor?: Executor }): Promise<RuleSpec[]> {
  return (await selectRules(executor, projectId)).map((r) => r.spec);
}

async function assertNameFree(executor: Executor, projectId: string, name: string | undefined, exceptId?: string): Promise<void> {
  if (!name) return;
  const taken = (await selectRules(executor, projectId)).find((r) => r.spec.id === name && r.id !== exceptId);
  if (taken) throw new AppError("conflict", 409, `A rule named "${name}" already exists in this project.`, { id: "Choose another name." });
}

async function requireRule(executor: Executor, projectId: string, ruleId: string) {
  const [row] = await executor.select().from(rules).where(and(eq(rules.id, ruleId), eq(rules.projectId, projectId)));
  if (!row) throw new AppError("not_found", 404, "Rule not found.");
  return row;
}

async function viewOf(executor: Executor, projectId: string, ruleId: string): Promise<RuleView> {
  const found = (await selectRules(executor, projectId)).find((r) => r.id === ruleId);
  if (!found) throw new AppError("not_found", 404, "Rule not found.");
  return found;
}

/** Add a rule to the project (engineers, owners). 409 when its name is taken. */
export async function createRule({ actor, projectId, spec }: { actor: SessionUser; projectId: string; spec: RuleSpec }): Promise<RuleView> {
  return runInTransaction(async (tx) => {
    await authorize({ userId: actor.id, projectId, action: "rule.edit", executor: tx });
    await assertNameFree(tx, projectId, spec.id);
    const id = randomUUID();
    await tx.insert(rules).values({ id, projectId, kind: spec.kind, spec, createdBy: actor.id });
    await recordAudit(tx, { actor, projectId, action: "rule.create", target: spec.id ?? spec.kind, detail: { ruleId: id, spec } });
    return viewOf(tx, projectId, id);
  });
}

/** Replace a rule's spec (engineers, owners). */
export async function updateRule({ actor, projectId, ruleId, spec }: { actor: SessionUser; projectId: string; ruleId: string; spec: RuleSpec }): Promise<RuleView> {
  return runInTransaction(async (tx) => {
    await authorize({ userId: actor.id, projectId, action: "rule.edit", executor: tx });
    const before = await requireRule(tx, projectId, ruleId);
    await assertNameFree(tx, projectId, spec.id, ruleId);
    await tx.update(rules).set({ kind: spec.kind, spec, updatedAt: new Date() }).where(eq(rules.id, ruleId));
    await recordAudit(tx, { actor, projectId, action: "rule.update", target: spec.id ?? spec.kind, detail: { ruleId, from: before.spec, to: spec } });
    return viewOf(tx, projectId, ruleId);
  });
}

/** Remove a rule (engineers, owners). */
export async function deleteRule({ actor, projectId, ruleId }: { actor: SessionUser; projectId: string; ruleId: string }): Promise<void> {
  await runInTransaction(async (tx) => {
    await authorize({ userId: actor.id, projectId, action: "rule.edit", executor: tx });
    const before = await requireRule(tx, projectId, ruleId);
    await tx.delete(rules).where(eq(rules.id, ruleId));
    await recordAudit(tx, { actor, projectId, action: "rule.delete", target: before.spec.id ?? before.kind, detail: { ruleId, spec: before.spec } });
  });
}
