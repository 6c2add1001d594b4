import type { Metadata } from "next";
import { AuditLog } from "@/components/audit/audit-log";
import { listAuditActors, listSiteAuditEvents } from "@/db/queries/audit";
import { requireSiteAdmin } from "@/lib/server/auth/session";
import { auditFilterOf, auditQuerySchema, parseAuditQuery } from "@/lib/base/validation/audit";
import { SITE_AUDIT_KINDS } from "@/lib/domain/audit/describe";

export const metadata: Metadata = { title: "Admin audit log" };

/** Every admin and account action (outside projects), for site admins. */
export default async function AdminAuditPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  await requireSiteAdmin();
  const parsed = parseAuditQuery(await searchParams);
  const query = parsed.success ? parsed.data : auditQuerySchema.parse({});
  const [rows, people] = await Promise.all([listSiteAuditEvents(auditFilterOf(query)), listAuditActors({ projectId: null })]);
  return (
    <section aria-labelledby="admin-audit-heading" className="flex flex-col gap-3">
      <h2 id="admin-audit-heading" className="text-lg font-semibold">
        Admin audit log
      </h2>
      <p className="text-sm text-muted">Accounts, site admin changes, deactivations and site settings, newest first (times in UTC).</p>
      <AuditLog
        path="/admin/audit"
        csvPath="/api/admin/audit"
        rows={rows}
        people={people}
        kinds={SITE_AUDIT_KINDS}
        query={query}
        error={parsed.success ? null : `Filters ignored: ${parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ")}`}
      />
    </section>
  );
}
