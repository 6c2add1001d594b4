"use client";

import type { DriveResult } from "@/engine/checks";
import { Alert, VerdictBadge } from "@/components/ui";
import { SortableTable } from "@/components/ui/sortable-table";
import { orderDriveRows } from "@/lib/domain/checks/drive-order";
import { fmt, fmtHz, fmtMargin } from "./format";

/** Above this, an unrated block is flagged (common practice: small connectorised parts are rated near 30 dBm). */
const UNRATED_WARN_DBM = 30;

/** Incident power at every block against its rating, with the cautions every drive result carries. */
export function DriveView({ result }: { result: DriveResult }) {
  const rows = orderDriveRows(result.blocks);
  const rank = new Map(rows.map((b, i) => [b.block, i]));
  // Unrated blocks get no verdict, so a hot one would pass silently; say so beside the table.
  const hotUnrated = rows.filter((b) => b.ratingDbm === null && b.worstDbm > UNRATED_WARN_DBM);
  return (
    <div className="flex flex-col gap-3">
      {hotUnrated.length > 0 ? (
        <Alert tone="warn" title="High level into blocks with no rating">
          <span data-testid="drive-unrated-warning">{hotUnrated.map((b) => `${b.block} ${fmt(b.worstDbm, 1)} dBm`).join(", ")}</span>: above {UNRATED_WARN_DBM} dBm and no power rating to judge it against.
        </Alert>
      ) : null}
      <Alert tone="warn" title="Cautions">
        <ul className="list-disc pl-4">
          {result.cautions.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
      </Alert>
      <p className="text-sm">
        Sources: {result.sources.map((s) => `${s.port} ${fmt(s.dbm, 1)} dBm`).join(", ")}; verdict on the {result.basis} sum over {result.points} plan points.
      </p>
      <SortableTable
        caption="Drive levels per block"
        rows={rows}
        rowKey={(b) => b.block}
        initialSort={{ id: "verdict", desc: false }}
        columns={[
          { id: "verdict", header: "Verdict", value: (b) => rank.get(b.block) ?? 0, numeric: true, cell: (b) => (b.verdict ? <VerdictBadge verdict={b.verdict} /> : <span className="text-muted">no rating</span>) },
          { id: "block", header: "Block", value: (b) => b.block, cell: (b) => <span className="font-mono">{b.block}</span> },
          { id: "worst", header: "Most incident", numeric: true, value: (b) => b.worstDbm, cell: (b) => `${fmt(b.worstDbm)} dBm (port ${b.worstPort})` },
          { id: "at", header: "At", numeric: true, value: (b) => b.worstHz, cell: (b) => fmtHz(b.worstHz) },
          { id: "rating", header: "Rating", numeric: true, value: (b) => b.ratingDbm, cell: (b) => (b.ratingDbm === null ? "—" : `${fmt(b.ratingDbm, 1)} dBm`) },
          { id: "margin", header: "Margin", numeric: true, value: (b) => b.margin ?? Number.POSITIVE_INFINITY, cell: (b) => (b.margin === null ? "—" : `${fmtMargin(b.margin)} dB`) },
        ]}
      />
    </div>
  );
}
