"use client";

import type { RuleResult } from "@/engine/checks/types";
import { RULE_SOURCE_LABELS, type RuleSource } from "@/engine/checks/rule-set";
import { VerdictBadge } from "@/components/ui";
import { SortableTable, type SortColumn } from "@/components/ui/sortable-table";
import { fmt, fmtHz, fmtMargin } from "./format";

const KIND: Record<RuleResult["kind"], string> = {
  isolation: "Isolation",
  match: "Match",
  insertion_loss: "Insertion loss",
  drive: "Drive",
  noise_figure: "Noise figure",
  gain: "Gain",
  headroom: "Headroom",
};
const VERDICT_ORDER = { fail: 0, warn: 1, pass: 2 } as const;

const columns: SortColumn<RuleResult>[] = [
  { id: "verdict", header: "Verdict", value: (r) => VERDICT_ORDER[r.verdict], cell: (r) => <VerdictBadge verdict={r.verdict} /> },
  { id: "rule", header: "Rule", value: (r) => r.id, cell: (r) => <span className="font-mono">{r.id}</span> },
  { id: "kind", header: "Kind", value: (r) => `${KIND[r.kind]}${r.direction ? ` ${r.direction}` : ""}` },
  { id: "worst", header: "Worst", numeric: true, value: (r) => r.worst, cell: (r) => `${fmt(r.worst)} ${r.unit}` },
  { id: "at", header: "At", numeric: true, value: (r) => r.worstHz, cell: (r) => fmtHz(r.worstHz) },
  { id: "limit", header: "Limit", numeric: true, value: (r) => r.limit, cell: (r) => `${fmt(r.limit)} ${r.unit}` },
  { id: "margin", header: "Margin", numeric: true, value: (r) => r.margin, cell: (r) => `${fmtMargin(r.margin)} dB` },
];

/**
 * Rule verdicts with worst value, its frequency, the limit and the margin; sorted by margin, smallest
 * first. With `sources`, a column says where each rule comes from (project, scenario override, scenario only).
 */
export function RuleResultsTable({ results, caption = "Rule verdicts", sources }: { results: RuleResult[]; caption?: string; sources?: { id: string; source: RuleSource }[] }) {
  const bySource = new Map((sources ?? []).map((s) => [s.id, s.source]));
  const withSource: SortColumn<RuleResult>[] = sources
    ? [...columns.slice(0, 2), { id: "source", header: "Source", value: (r) => RULE_SOURCE_LABELS[bySource.get(r.id) ?? "scenario"] }, ...columns.slice(2)]
    : columns;
  return (
    <SortableTable
      caption={caption}
      columns={withSource}
      rows={results}
      rowKey={(r) => r.id}
      initialSort={{ id: "margin", desc: false }}
      rowProps={(r) => ({ "data-rule": r.id, "data-verdict": r.verdict })}
    />
  );
}
