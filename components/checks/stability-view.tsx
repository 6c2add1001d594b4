"use client";

import type { StabilityResult } from "@/engine/checks";
import { VerdictBadge } from "@/components/ui";
import { SortableTable } from "@/components/ui/sortable-table";
import { fmt, fmtHz } from "./format";

/** Rollett K, |Δ| and Edwards–Sinsky μ per active 2-port block and composite port pair: the worst over the plan. */
export function StabilityView({ results }: { results: StabilityResult[] }) {
  if (results.length === 0) return <p className="text-sm text-muted">No active block and no two-port composite: nothing to check.</p>;
  return (
    <SortableTable
      caption="Stability"
      rows={results}
      rowKey={(r) => r.subject}
      columns={[
        { id: "verdict", header: "Verdict", value: (r) => r.verdict, cell: (r) => <VerdictBadge verdict={r.verdict} label={r.verdict === "warn" ? "Conditional" : r.verdict === "fail" ? "Potentially unstable" : undefined} /> },
        { id: "subject", header: "Two-port", value: (r) => r.subject, cell: (r) => <span className="font-mono">{r.subject}</span> },
        { id: "k", header: "Least K", numeric: true, value: (r) => r.minK, cell: (r) => (r.minK === null ? "∞" : `${fmt(r.minK, 3)} at ${fmtHz(r.minKHz)}`) },
        // runs stored before |Δ| was reported have no maxDelta
        { id: "delta", header: "Largest |Δ|", numeric: true, value: (r) => r.maxDelta ?? null, cell: (r) => (r.maxDelta === undefined ? "—" : `${fmt(r.maxDelta, 3)} at ${fmtHz(r.maxDeltaHz)}`) },
        { id: "mu", header: "Least μ", numeric: true, value: (r) => r.minMu, cell: (r) => (r.minMu === null ? "∞" : `${fmt(r.minMu, 3)} at ${fmtHz(r.minMuHz)}`) },
        { id: "conditional", header: "Potentially unstable points", numeric: true, value: (r) => r.conditionalCount },
      ]}
    />
  );
}
