import type { Metadata } from "next";
import { Badge } from "@/components/ui/badge";
import { Card, CardBody, CardDescription, CardHeader, CardTitle } from "@/components/ui/card";
import { Table, TBody, THead, Td, Th, Tr } from "@/components/ui/table";
import { listMembers, listPendingInvitations } from "@/db/queries/members";
import { can } from "@/lib/base/permission-table";
import { loadProject } from "../load-project";
import { InviteForm } from "./invite-form";
import { MemberActions, RevokeInvitationButton } from "./member-actions";
import { formatDate } from "@/lib/base/dates";

export const metadata: Metadata = { title: "Members" };

export default async function MembersPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { user, project } = await loadProject(projectId);
  const manage = can(project.role, "members.manage");
  const [members, invitations] = await Promise.all([
    listMembers({ actor: user, projectId }),
    manage ? listPendingInvitations({ actor: user, projectId }) : Promise.resolve([]),
  ]);
  // the last owner cannot leave or be removed (the server refuses it too): the action is not offered
  const ownerCount = members.filter((m) => m.role === "owner").length;
  return (
    <div className="grid grid-cols-[minmax(0,1fr)] gap-6 lg:grid-cols-[minmax(0,1fr)_22rem]">
      <div className="flex flex-col gap-6">
        <section aria-labelledby="members-heading" className="flex flex-col gap-3">
          <h2 id="members-heading" className="text-lg font-semibold">
            Members
          </h2>
          <Table>
            <THead>
              <Tr>
                <Th>Name</Th>
                <Th>Email</Th>
                <Th>Role</Th>
                <Th>Joined</Th>
                {manage ? <Th>Change</Th> : null}
              </Tr>
            </THead>
            <TBody>
              {members.map((member) => (
                <Tr key={member.userId}>
                  <Td className="font-medium">
                    {member.name}
                    {member.userId === user.id ? <span className="ml-1.5 text-xs text-muted">(you)</span> : null}
                  </Td>
                  <Td className="text-muted">{member.email}</Td>
                  <Td>
                    <Badge tone={member.role === "owner" ? "info" : "neutral"}>{member.role}</Badge>
                  </Td>
                  <Td className="figures whitespace-nowrap text-muted">{formatDate(member.joinedAt, "day")}</Td>
                  {manage ? (
                    <Td>
                      <MemberActions projectId={projectId} userId={member.userId} name={member.name} role={member.role} isSelf={member.userId === user.id} lastOwner={member.role === "owner" && ownerCount === 1} />
                    </Td>
                  ) : null}
                </Tr>
              ))}
            </TBody>
          </Table>
        </section>
        {manage ? (
          <section aria-labelledby="invitations-heading" className="flex flex-col gap-3">
            <h2 id="invitations-heading" className="text-lg font-semibold">
              Open invitations
            </h2>
            {invitations.length === 0 ? (
              <p className="text-sm text-muted">No invitations waiting.</p>
            ) : (
              <Table>
                <THead>
                  <Tr>
                    <Th>Email</Th>
                    <Th>Role</Th>
                    <Th>Expires</Th>
                    <Th>
                      <span className="sr-only">Actions</span>
                    </Th>
                  </Tr>
                </THead>
                <TBody>
                  {invitations.map((invitation) => (
                    <Tr key={invitation.id}>
                      <Td>{invitation.email}</Td>
                      <Td>{invitation.role}</Td>
                      <Td className="figures whitespace-nowrap text-muted">{formatDate(invitation.expiresAt, "day")}</Td>
                      <Td>
                        <RevokeInvitationButton projectId={projectId} invitationId={invitation.id} email={invitation.email} />
                      </Td>
                    </Tr>
                  ))}
                </TBody>
              </Table>
            )}
          </section>
        ) : null}
      </div>
      {manage ? (
        <Card aria-labelledby="invite-heading">
          <CardHeader>
            <CardTitle id="invite-heading">Invite someone</CardTitle>
            <CardDescription>They get an e-mail with a link that works once and expires in 7 days.</CardDescription>
          </CardHeader>
          <CardBody>
            <InviteForm projectId={projectId} />
          </CardBody>
        </Card>
      ) : (
        <p className="text-sm text-muted">Only owners can invite people and change roles.</p>
      )}
    </div>
  );
}
