import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { listParts } from "@/db/queries/parts";
import { getScenario } from "@/db/queries/scenarios";
import { ScenarioWorkspace } from "@/components/scenarios/scenario-workspace";
import { SignoffPanel } from "@/components/signoff/signoff-panel";
import type { PartView } from "@/lib/domain/parts/types";
import type { RevisionView } from "@/lib/domain/scenarios/types";
import { serialiseDates } from "@/lib/domain/serialised";
import { isAppError } from "@/lib/base/errors";
import { can } from "@/lib/base/permission-table";
import { loadProject } from "../../load-project";

export const metadata: Metadata = { title: "Scenario" };

export default async function ScenarioPage({ params }: { params: Promise<{ projectId: string; scenarioId: string }> }) {
  const { projectId, scenarioId } = await params;
  const { user, project } = await loadProject(projectId);
  let loaded: Awaited<ReturnType<typeof getScenario>>;
  try {
    loaded = await getScenario({ userId: user.id, projectId, scenarioId });
  } catch (error) {
    if (isAppError(error) && error.status === 404) notFound();
    throw error;
  }
  const parts: PartView[] = serialiseDates(await listParts({ userId: user.id, projectId, withText: true }));
  const { scenario, revision } = loaded;
  return (
    <>
      <ScenarioWorkspace
        projectId={project.id}
        scenario={{ id: scenario.id, projectId, name: scenario.name, latestRevisionId: scenario.latestRevisionId, latestRevisionNumber: scenario.latestRevisionNumber }}
        revision={serialiseDates(revision) satisfies RevisionView}
        parts={parts}
        readOnly={!can(project.role, "scenario.edit")}
        role={project.role}
      />
      <SignoffPanel projectId={project.id} scenarioId={scenario.id} userId={user.id} role={project.role} />
    </>
  );
}
