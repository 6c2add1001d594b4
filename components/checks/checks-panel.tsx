"use client";

import useSWR from "swr";
import { Alert, Button, Spinner, VerdictBadge } from "@/components/ui";
import { formatDate } from "@/lib/base/dates";
import { cn } from "@/components/ui/cn";
import { checkRunUrls, fetchJson } from "@/lib/browser/api-client";
import { CHECK_TITLES } from "@/lib/domain/checks/inputs";
import { CheckRunView } from "./check-run-view";
import type { CheckRunSummary, CheckRunView as Run } from "@/lib/domain/checks/types";

export type ChecksPanelProps = {
  projectId: string;
  scenarioId: string;
  selectedRunId: string | null;
  onSelect: (runId: string) => void;
  running: string | null;
  error: string | null;
  canRun: boolean;
  onRunAll: () => void;
  highlightedPath: number | null;
  onHighlightPath: (rank: number | null) => void;
};

/** The scenario page's checks: the selected run's results and the scenario's run history. */
export function ChecksPanel(props: ChecksPanelProps) {
  const { projectId, scenarioId, selectedRunId, onSelect, running, error, canRun, onRunAll } = props;
  const { data: list } = useSWR<{ runs: CheckRunSummary[] }>(checkRunUrls.list(projectId, scenarioId), fetchJson);
  const { data: one, error: oneError } = useSWR<{ run: Run }>(selectedRunId ? checkRunUrls.one(projectId, scenarioId, selectedRunId) : null, fetchJson);
  const runs = list?.runs ?? [];
  return (
    <section aria-labelledby="checks-heading" id="checks" className="flex flex-col gap-3 rounded-card border border-rule bg-surface/60 p-3">
      <div className="flex flex-wrap items-center gap-2">
        <h2 id="checks-heading" className="text-base font-semibold">
          Checks
        </h2>
        <span className="text-xs text-muted">Run from the helm (Ctrl K) or:</span>
        {canRun ? (
          <Button size="sm" variant="secondary" onClick={onRunAll} loading={running === "all_rules"}>
            Run all rules
          </Button>
        ) : null}
        {running ? (
          <span role="status" className="flex items-center gap-1 text-sm text-muted">
            <Spinner size="sm" /> Running {CHECK_TITLES[running as keyof typeof CHECK_TITLES] ?? running}…
          </span>
        ) : null}
      </div>
      {error ? (
        <Alert tone="error" title="The check did not run">
          {error}
        </Alert>
      ) : null}
      <div className="grid gap-3 xl:grid-cols-[minmax(0,1fr)_18rem]">
        <div className="min-w-0">
          {one?.run ? (
            <CheckRunView run={one.run} highlightedPath={props.highlightedPath} onHighlightPath={props.onHighlightPath} />
          ) : selectedRunId && !oneError ? (
            <Spinner />
          ) : oneError ? (
            <Alert tone="error">{oneError instanceof Error ? oneError.message : String(oneError)}</Alert>
          ) : (
            <p className="text-sm text-muted">No check chosen. Open the helm and type a check, e.g. “isolation”.</p>
          )}
        </div>
        <div>
          <h3 className="mb-1 text-sm font-semibold">Run history</h3>
          {runs.length === 0 ? (
            <p className="text-sm text-muted">No runs yet.</p>
          ) : (
            <ol aria-label="Run history" className="flex max-h-80 flex-col gap-1 overflow-y-auto">
              {runs.map((r) => (
                <li key={r.id}>
                  <button
                    type="button"
                    onClick={() => onSelect(r.id)}
                    aria-current={r.id === selectedRunId ? "true" : undefined}
                    className={cn("flex w-full flex-col gap-0.5 rounded border px-2 py-1 text-left text-xs hover:bg-sunken", r.id === selectedRunId ? "border-ink" : "border-rule")}
                  >
                    <span className="flex items-center gap-2">
                      <VerdictBadge verdict={r.verdict} />
                      <span className="font-medium">{CHECK_TITLES[r.check]}</span>
                      <span className="text-muted">r{r.revisionNumber ?? "?"}</span>
                    </span>
                    <span className="truncate text-muted">{r.headline}</span>
                    <span className="truncate text-muted">
                      {r.userName ? `by ${r.userName}, ` : ""}
                      {formatDate(r.createdAt)}
                    </span>
                  </button>
                </li>
              ))}
            </ol>
          )}
        </div>
      </div>
    </section>
  );
}
