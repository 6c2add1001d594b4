import type { Metadata } from "next";
import { Badge } from "@/components/ui/badge";
import { Table, TBody, THead, Td, Th, Tr } from "@/components/ui/table";
import { listUsers } from "@/db/queries/users";
import { requireSiteAdmin } from "@/lib/server/auth/session";
import { SiteAdminToggle } from "./site-admin-toggle";
import { formatDate } from "@/lib/base/dates";

export const metadata: Metadata = { title: "Users" };

export default async function AdminUsersPage() {
  const admin = await requireSiteAdmin();
  const users = await listUsers();
  return (
    <Table>
      <THead>
        <Tr>
          <Th>Name</Th>
          <Th>Email</Th>
          <Th>Since</Th>
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
