import type { ReactNode } from "react";
import { PageHeader } from "@/components/shell/page-header";
import { Badge } from "@/components/ui/badge";
import { can } from "@/lib/base/permission-table";
import { loadProject } from "./load-project";
import { ProjectTabs, type ProjectTab } from "./project-tabs";

export default async function ProjectLayout({ children, params }: { children: ReactNode; params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { project } = await loadProject(projectId);
  const base = `/projects/${project.id}`;
  const tabs: ProjectTab[] = [
    { href: base, label: "Overview", exact: true },
    { href: `${base}/scenarios`, label: "Scenarios" },
    { href: `${base}/parts`, label: "Parts" },
    { href: `${base}/rules`, label: "Rules" },
    { href: `${base}/compare`, label: "Compare" },
    { href: `${base}/members`, label: "Members" },
    { href: `${base}/signoffs`, label: "Sign-offs" },
  ];
  if (can(project.role, "audit.read")) tabs.push({ href: `${base}/audit`, label: "Audit log" });
  return (
    // flex-1 and min-h-0 let a page that fills the viewport (the scenario workspace) take the height left
    <div data-project-frame className="flex min-h-0 flex-1 flex-col gap-5">
      <PageHeader
        breadcrumbs={[{ label: "Projects", href: "/projects" }, { label: project.name }]}
        title={project.name}
        actions={<Badge tone={project.role === "owner" ? "info" : "neutral"}>Your role: {project.role}</Badge>}
      />
      <ProjectTabs tabs={tabs} />
      <div className="flex min-h-0 flex-1 flex-col">{children}</div>
    </div>
  );
}
