"use client";

import type { DriveResult } from "@/engine/checks";
import { Alert, VerdictBadge } from "@/components/ui";
import { SortableTable } from "@/components/ui/sortable-table";
import { fmt, fmtHz, fmtMargin } from "./format";

/** Incident power at every block against its rating, with the cautions every drive result carries. */
export function DriveView({ result }: { result: DriveResult }) {
  return (
    <div className="flex flex-col gap-3">
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
        rows={result.blocks}
        rowKey={(b) => b.block}
        initialSort={{ id: "margin", desc: false }}
        columns={[
          { id: "verdict", header: "Verdict", value: (b) => b.verdict ?? "", cell: (b) => (b.verdict ? <VerdictBadge verdict={b.verdict} /> : <span className="text-muted">no rating</span>) },
          { id: "block", header: "Block", value: (b) => b.block, cell: (b) => <span className="font-mono">{b.block}</span> },
          { id: "worst", header: "Most incident", numeric: true, value: (b) => b.worstDbm, cell: (b) => `${fmt(b.worstDbm)} dBm (port ${b.worstPort})` },
          { id: "at", header: "At", numeric: true, value: (b) => b.worstHz, cell: (b) => fmtHz(b.worstHz) },
          { id: "rating", header: "Rating", numeric: true, value: (b) => b.ratingDbm, cell: (b) => (b.ratingDbm === null ? "—" : `${fmt(b.ratingDbm, 1)} dBm`) },
          { id: "margin", header: "Margin", numeric: true, value: (b) => b.margin, cell: (b) => (b.margin === null ? "—" : `${fmtMargin(b.margin)} dB`) },
        ]}
      />
    </div>
  );
}
