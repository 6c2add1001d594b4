import type { Metadata } from "next";
import Link from "next/link";
import { PageHeader } from "@/components/shell/page-header";
import { Badge } from "@/components/ui/badge";
import { Card, CardBody, CardHeader, CardTitle } from "@/components/ui/card";
import { EmptyState } from "@/components/ui/empty-state";
import { Table, TBody, THead, Td, Th, Tr } from "@/components/ui/table";
import { listProjectsForUser } from "@/db/queries/projects";
import { requireUser } from "@/lib/server/auth/session";
import { CreateProjectForm } from "./create-project-form";
import { formatDate } from "@/lib/base/dates";

export const metadata: Metadata = { title: "Projects" };

export default async function ProjectsPage() {
  const user = await requireUser();
  const projects = await listProjectsForUser({ userId: user.id });
  return (
    <div className="flex flex-col gap-6">
      <PageHeader title="Projects" description="The projects you are a member of, and your role in each." />
      <div className="grid grid-cols-[minmax(0,1fr)] gap-6 lg:grid-cols-[minmax(0,1fr)_22rem]">
        <section aria-labelledby="project-list-heading" className="flex flex-col gap-3">
          <h2 id="project-list-heading" className="sr-only">
            Your projects
          </h2>
          {projects.length === 0 ? (
            <EmptyState
              title="No projects yet"
              description="Create a project to start placing parts on a chart, or ask a project owner to invite you to theirs."
            />
          ) : (
            <Table>
              <THead>
                <Tr>
                  <Th>Project</Th>
                  <Th className="whitespace-nowrap">Your role</Th>
                  <Th>Updated</Th>
                </Tr>
              </THead>
              <TBody>
                {projects.map((project) => (
                  <Tr key={project.id}>
                    <Td>
                      <Link className="text-link font-medium" href={`/projects/${project.id}`}>
                        {project.name}
                      </Link>
                      {project.description ? <p className="mt-0.5 line-clamp-1 text-xs text-muted">{project.description}</p> : null}
                    </Td>
                    <Td>
                      <Badge tone={project.role === "owner" ? "info" : "neutral"}>{project.role}</Badge>
                    </Td>
                    <Td className="figures whitespace-nowrap text-muted">{formatDate(project.updatedAt, "day")}</Td>
                  </Tr>
                ))}
              </TBody>
            </Table>
          )}
        </section>
        <Card aria-labelledby="new-project-heading">
          <CardHeader>
            <CardTitle id="new-project-heading">New project</CardTitle>
          </CardHeader>
          <CardBody>
            <CreateProjectForm />
          </CardBody>
        </Card>
      </div>
    </div>
  );
}
