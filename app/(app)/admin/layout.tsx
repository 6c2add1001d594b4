import type { ReactNode } from "react";
import { PageHeader } from "@/components/shell/page-header";
import { requireSiteAdmin } from "@/lib/server/auth/session";
import { ProjectTabs } from "../projects/[projectId]/project-tabs";

/** Site administration: only site admins get past this layout (others go to /projects). */
export default async function AdminLayout({ children }: { children: ReactNode }) {
  await requireSiteAdmin();
  return (
    <div className="flex flex-col gap-5">
      <PageHeader title="Administration" description="Accounts and sign-up for the whole site. Project content is managed by each project's owners." />
      <ProjectTabs
        tabs={[
          { href: "/admin/users", label: "Users" },
          { href: "/admin/settings", label: "Settings" },
          { href: "/admin/audit", label: "Audit log" },
        ]}
      />
      <div>{children}</div>
    </div>
  );
}
