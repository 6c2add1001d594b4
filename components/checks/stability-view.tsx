"use client";

import type { StabilityResult } from "@/engine/checks";
import { VerdictBadge } from "@/components/ui";
import { SortableTable } from "@/components/ui/sortable-table";
import { fmt, fmtHz } from "./format";

/** Rollett K and Edwards–Sinsky μ per amplifier (and a two-port composite): the smallest over the plan. */
export function StabilityView({ results }: { results: StabilityResult[] }) {
  if (results.length === 0) return <p className="text-sm text-muted">No amplifier and no two-port composite: nothing to check.</p>;
  return (
    <SortableTable
      caption="Stability"
      rows={results}
      rowKey={(r) => r.subject}
      columns={[
        { id: "verdict", header: "Verdict", value: (r) => r.verdict, cell: (r) => <VerdictBadge verdict={r.verdict} label={r.verdict === "warn" ? "Conditional" : undefined} /> },
        { id: "subject", header: "Two-port", value: (r) => r.subject, cell: (r) => <span className="font-mono">{r.subject}</span> },
        { id: "k", header: "Least K", numeric: true, value: (r) => r.minK, cell: (r) => (r.minK === null ? "∞" : `${fmt(r.minK, 3)} at ${fmtHz(r.minKHz)}`) },
        { id: "mu", header: "Least μ", numeric: true, value: (r) => r.minMu, cell: (r) => (r.minMu === null ? "∞" : `${fmt(r.minMu, 3)} at ${fmtHz(r.minMuHz)}`) },
        { id: "conditional", header: "Conditional points", numeric: true, value: (r) => r.conditionalCount },
      ]}
    />
  );
}
