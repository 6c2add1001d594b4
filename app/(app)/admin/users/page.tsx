import type { Metadata } from "next";
import { Badge } from "@/components/ui/badge";
import { Table, TBody, THead, Td, Th, Tr } from "@/components/ui/table";
import { listUsers } from "@/db/queries/users";
import { requireSiteAdmin } from "@/lib/server/auth/session";
import { AccountActiveToggle, SiteAdminToggle } from "./site-admin-toggle";
import { listProjectsForUser } from "@/db/queries/projects";
import { formatDate } from "@/lib/base/dates";

export const metadata: Metadata = { title: "Users" };

export default async function AdminUsersPage() {
  const admin = await requireSiteAdmin();
  const users = await listUsers();
  // a person's projects, so an admin sees what deactivating them would leave without its member
  const projectsOf = new Map(await Promise.all(users.map(async (u) => [u.id, await listProjectsForUser({ userId: u.id })] as const)));
  return (
    <Table>
      <THead>
        <Tr>
          <Th>Name</Th>
          <Th>Email</Th>
          <Th>Since</Th>
          <Th>Projects</Th>
          <Th>Status</Th>
          <Th>Site admin</Th>
        </Tr>
      </THead>
      <TBody>
        {users.map((user) => (
          <Tr key={user.id}>
            <Td className="font-medium">
              {user.name}
              {user.id === admin.id ? <span className="ml-1.5 text-xs text-muted">(you)</span> : null}
            </Td>
            <Td className="text-muted">{user.email}</Td>
            <Td className="figures whitespace-nowrap text-muted">{formatDate(user.createdAt, "day")}</Td>
            <Td className="text-sm">
              {(projectsOf.get(user.id) ?? []).length === 0 ? (
                <span className="text-muted">none</span>
              ) : (
                <ul aria-label={`Projects of ${user.name}`}>
                  {(projectsOf.get(user.id) ?? []).map((p) => (
                    <li key={p.id}>
                      {p.name} <span className="text-muted">({p.role})</span>
                    </li>
                  ))}
                </ul>
              )}
            </Td>
            <Td>
              <div className="flex items-center gap-2">
                {user.deactivatedAt ? <Badge tone="warn">deactivated</Badge> : <span className="text-sm text-muted">active</span>}
                {user.id === admin.id ? null : <AccountActiveToggle userId={user.id} name={user.name} active={!user.deactivatedAt} />}
              </div>
            </Td>
            <Td>
              <div className="flex items-center gap-2">
                {user.isSiteAdmin ? <Badge tone="info">admin</Badge> : null}
                <SiteAdminToggle userId={user.id} name={user.name} isSiteAdmin={user.isSiteAdmin} />
              </div>
            </Td>
          </Tr>
        ))}
      </TBody>
    </Table>
  );
}
