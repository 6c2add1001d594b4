import type { Metadata } from "next";
import { Card, CardBody, CardDescription, CardHeader, CardTitle } from "@/components/ui/card";
import { can } from "@/lib/base/permission-table";
import { ProjectVerdicts, type ScenarioVerdictItem } from "@/components/checks/project-verdicts";
import { serialiseDates } from "@/lib/domain/serialised";
import { projectVerdicts } from "@/lib/server/verdicts";
import { loadProject } from "./load-project";
import { DeleteProjectButton } from "./delete-project-button";
import { ProjectSettingsForm } from "./project-settings-form";
import { formatDate } from "@/lib/base/dates";

export async function generateMetadata({ params }: { params: Promise<{ projectId: string }> }): Promise<Metadata> {
  const { project } = await loadProject((await params).projectId);
  return { title: project.name };
}

export default async function ProjectOverviewPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { user, project } = await loadProject(projectId);
  const verdicts = serialiseDates(await projectVerdicts({ userId: user.id, projectId })) as unknown as ScenarioVerdictItem[];
  const canRename = can(project.role, "project.rename");
  const canDelete = can(project.role, "project.delete");
  return (
    <div className="grid grid-cols-[minmax(0,1fr)] gap-6 lg:grid-cols-[minmax(0,1fr)_24rem]">
      <section aria-labelledby="about-heading" className="flex flex-col gap-3">
        <h2 id="about-heading" className="text-lg font-semibold">
          About
        </h2>
        {project.description ? <p className="max-w-prose whitespace-pre-line text-sm leading-relaxed">{project.description}</p> : <p className="text-sm text-muted">No description.</p>}
        <dl className="grid max-w-md grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
          <dt className="text-muted">Created</dt>
          <dd className="figures">{formatDate(project.createdAt)}</dd>
          <dt className="text-muted">Last changed</dt>
          <dd className="figures">{formatDate(project.updatedAt)}</dd>
        </dl>
        <h2 id="verdicts-heading" className="mt-2 text-lg font-semibold">
          Verdicts
        </h2>
        <p className="max-w-prose text-sm text-muted">Each scenario&apos;s latest revision judged by all its rules, current for today&apos;s rules and engine or marked stale.</p>
        <ProjectVerdicts projectId={project.id} rows={verdicts} canRun={can(project.role, "check.run")} />
      </section>
      {canRename || canDelete ? (
        <div className="flex flex-col gap-6">
          {canRename ? (
            <Card aria-labelledby="settings-heading">
              <CardHeader>
                <CardTitle id="settings-heading">Project settings</CardTitle>
              </CardHeader>
              <CardBody>
                <ProjectSettingsForm projectId={project.id} name={project.name} description={project.description} />
              </CardBody>
            </Card>
          ) : null}
          {canDelete ? (
            <Card aria-labelledby="danger-heading">
              <CardHeader>
                <CardTitle id="danger-heading">Delete project</CardTitle>
                <CardDescription>Removes the project with all its scenarios, parts, rules and members. This cannot be undone.</CardDescription>
              </CardHeader>
              <CardBody>
                <DeleteProjectButton projectId={project.id} projectName={project.name} />
              </CardBody>
            </Card>
          ) : null}
        </div>
      ) : null}
    </div>
  );
}
