"use client";

import type { LeakTraceResult } from "@/engine/checks";
import { Button } from "@/components/ui";
import { cn } from "@/components/ui/cn";
import { SortableTable } from "@/components/ui/sortable-table";
import { fmt, fmtHz } from "./format";

export type ChartHighlight = { blocks: string[]; hops: { block: string; inPort: number; outPort: number }[] };

/** The blocks and block-port hops of one leak path, for highlighting on the chart. */
export function highlightOfPath(path: LeakTraceResult["paths"][number]): ChartHighlight {
  const hops = path.hops.filter((h) => h.kind === "block").map((h) => ({ block: h.block, inPort: h.inPort, outPort: h.outPort }));
  return { blocks: [...new Set(hops.map((h) => h.block))], hops };
}

/** Ranked leak paths with each hop's dB; one path at a time is highlighted on the chart. */
export function LeakTraceView({ result, highlighted, onHighlight }: { result: LeakTraceResult; highlighted: number | null; onHighlight?: (rank: number | null) => void }) {
  return (
    <div className="flex flex-col gap-3">
      <p className="text-sm">
        {result.from}→{result.to} at <span className="figures">{fmtHz(result.frequencyHz)}</span>: composite <span className="figures">{fmt(result.trueDb)} dB</span>; the listed
        paths add up to <span className="figures">{fmt(result.listedSumDb)} dB</span> ({result.ranking} ranking, residual <span className="figures">{fmt(result.residualRelativeDb)} dB</span>).
      </p>
      <ol aria-label="Leak paths" className="flex flex-col gap-2">
        {result.paths.map((path) => {
          const on = highlighted === path.rank;
          return (
            <li key={path.rank} aria-current={on ? "true" : undefined} className={cn("rounded-card border px-3 py-2", on ? "border-fail bg-fail/8" : "border-rule")}>
              <div className="flex flex-wrap items-center justify-between gap-2">
                <span className="text-sm font-semibold">
                  Path {path.rank}: <span className="figures">{fmt(path.db)} dB</span>
                </span>
                {onHighlight ? (
                  <Button size="sm" variant={on ? "primary" : "secondary"} aria-pressed={on} onClick={() => onHighlight(on ? null : path.rank)}>
                    {on ? "Shown on chart" : "Show on chart"}
                  </Button>
                ) : null}
              </div>
              <ol aria-label={`Hops of path ${path.rank}`} className="mt-1 flex flex-wrap items-center gap-1 text-xs">
                <li className="font-mono">{result.from}</li>
                {path.hops.map((h, i) => (
                  <li key={i} className="flex items-center gap-1">
                    <span aria-hidden="true">→</span>
                    <span className={cn("rounded border px-1.5 py-0.5 font-mono", h.kind === "block" ? "border-ink/40" : "border-dashed border-rule-strong")} data-hop-block={h.block}>
                      {h.block} {h.kind === "block" ? `${h.inPort}→${h.outPort}` : "Z0 step"} <span className="figures">{fmt(h.db)} dB</span>
                    </span>
                  </li>
                ))}
                <li className="flex items-center gap-1">
                  <span aria-hidden="true">→</span>
                  <span className="font-mono">{result.to}</span>
                </li>
              </ol>
            </li>
          );
        })}
      </ol>
      {result.whatIf.length > 0 ? (
        <div>
          <h4 className="mb-1 text-sm font-semibold">If one block were ideal</h4>
          <SortableTable
            caption="What-if: one block ideal"
            rows={result.whatIf}
            rowKey={(w) => w.block}
            initialSort={{ id: "improvement", desc: true }}
            columns={[
              { id: "block", header: "Block", value: (w) => w.block, cell: (w) => <span className="font-mono">{w.block}</span> },
              { id: "ideal", header: "Ideal means", value: (w) => w.ideal },
              { id: "value", header: "|S| then", numeric: true, value: (w) => w.valueDb, cell: (w) => `${fmt(w.valueDb)} dB` },
              { id: "improvement", header: "Improvement", numeric: true, value: (w) => w.improvementDb, cell: (w) => `${fmt(w.improvementDb)} dB` },
            ]}
          />
        </div>
      ) : null}
    </div>
  );
}
