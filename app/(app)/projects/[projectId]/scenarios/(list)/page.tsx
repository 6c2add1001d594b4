import type { Metadata } from "next";
import { listScenarios } from "@/db/queries/scenarios";
import { ScenarioList } from "@/components/scenarios/scenario-list";
import type { ScenarioListItem } from "@/lib/domain/scenarios/types";
import { serialiseDates } from "@/lib/domain/serialised";
import { can } from "@/lib/base/permission-table";
import { loadProject } from "../../load-project";

export const metadata: Metadata = { title: "Scenarios" };

export default async function ScenariosPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { user, project } = await loadProject(projectId);
  const scenarios: ScenarioListItem[] = serialiseDates(await listScenarios({ userId: user.id, projectId }));
  return (
    <section aria-labelledby="scenarios-heading" className="flex flex-col gap-4">
      <div>
        <h2 id="scenarios-heading" className="text-lg font-semibold">
          Scenarios
        </h2>
        <p className="max-w-prose text-sm text-muted">
          Each scenario is a chart of blocks and links with its switch settings and frequency plan. Every save is kept as a revision.
        </p>
      </div>
      <ScenarioList projectId={project.id} initial={scenarios} canEdit={can(project.role, "scenario.create")} />
    </section>
  );
}
