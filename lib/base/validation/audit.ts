import { z } from "zod";

/** Rows per page of an audit log (the log pages past this, it no longer stops here). */
export const AUDIT_PAGE_SIZE = 200;

const day = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, { error: "Write the day as YYYY-MM-DD." })
  .refine((v) => !Number.isNaN(Date.parse(`${v}T00:00:00Z`)), { error: "Not a calendar day." });

/** The query of an audit log page or export: person (user id), kind (action prefix), from/to days (UTC, inclusive), page. */
export const auditQuerySchema = z.object({
  person: z.string().min(1).max(100).optional(),
  kind: z
    .string()
    .regex(/^[a-z_]{1,30}$/, { error: "Not a kind of event." })
    .optional(),
  from: day.optional(),
  to: day.optional(),
  page: z.coerce.number({ error: "page must be a whole number from 1." }).int().min(1).max(100_000).default(1),
  format: z.enum(["json", "csv"], { error: "format must be json or csv." }).default("json"),
});

export type AuditQuery = z.infer<typeof auditQuerySchema>;

/** Query string values (blank means unset) → an AuditQuery, or the field errors. */
export function parseAuditQuery(params: Record<string, string | string[] | undefined> | URLSearchParams) {
  const raw: Record<string, string> = {};
  const entries = params instanceof URLSearchParams ? [...params.entries()] : Object.entries(params);
  for (const [k, v] of entries) {
    const value = Array.isArray(v) ? v[0] : v;
    if (typeof value === "string" && value.trim() !== "") raw[k] = value.trim();
  }
  return auditQuerySchema.safeParse(raw);
}

/** The database filter of a query: days are whole UTC days, `to` included. */
export function auditFilterOf(query: AuditQuery, pageSize = AUDIT_PAGE_SIZE) {
  return {
    actorId: query.person,
    kind: query.kind,
    from: query.from ? new Date(`${query.from}T00:00:00Z`) : undefined,
    to: query.to ? new Date(Date.parse(`${query.to}T00:00:00Z`) + 86_400_000) : undefined,
    limit: pageSize + 1, // one more than shown: tells whether there is an older page
    offset: (query.page - 1) * pageSize,
  };
}
