import type { Metadata } from "next";
import { listRules } from "@/db/queries/rules";
import { RulesEditor, type RuleItem } from "@/components/rules/rules-editor";
import { serialiseDates } from "@/lib/domain/serialised";
import { can } from "@/lib/base/permission-table";
import { projectRuleUsage } from "@/lib/server/verdicts";
import { loadProject } from "../load-project";

export const metadata: Metadata = { title: "Rules" };

export default async function RulesPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { user, project } = await loadProject(projectId);
  const rules: RuleItem[] = serialiseDates(await listRules({ userId: user.id, projectId }));
  const usage = await projectRuleUsage({ userId: user.id, projectId });
  return (
    <section aria-labelledby="rules-heading" className="flex flex-col gap-4">
      <div>
        <h2 id="rules-heading" className="text-lg font-semibold">
          Rules
        </h2>
        <p className="max-w-prose text-sm text-muted">
          Requirements every scenario of this project is held to. A scenario inherits them all; on its Rules panel it may override one (both limits are shown, with who changed
          it), opt out of one with a reason, or add its own. Rules naming a system port a scenario lacks are listed there as not run. Changing a rule here marks the verdicts
          judged by the old rule as stale.
        </p>
      </div>
      <RulesEditor projectId={project.id} initial={rules} canEdit={can(project.role, "rule.edit")} usage={usage} />
    </section>
  );
}
