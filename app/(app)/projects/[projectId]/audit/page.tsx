import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { AuditLog } from "@/components/audit/audit-log";
import { listAuditActors, listAuditEvents } from "@/db/queries/audit";
import { can } from "@/lib/base/permission-table";
import { auditFilterOf, auditQuerySchema, parseAuditQuery } from "@/lib/base/validation/audit";
import { PROJECT_AUDIT_KINDS } from "@/lib/domain/audit/describe";
import { loadProject } from "../load-project";

export const metadata: Metadata = { title: "Audit log" };

export default async function AuditPage({ params, searchParams }: { params: Promise<{ projectId: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const { projectId } = await params;
  const { user, project } = await loadProject(projectId);
  // The tab is hidden from non-owners; the server refuses them too.
  if (!can(project.role, "audit.read")) notFound();
  const parsed = parseAuditQuery(await searchParams);
  const query = parsed.success ? parsed.data : auditQuerySchema.parse({});
  const [rows, people] = await Promise.all([listAuditEvents({ actor: user, projectId, ...auditFilterOf(query) }), listAuditActors({ projectId })]);
  return (
    <section aria-labelledby="audit-heading" className="flex flex-col gap-3">
      <h2 id="audit-heading" className="text-lg font-semibold">
        Audit log
      </h2>
      <p className="text-sm text-muted">Who did what in this project, newest first (times in UTC).</p>
      <AuditLog
        path={`/projects/${projectId}/audit`}
        csvPath={`/api/projects/${projectId}/audit`}
        rows={rows}
        people={people}
        kinds={PROJECT_AUDIT_KINDS}
        query={query}
        error={parsed.success ? null : `Filters ignored: ${parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ")}`}
      />
    </section>
  );
}
