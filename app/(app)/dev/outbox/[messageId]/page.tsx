import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { PageHeader } from "@/components/shell/page-header";
import { getOutboxMessage } from "@/db/queries/outbox";
import { requireSiteAdmin } from "@/lib/server/auth/session";
import { isOutboxAvailable } from "@/lib/server/outbox";
import { formatDate } from "@/lib/base/dates";

export const metadata: Metadata = { title: "Message" };

/** Links in the text are made clickable; everything else is shown as text. */
function linkify(text: string) {
  const parts = text.split(/(https?:\/\/[^\s<>"]+)/g);
  return parts.map((part, index) =>
    /^https?:\/\//.test(part) ? (
      <a key={index} className="text-link break-all" href={part}>
        {part}
      </a>
    ) : (
      <span key={index}>{part}</span>
    ),
  );
}

export default async function OutboxMessagePage({ params }: { params: Promise<{ messageId: string }> }) {
  if (!isOutboxAvailable()) notFound();
  await requireSiteAdmin();
  const { messageId } = await params;
  const message = await getOutboxMessage({ messageId });
  if (!message) notFound();
  return (
    <div className="flex flex-col gap-5">
      <PageHeader breadcrumbs={[{ label: "Outbox", href: "/dev/outbox" }, { label: message.subject || "(no subject)" }]} title={message.subject || "(no subject)"} />
      <dl className="grid max-w-2xl grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
        <dt className="text-muted">From</dt>
        <dd>{message.fromAddress}</dd>
        <dt className="text-muted">To</dt>
        <dd>{message.toAddress}</dd>
        <dt className="text-muted">Received</dt>
        <dd className="figures">{formatDate(message.receivedAt, "second")}</dd>
      </dl>
      <section aria-labelledby="text-heading" className="flex flex-col gap-2">
        <h2 id="text-heading" className="text-base font-semibold">
          Text
        </h2>
        <div className="max-w-3xl rounded-card border border-rule bg-surface p-4 text-sm whitespace-pre-wrap">{message.text ? linkify(message.text) : "(no text part)"}</div>
      </section>
      {message.html ? (
        <section aria-labelledby="html-heading" className="flex flex-col gap-2">
          <h2 id="html-heading" className="text-base font-semibold">
            HTML
          </h2>
          {/* sandbox without scripts: the message's HTML cannot run code or reach this page. */}
          <iframe title="HTML part of the message" sandbox="" srcDoc={message.html} className="h-72 w-full max-w-3xl rounded-card border border-rule bg-white" />
        </section>
      ) : null}
      <details className="max-w-3xl">
        <summary className="cursor-pointer text-sm font-medium">Raw message</summary>
        <pre className="mt-2 overflow-x-auto rounded-card border border-rule bg-sunken p-3 font-mono text-xs">{message.raw}</pre>
      </details>
    </div>
  );
}
