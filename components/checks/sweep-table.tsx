"use client";

import type { StateSweepResult } from "@/engine/checks";
import { Badge, VerdictBadge } from "@/components/ui";
import { SortableTable, type SortColumn } from "@/components/ui/sortable-table";
import { fmtMargin } from "./format";

type Row = StateSweepResult["rows"][number] & { index: number };

/** Every combination of switch states × every rule's margin, with the best and worst combinations marked. */
export function SweepTable({ result }: { result: StateSweepResult }) {
  const rows: Row[] = result.rows.map((r, index) => ({ ...r, index }));
  const mark = (r: Row) => (result.best?.row === r.index ? "best" : result.worst?.row === r.index ? "worst" : undefined);
  const columns: SortColumn<Row>[] = [
    {
      id: "states",
      header: result.switches.map((s) => s.block).join(" · ") || "States",
      value: (r) => r.states.join("·"),
      cell: (r) => (
        <span className="flex items-center gap-2">
          <span className="font-mono">{r.states.join(" · ")}</span>
          {mark(r) === "best" ? <Badge tone="pass">best</Badge> : mark(r) === "worst" ? <Badge tone="fail">worst</Badge> : null}
        </span>
      ),
    },
    ...result.rules.map<SortColumn<Row>>((rule, j) => ({
      id: `rule-${j}`,
      header: rule.id,
      numeric: true,
      value: (r) => r.cells[j]?.margin ?? null,
      cell: (r) => (r.cells[j] ? <span className={r.cells[j].verdict === "fail" ? "text-fail-strong" : undefined}>{fmtMargin(r.cells[j].margin)} dB</span> : "—"),
    })),
    { id: "worst", header: "Least margin", numeric: true, value: (r) => r.worstMargin, cell: (r) => (r.worstMargin === null ? r.error ?? "—" : `${fmtMargin(r.worstMargin)} dB`) },
    { id: "verdict", header: "Verdict", value: (r) => r.verdict, cell: (r) => <VerdictBadge verdict={r.verdict} /> },
  ];
  return (
    <div className="flex flex-col gap-2">
      <p className="text-sm">
        {result.combinations} combinations of {result.switches.map((s) => `${s.block} (${s.throws} throws)`).join(", ") || "no switches"}: {result.passing} pass, {result.failing} fail.
        Cells are margins in dB (positive: met).
      </p>
      <SortableTable caption="State sweep" columns={columns} rows={rows} rowKey={(r) => String(r.index)} rowProps={(r) => ({ "data-mark": mark(r) })} />
    </div>
  );
}
