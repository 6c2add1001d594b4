import Link from "next/link";
import { EmptyState } from "@/components/ui/empty-state";
import { buttonClassName } from "@/components/ui/button";
import { cn } from "@/components/ui/cn";
import { controlClassName } from "@/components/ui/control-class";
import { Table, TBody, THead, Td, Th, Tr } from "@/components/ui/table";
import { formatDate } from "@/lib/base/dates";
import { AUDIT_PAGE_SIZE, type AuditQuery } from "@/lib/base/validation/audit";
import { AUDIT_KINDS, describeAuditEvent } from "@/lib/domain/audit/describe";

export type AuditRow = {
  id: string;
  action: string;
  target: string | null;
  detail: Record<string, unknown> | null;
  actorEmail: string | null;
  actorName: string | null;
  createdAt: Date;
};

export type AuditLogProps = {
  /** the page's own path (filters and paging are links to it) */
  path: string;
  /** the CSV export route (same query) */
  csvPath: string;
  /** up to AUDIT_PAGE_SIZE + 1 rows: the extra one says there is an older page */
  rows: AuditRow[];
  people: { id: string; name: string }[];
  kinds: string[];
  query: AuditQuery;
  error?: string | null;
};

function queryString(query: Partial<AuditQuery>, page?: number): string {
  const params = new URLSearchParams();
  if (query.person) params.set("person", query.person);
  if (query.kind) params.set("kind", query.kind);
  if (query.from) params.set("from", query.from);
  if (query.to) params.set("to", query.to);
  if (page && page > 1) params.set("page", String(page));
  const text = params.toString();
  return text ? `?${text}` : "";
}

const controlClass = cn(controlClassName, "h-9 w-auto px-2");

/**
 * An audit log as people read it: who (by name), what (in words), when (UTC); filters by person, kind
 * and days; pages of AUDIT_PAGE_SIZE; CSV of the filtered log. A plain GET form, so it works without
 * scripts and every view has a link.
 */
export function AuditLog({ path, csvPath, rows, people, kinds, query, error }: AuditLogProps) {
  const shown = rows.slice(0, AUDIT_PAGE_SIZE);
  const hasOlder = rows.length > AUDIT_PAGE_SIZE;
  const filtered = Boolean(query.person || query.kind || query.from || query.to);
  return (
    <div className="flex flex-col gap-3">
      <form method="get" action={path} className="flex flex-wrap items-end gap-3" aria-label="Filter the audit log">
        <label className="flex flex-col gap-1 text-xs text-muted">
          Person
          <select name="person" defaultValue={query.person ?? ""} className={controlClass}>
            <option value="">Anyone</option>
            {people.map((p) => (
              <option key={p.id} value={p.id}>
                {p.name}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1 text-xs text-muted">
          Kind
          <select name="kind" defaultValue={query.kind ?? ""} className={controlClass}>
            <option value="">Everything</option>
            {kinds.map((k) => (
              <option key={k} value={k}>
                {AUDIT_KINDS[k] ?? k}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1 text-xs text-muted">
          From (UTC)
          <input type="date" name="from" defaultValue={query.from ?? ""} className={controlClass} />
        </label>
        <label className="flex flex-col gap-1 text-xs text-muted">
          To (UTC)
          <input type="date" name="to" defaultValue={query.to ?? ""} className={controlClass} />
        </label>
        <button type="submit" className={buttonClassName({ variant: "primary", size: "md" })}>
          Filter
        </button>
        {filtered ? (
          <Link href={path} className="text-link text-sm">
            Clear filters
          </Link>
        ) : null}
        <a href={`${csvPath}${queryString(query)}${queryString(query) ? "&" : "?"}format=csv`} className="text-link ml-auto text-sm" download>
          Download CSV
        </a>
      </form>
      {error ? (
        <p role="alert" className="text-sm text-fail-strong">
          {error}
        </p>
      ) : null}
      {shown.length === 0 ? (
        <EmptyState title={filtered ? "Nothing matches these filters" : "Nothing recorded yet"} description="Changes appear here as they are made." />
      ) : (
        <Table dense>
          <THead>
            <Tr>
              <Th>When (UTC)</Th>
              <Th>Who</Th>
              <Th>What</Th>
            </Tr>
          </THead>
          <TBody>
            {shown.map((event) => (
              <Tr key={event.id}>
                <Td className="figures whitespace-nowrap">{formatDate(event.createdAt, "second")}</Td>
                <Td>{event.actorName ?? event.actorEmail ?? "Portolan"}</Td>
                <Td>{describeAuditEvent(event)}</Td>
              </Tr>
            ))}
          </TBody>
        </Table>
      )}
      <nav aria-label="Audit log pages" className="flex items-center gap-4 text-sm">
        {query.page > 1 ? (
          <Link className="text-link" href={`${path}${queryString(query, query.page - 1)}`}>
            Newer
          </Link>
        ) : null}
        <span className="text-muted">
          Page {query.page}
          {shown.length > 0 ? ` · rows ${(query.page - 1) * AUDIT_PAGE_SIZE + 1}–${(query.page - 1) * AUDIT_PAGE_SIZE + shown.length}` : ""}
        </span>
        {hasOlder ? (
          <Link className="text-link" href={`${path}${queryString(query, query.page + 1)}`}>
            Older
          </Link>
        ) : null}
      </nav>
    </div>
  );
}
