/**
 * The one date formatter of the interface (pages, client components, e-mails alike).
 *
 * Time-zone rule: every date and time Portolan shows is written in UTC, en-GB style, and a time says
 * so ("4 Dec 2026, 03:10 UTC"; a day alone is "4 Dec 2026"), whatever the zone of the server or of the
 * browser. Server-rendered and
 * hydrated text then agree, and two people in different zones quoting a sign-off or an audit entry
 * quote the same time. Stored dates are instants (drizzle timestamps; ISO strings with "Z" on the wire).
 */

/** How much of the instant to show: the day, the minute, or the second (audit log, outbox). */
export type DatePrecision = "day" | "minute" | "second";

const FORMATS: Record<DatePrecision, Intl.DateTimeFormat> = {
  day: new Intl.DateTimeFormat("en-GB", { dateStyle: "medium", timeZone: "UTC" }),
  minute: new Intl.DateTimeFormat("en-GB", { dateStyle: "medium", timeStyle: "short", timeZone: "UTC" }),
  second: new Intl.DateTimeFormat("en-GB", { dateStyle: "medium", timeStyle: "medium", timeZone: "UTC" }),
};

/**
 * An instant as people read it, in UTC (see the rule above).
 * @example formatDate(new Date("2026-12-04T03:10:00Z")) // "4 Dec 2026, 03:10 UTC"
 */
export function formatDate(value: Date | string | number, precision: DatePrecision = "minute"): string {
  const text = FORMATS[precision].format(value instanceof Date ? value : new Date(value));
  return precision === "day" ? text : `${text} UTC`;
}
