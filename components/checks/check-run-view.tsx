"use client";

import type { AllChecksResult } from "@/engine/checks";
import type { RuleSource } from "@/engine/checks/rule-set";
import { CHECK_TITLES } from "@/lib/domain/checks/inputs";
import type { CheckRunView as Run } from "@/lib/domain/checks/types";
import { DriveView } from "./drive-view";
import { LeakTraceView } from "./leak-trace-view";
import { LedgerChart } from "./ledger-chart";
import { RunBadge } from "./run-badge";
import { LineupView } from "./lineup-view";
import { RuleResultsTable } from "./rule-results-table";
import { SortableTable } from "@/components/ui/sortable-table";
import { StabilityView } from "./stability-view";
import { SpreadView } from "./spread-view";
import { SweepTable } from "./sweep-table";
import { formatDate } from "@/lib/base/dates";

export type CheckRunViewProps = {
  run: Run;
  /** leak traces: the rank of the path shown on the chart */
  highlightedPath?: number | null;
  onHighlightPath?: (rank: number | null) => void;
  /** spread runs: open a rule's worst sample as a scenario */
  onOpenWorstSample?: (runId: string, rule: string) => void;
};

/** One stored check run: verdict, headline and the check's own figures. */
export function CheckRunView({ run, highlightedPath = null, onHighlightPath, onOpenWorstSample }: CheckRunViewProps) {
  return (
    <article aria-label={`${CHECK_TITLES[run.check]} result`} className="flex flex-col gap-3" data-check={run.check}>
      <header className="flex flex-wrap items-center gap-2">
        <RunBadge check={run.check} verdict={run.verdict} />
        <h3 className="text-base font-semibold">{CHECK_TITLES[run.check]}</h3>
        <span className="text-xs text-muted">
          r{run.revisionNumber ?? "?"} · {run.userName ?? "someone"} · {formatDate(run.createdAt, "second")}
        </span>
      </header>
      <p className="figures text-sm" data-testid="check-headline">
        {run.headline}
      </p>
      {run.check === "isolation" || run.check === "match" || run.check === "insertion_loss" ? <RuleResultsTable results={[run.figures.result]} caption={CHECK_TITLES[run.check]} /> : null}
      {run.check === "leak_trace" ? <LeakTraceView result={run.figures.result} highlighted={highlightedPath} onHighlight={onHighlightPath} /> : null}
      {run.check === "power_ledger" ? <LedgerChart result={run.figures.result} /> : null}
      {run.check === "drive" ? <DriveView result={run.figures.result} /> : null}
      {run.check === "state_sweep" ? <SweepTable result={run.figures.result} /> : null}
      {run.check === "stability" ? <StabilityView results={run.figures.result} /> : null}
      {run.check === "all_rules" ? <AllRulesView result={run.figures.result} sources={run.figures.ruleSources} /> : null}
      {run.check === "lineup" ? <LineupView result={run.figures.result} /> : null}
      {run.check === "spread" ? <SpreadView result={run.figures.result} onOpenWorst={onOpenWorstSample ? (rule) => onOpenWorstSample(run.id, rule) : undefined} /> : null}
      {run.figures.skipped && run.figures.skipped.length > 0 ? (
        <div className="text-sm">
          <h4 className="font-semibold">Rules not run on this scenario</h4>
          <ul className="list-disc pl-5 text-muted">
            {run.figures.skipped.map((s) => (
              <li key={s.id}>
                <span className="font-mono">{s.id}</span>: {s.reason}
              </li>
            ))}
          </ul>
        </div>
      ) : null}
    </article>
  );
}

function AllRulesView({ result, sources }: { result: AllChecksResult; sources?: { id: string; source: RuleSource }[] }) {
  const others = result.checks.filter((c) => !c.name.startsWith("rule:"));
  return (
    <div className="flex flex-col gap-3">
      {result.rules.length > 0 ? <RuleResultsTable results={result.rules} sources={sources} /> : <p className="text-sm text-muted">No rules apply to this scenario.</p>}
      <SortableTable
        caption="Built-in checks"
        rows={others}
        rowKey={(c) => c.name}
        columns={[
          { id: "verdict", header: "Verdict", value: (c) => c.verdict, cell: (c) => <RunBadge check={c.name} verdict={c.verdict} /> },
          { id: "check", header: "Check", value: (c) => c.title },
          { id: "note", header: "Note", value: (c) => c.messages[0] ?? "", sortable: false },
        ]}
      />
    </div>
  );
}
