import type { Metadata } from "next";
import { listRules } from "@/db/queries/rules";
import { RulesEditor, type RuleItem } from "@/components/rules/rules-editor";
import { serialiseDates } from "@/lib/domain/serialised";
import { can } from "@/lib/base/permission-table";
import { loadProject } from "../load-project";

export const metadata: Metadata = { title: "Rules" };

export default async function RulesPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { user, project } = await loadProject(projectId);
  const rules: RuleItem[] = serialiseDates(await listRules({ userId: user.id, projectId }));
  return (
    <section aria-labelledby="rules-heading" className="flex flex-col gap-4">
      <div>
        <h2 id="rules-heading" className="text-lg font-semibold">
          Rules
        </h2>
        <p className="max-w-prose text-sm text-muted">
          Requirements every scenario of this project is held to. “Run all rules” on a scenario evaluates these together with the scenario’s own rules: a scenario rule with the same
          name replaces the project rule, an identical one is not repeated, and rules naming a system port the scenario lacks are listed as not run.
        </p>
      </div>
      <RulesEditor projectId={project.id} initial={rules} canEdit={can(project.role, "rule.edit")} />
    </section>
  );
}
