"use client";

import useSWR from "swr";
import { Alert, Badge, Button, Spinner } from "@/components/ui";
import { formatDate } from "@/lib/base/dates";
import { RunBadge } from "./run-badge";
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
  /** run a stored run's check again on the latest revision (the one action offered on a stale verdict) */
  onRerun: (run: CheckRunSummary) => void;
  /** a spread run's worst sample of a rule as a new scenario (absent when the role cannot create scenarios) */
  onOpenWorstSample?: (runId: string, rule: string) => void;
};

/** Why a stored verdict is not the verdict of what is on screen now, in words (empty when it is). */
export function staleNote(run: Pick<CheckRunSummary, "stale" | "latest" | "revisionNumber">): string {
  const reasons = [...run.stale];
  if (!run.latest) reasons.unshift(`it ran on r${run.revisionNumber ?? "?"}, not the latest revision`);
  return reasons.join("; ");
}

/** The scenario page's checks: the selected run's results and the scenario's run history. */
export function ChecksPanel(props: ChecksPanelProps) {
  const { projectId, scenarioId, selectedRunId, onSelect, running, error, canRun, onRunAll, onRerun } = props;
  // revalidated on focus: a rule edited on the Rules page marks verdicts stale when one comes back
  const { data: list } = useSWR<{ runs: CheckRunSummary[] }>(checkRunUrls.list(projectId, scenarioId), fetchJson, { revalidateOnFocus: true });
  const { data: one, error: oneError } = useSWR<{ run: Run }>(selectedRunId ? checkRunUrls.one(projectId, scenarioId, selectedRunId) : null, fetchJson);
  const runs = list?.runs ?? [];
  return (
    <section aria-labelledby="checks-heading" id="checks" className="@container flex flex-col gap-3 rounded-card border border-rule bg-surface/60 p-3">
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
      {/* side by side when the checks pane (not the window) is wide enough: the pane can be narrow on a wide screen */}
      <div className="grid gap-3 @2xl:grid-cols-[minmax(0,1fr)_18rem]">
        <div className="min-w-0">
          {one?.run ? (
            <div className="flex flex-col gap-2">
              {staleNote(one.run) ? (
                <Alert
                  tone="warn"
                  title="Stale verdict"
                  actions={
                    canRun ? (
                      <Button size="sm" onClick={() => onRerun(one.run)} loading={running === one.run.check}>
                        Re-run on the latest revision
                      </Button>
                    ) : undefined
                  }
                >
                  This verdict is not current: {staleNote(one.run)}.
                </Alert>
              ) : null}
              <CheckRunView run={one.run} highlightedPath={props.highlightedPath} onHighlightPath={props.onHighlightPath} onOpenWorstSample={props.onOpenWorstSample} />
            </div>
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
                      <RunBadge check={r.check} verdict={r.verdict} />
                      <span className="font-medium">{CHECK_TITLES[r.check]}</span>
                      <span className="text-muted">r{r.revisionNumber ?? "?"}</span>
                      {staleNote(r) ? (
                        <Badge tone="warn" title={staleNote(r)} data-testid="stale-mark">
                          stale
                        </Badge>
                      ) : null}
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
