import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { cache } from "react";
import { listParts, partFilesOf } from "@/db/queries/parts";
import { loadScenario } from "@/db/queries/scenarios";
import { ScenarioWorkspace } from "@/components/scenarios/scenario-workspace";
import { SignoffPanel } from "@/components/signoff/signoff-panel";
import type { PartView } from "@/lib/domain/parts/types";
import type { RevisionView } from "@/lib/domain/scenarios/types";
import { serialiseDates } from "@/lib/domain/serialised";
import { isAppError } from "@/lib/base/errors";
import { can } from "@/lib/base/permission-table";
import { loadProject } from "../../load-project";

/**
 * The scenario with its latest revision, loaded once per request for the title and the page. The
 * project layout has resolved the viewer's membership (loadProject); its role is the access.
 */
const loadScenarioPage = cache(async (projectId: string, scenarioId: string) => {
  const { user, project } = await loadProject(projectId);
  try {
    return { user, project, ...(await loadScenario({ userId: user.id, projectId, role: project.role }, { scenarioId })) };
  } catch (error) {
    if (isAppError(error) && error.status === 404) notFound();
    throw error;
  }
});

export async function generateMetadata({ params }: { params: Promise<{ projectId: string; scenarioId: string }> }): Promise<Metadata> {
  const { projectId, scenarioId } = await params;
  const { project, scenario } = await loadScenarioPage(projectId, scenarioId);
  return { title: `${scenario.name} · ${project.name}` };
}

export default async function ScenarioPage({ params }: { params: Promise<{ projectId: string; scenarioId: string }> }) {
  const { projectId, scenarioId } = await params;
  const { user, project, scenario, revision } = await loadScenarioPage(projectId, scenarioId);
  // only the texts of the parts this revision places travel with the page; the workspace fetches others
  // when one is placed
  const parts: PartView[] = serialiseDates(await listParts({ userId: user.id, projectId, withText: partFilesOf(revision.content) }));
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
