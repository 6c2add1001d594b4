import "server-only";
import { AppError } from "@/lib/base/errors";
import { auditFilterOf, parseAuditQuery, AUDIT_PAGE_SIZE, type AuditQuery } from "@/lib/base/validation/audit";
import { auditCsv } from "@/lib/domain/audit/describe";
import type { AuditEntry, AuditFilter } from "@/db/queries/audit";
import { json } from "@/lib/server/api";

/** Rows in one CSV export at most (the filtered log, all pages). */
const CSV_ROW_LIMIT = 50_000;

/**
 * An audit route's answer: the JSON page (with `hasOlder`) or the whole filtered log as CSV. Bad query
 * values are a 400 naming the field.
 */
export async function answerAuditQuery(url: string, list: (filter: AuditFilter) => Promise<AuditEntry[]>, fileName: string): Promise<Response> {
  const parsed = parseAuditQuery(new URL(url).searchParams);
  if (!parsed.success) {
    const fields = Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0] ?? "query"), i.message]));
    throw new AppError("validation_failed", 400, "Some filters need attention.", fields);
  }
  const query: AuditQuery = parsed.data;
  if (query.format === "csv") {
    const rows = await list({ ...auditFilterOf(query), limit: CSV_ROW_LIMIT, offset: 0 });
    return new Response(auditCsv(rows), {
      headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": `attachment; filename="${fileName}"`, "cache-control": "no-store" },
    });
  }
  const rows = await list(auditFilterOf(query));
  return json({ events: rows.slice(0, AUDIT_PAGE_SIZE), page: query.page, hasOlder: rows.length > AUDIT_PAGE_SIZE });
}
