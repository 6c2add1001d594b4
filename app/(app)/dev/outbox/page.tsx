import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { PageHeader } from "@/components/shell/page-header";
import { EmptyState } from "@/components/ui/empty-state";
import { Table, TBody, THead, Td, Th, Tr } from "@/components/ui/table";
import { listOutboxMessages } from "@/db/queries/outbox";
import { requireSiteAdmin } from "@/lib/server/auth/session";
import { getEnv } from "@/lib/base/env";
import { isOutboxAvailable } from "@/lib/server/outbox";
import { formatDate } from "@/lib/base/dates";

export const metadata: Metadata = { title: "Outbox" };

/** Development outbox: what the local fake SMTP server received. Site admins; off in production unless OUTBOX_ENABLED. */
export default async function OutboxPage() {
  if (!isOutboxAvailable()) notFound();
  await requireSiteAdmin();
  const messages = await listOutboxMessages();
  const env = getEnv();
  return (
    <div className="flex flex-col gap-5">
      <PageHeader
        title="Outbox"
        description={
          env.fakeSmtp
            ? `Messages received by the local SMTP server on port ${env.fakeSmtpPort}, newest first. Nothing here left this machine.`
            : "Messages stored by a local SMTP server writing to this database, newest first."
        }
      />
      {messages.length === 0 ? (
        <EmptyState title="No messages yet" description="Invitations and password resets appear here when they are sent." />
      ) : (
        <Table>
          <THead>
            <Tr>
              <Th>Received (UTC)</Th>
              <Th>To</Th>
              <Th>Subject</Th>
            </Tr>
          </THead>
          <TBody>
            {messages.map((message) => (
              <Tr key={message.id}>
                <Td className="figures whitespace-nowrap">{formatDate(message.receivedAt, "second")}</Td>
                <Td>{message.toAddress}</Td>
                <Td>
                  <Link className="text-link" href={`/dev/outbox/${message.id}`}>
                    {message.subject || "(no subject)"}
                  </Link>
                </Td>
              </Tr>
            ))}
          </TBody>
        </Table>
      )}
    </div>
  );
}
