import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { EmptyState } from "@/components/ui/empty-state";
import { Table, TBody, THead, Td, Th, Tr } from "@/components/ui/table";
import { listAuditEvents } from "@/db/queries/audit";
import { can } from "@/lib/base/permission-table";
import { loadProject } from "../load-project";
import { formatDate } from "@/lib/base/dates";

export const metadata: Metadata = { title: "Audit log" };

function describeDetail(detail: Record<string, unknown> | null): string {
  if (!detail) return "";
  return Object.entries(detail)
    .map(([key, value]) => `${key}: ${typeof value === "string" ? value : JSON.stringify(value)}`)
    .join(", ");
}

export default async function AuditPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { user, project } = await loadProject(projectId);
  // The tab is hidden from non-owners; the server refuses them too.
  if (!can(project.role, "audit.read")) notFound();
  const events = await listAuditEvents({ actor: user, projectId });
  if (events.length === 0) return <EmptyState title="Nothing recorded yet" description="Changes to the project and its members appear here." />;
  return (
    <section aria-labelledby="audit-heading" className="flex flex-col gap-3">
      <h2 id="audit-heading" className="text-lg font-semibold">
        Audit log
      </h2>
      <p className="text-sm text-muted">Who did what in this project, newest first (times in UTC).</p>
      <Table dense>
        <THead>
          <Tr>
            <Th>When</Th>
            <Th>Who</Th>
            <Th>Action</Th>
            <Th>Target</Th>
            <Th>Detail</Th>
          </Tr>
        </THead>
        <TBody>
          {events.map((event) => (
            <Tr key={event.id}>
              <Td className="figures whitespace-nowrap">{formatDate(event.createdAt, "second")}</Td>
              <Td>{event.actorName ?? event.actorEmail ?? "Portolan"}</Td>
              <Td className="font-mono text-xs">{event.action}</Td>
              <Td>{event.target ?? ""}</Td>
              <Td className="text-xs text-muted">{describeDetail(event.detail)}</Td>
            </Tr>
          ))}
        </TBody>
      </Table>
    </section>
  );
}
