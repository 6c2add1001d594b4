import type { Metadata } from "next";
import { listParts, partFilesOf } from "@/db/queries/parts";
import { getDraft } from "@/db/queries/drafts";
import { ScenarioWorkspace } from "@/components/scenarios/scenario-workspace";
import { SignoffPanel } from "@/components/signoff/signoff-panel";
import type { PartView } from "@/lib/domain/parts/types";
import type { RevisionView } from "@/lib/domain/scenarios/types";
import { serialiseDates } from "@/lib/domain/serialised";
import { can } from "@/lib/base/permission-table";
import { loadScenarioPage } from "./load-scenario";

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
  const canEdit = can(project.role, "scenario.edit");
  // the person's own working draft, reopened on any device (only those who may edit have one)
  const stored = canEdit ? await getDraft({ userId: user.id, projectId, scenarioId: scenario.id }) : null;
  // a draft holding exactly the latest revision has nothing to offer
  const draft = stored && JSON.stringify(stored.content) !== JSON.stringify(revision.content) ? stored : null;
  const placed = draft ? [...new Set([...partFilesOf(revision.content), ...partFilesOf(draft.content)])] : partFilesOf(revision.content);
  const parts: PartView[] = serialiseDates(await listParts({ userId: user.id, projectId, withText: placed }));
  return (
    <ScenarioWorkspace
      projectId={project.id}
      scenario={{ id: scenario.id, projectId, name: scenario.name, latestRevisionId: scenario.latestRevisionId, latestRevisionNumber: scenario.latestRevisionNumber }}
      revision={serialiseDates(revision) satisfies RevisionView}
      draft={draft ? { ...draft, updatedAt: draft.updatedAt.toISOString() } : null}
      parts={parts}
      readOnly={!canEdit}
      role={project.role}
      signoff={<SignoffPanel projectId={project.id} scenarioId={scenario.id} userId={user.id} role={project.role} />}
    />
  );
}
