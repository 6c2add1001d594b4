import "server-only";
import { eq, isNotNull } from "drizzle-orm";
import { normaliseScenarioRules } from "@/engine/checks";
import type { RuleSpec, Scenario } from "@/engine/types";
import { recordAudit } from "@/lib/server/audit";
import { runInTransaction } from "./client";
import { projectRuleSpecs } from "./queries/rules";
import { insertRevision } from "./queries/revisions";
import { scenarioRevisions, scenarios } from "./schema";

/**
 * Data migration run at every start, after the SQL migrations (db/startup.ts): scenarios whose latest
 * revision keeps copies of project rules in `rules` under the project rules' names (written before
 * overrides and opt-outs existed) get a new revision ("migrate") where an identical copy is dropped and a
 * different one becomes an explicit entry of `rule_overrides`, which the Rules panel shows. Revisions are
 * never rewritten (sign-offs bind to their hashes); older revisions are read the same way by
 * effectiveRuleSet, so their verdicts do not change. Idempotent: a migrated scenario has no such copy left.
 *
 * @returns how many scenarios got a new revision
 */
export async function migrateScenarioRules(): Promise<{ migrated: number }> {
  return runInTransaction(async (tx) => {
    const rows = await tx
      .select({ id: scenarios.id, projectId: scenarios.projectId, name: scenarios.name, number: scenarioRevisions.number, content: scenarioRevisions.content })
      .from(scenarios)
      .innerJoin(scenarioRevisions, eq(scenarioRevisions.id, scenarios.latestRevisionId))
      .where(isNotNull(scenarios.latestRevisionId));
    const projectRules = new Map<string, RuleSpec[]>();
    let migrated = 0;
    for (const row of rows) {
      const content = row.content as unknown as Scenario;
      if (!Array.isArray(content.rules) || content.rules.length === 0) continue;
      if (!projectRules.has(row.projectId)) projectRules.set(row.projectId, await projectRuleSpecs({ projectId: row.projectId, executor: tx }));
      const moved = normaliseScenarioRules(projectRules.get(row.projectId)!, content);
      if (!moved.changed) continue;
      const { rules: _rules, rule_overrides: _overrides, ...rest } = content;
      void _rules;
      void _overrides;
      const next: Scenario = {
        ...rest,
        ...(moved.rules.length > 0 ? { rules: moved.rules } : {}),
        ...(moved.rule_overrides.length > 0 ? { rule_overrides: moved.rule_overrides } : {}),
      };
      const revision = await insertRevision(tx, { scenarioId: row.id, projectId: row.projectId, content: next, authorId: null, origin: "migrate" });
      await recordAudit(tx, {
        actor: null,
        projectId: row.projectId,
        action: "scenario.rules_migrate",
        target: row.name,
        detail: { scenarioId: row.id, from: row.number, revision: revision.number, overrides: moved.rule_overrides.map((o) => o.id), remaining: moved.rules.map((r) => r.id ?? r.kind) },
      });
      migrated += 1;
    }
    return { migrated };
  });
}
