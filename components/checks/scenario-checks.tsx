"use client";

import { useCallback, useEffect, useRef, useState } from "react";
import { useRouter } from "next/navigation";
import { useSWRConfig } from "swr";
import type { BlockKind, PortRef, Scenario } from "@/engine/types";
import { Alert, Button } from "@/components/ui";
import { useHelmScenario } from "@/components/helm/helm-context";
import { can, type Role } from "@/lib/base/permission-table";
import { addBlock, setSwitchState, setSystemPort, type PartSummary } from "@/lib/browser/scenario-model";
import { CARD_WIDTH } from "@/components/chart";
import type { LeakTraceResult } from "@/engine/checks";
import { CHECK_TITLES, type CheckName } from "@/lib/domain/checks/inputs";
import type { JobView } from "@/lib/domain/jobs";
import { checkRunUrls, fetchJson, jobUrls, requestJson, scenarioUrls } from "@/lib/browser/api-client";
import { JobProgress } from "./job-progress";
import { RunStorage } from "./run-storage";
import { ChecksPanel } from "./checks-panel";
import { highlightOfPath, type ChartHighlight } from "./leak-trace-view";
import type { CheckRunView } from "@/lib/domain/checks/types";

export type ScenarioChecksProps = {
  projectId: string;
  scenarioId: string;
  scenarioName: string;
  role: Role;
  /** the saved revision the page shows: checks run on it */
  revisionId: string;
  revisionNumber: number;
  /** the scenario as edited on the page */
  scenario: Scenario;
  parts: readonly PartSummary[];
  readOnly: boolean;
  /** apply an edit made from the helm (the page saves it like any other) */
  onChange: (next: Scenario) => void;
  /** the person's working draft holds changes not in the latest revision */
  hasDraft: boolean;
  /** the newest revision the page knows of */
  latestNumber: number;
  /** open "Save revision" (note dialog) */
  onSaveRevision: () => void;
  /** blocks and links to mark on the chart (a leak path), or null */
  onHighlight: (highlight: ChartHighlight | null) => void;
};

/** Download a file the server names (content-disposition), as a link with `download` would. */
function download(href: string): void {
  const a = document.createElement("a");
  a.href = href;
  a.download = "";
  document.body.appendChild(a);
  a.click();
  a.remove();
}

/**
 * The "Checks" area of the scenario page and the page's side of the helm: lends the workspace's actions
 * and the checks to the helm, runs checks on the server, shows the chosen run and the run history, and
 * highlights a leak path on the chart.
 */
export function ScenarioChecks(props: ScenarioChecksProps) {
  const { projectId, scenarioId, scenarioName, role, revisionId, revisionNumber, scenario, parts, readOnly, onChange, hasDraft, latestNumber, onSaveRevision, onHighlight } = props;
  const router = useRouter();
  const { mutate } = useSWRConfig();
  const [selected, setSelected] = useState<string | null>(null);
  const [running, setRunning] = useState<CheckName | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const [pathRank, setPathRank] = useState<number | null>(null);
  const [leak, setLeak] = useState<LeakTraceResult | null>(null);
  const box = useRef<HTMLDivElement>(null);
  const [job, setJob] = useState<JobView | null>(null);
  const jobRef = useRef<JobView | null>(null);

  /** Polls a long job until it finishes: its run when done, null when cancelled; throws its error when it failed. */
  const followJob = useCallback(
    async (started: JobView): Promise<CheckRunView | null> => {
      let current = started;
      jobRef.current = current;
      setJob(current);
      try {
        while (current.state === "queued" || current.state === "running") {
          await new Promise((resolve) => setTimeout(resolve, 400));
          current = (await requestJson<{ job: JobView }>(jobUrls.one(projectId, started.id))).job;
          jobRef.current = current;
          setJob(current);
        }
      } finally {
        jobRef.current = null;
        setJob(null);
      }
      if (current.state === "cancelled") return null;
      if (current.state === "failed" || !current.runId) throw new Error(current.error?.message ?? "The job failed.");
      return (await requestJson<{ run: CheckRunView }>(checkRunUrls.one(projectId, scenarioId, current.runId))).run;
    },
    [projectId, scenarioId],
  );

  // a new revision (a save, a rule edit on the Rules panel) makes earlier runs verdicts of an older revision
  useEffect(() => {
    void mutate(checkRunUrls.list(projectId, scenarioId));
  }, [mutate, projectId, scenarioId, revisionId]);

  useEffect(() => {
    const path = leak && pathRank !== null ? leak.paths.find((p) => p.rank === pathRank) : null;
    onHighlight(path ? highlightOfPath(path) : null);
  }, [leak, pathRank, onHighlight]);

  const select = useCallback(
    async (runId: string) => {
      setSelected(runId);
      setPathRank(null);
      setLeak(null);
      try {
        const { run } = await fetchJson<{ run: CheckRunView }>(checkRunUrls.one(projectId, scenarioId, runId));
        if (run?.check === "leak_trace") setLeak(run.figures.result);
      } catch {
        // the panel shows its own loading error
      }
    },
    [projectId, scenarioId],
  );

  const runCheck = useCallback(
    async (check: CheckName, inputs: Record<string, unknown>) => {
      setRunning(check);
      setError(null);
      try {
        const answer = await requestJson<{ run?: CheckRunView; job?: JobView }>(checkRunUrls.list(projectId, scenarioId), { method: "POST", json: { check, inputs, revisionId } });
        // a long check (state sweep) answers with a job: follow it until it has stored its run
        const run = answer.run ?? (answer.job ? await followJob(answer.job) : null);
        if (!run) return;
        await mutate(checkRunUrls.one(projectId, scenarioId, run.id), { run }, { revalidate: false });
        await mutate(checkRunUrls.list(projectId, scenarioId));
        await mutate(jobUrls.storage(projectId, scenarioId));
        setSelected(run.id);
        if (run.check === "leak_trace") {
          const result = run.figures.result;
          setLeak(result);
          setPathRank(result.paths[0]?.rank ?? null);
        } else {
          setLeak(null);
          setPathRank(null);
        }
        box.current?.scrollIntoView({ block: "start", behavior: "smooth" });
      } catch (e) {
        setError(e instanceof Error ? e.message : String(e));
      } finally {
        setRunning(null);
      }
    },
    [mutate, projectId, revisionId, scenarioId, followJob],
  );

  const cancelJob = useCallback(() => {
    const current = jobRef.current;
    if (!current) return;
    void requestJson(jobUrls.one(projectId, current.id), { method: "DELETE" }).catch(() => undefined);
  }, [projectId]);

  const edit = (result: { ok: true; scenario: Scenario } | { ok: false; reason: string }, done: string) => {
    if (result.ok) {
      onChange(result.scenario);
      setNotice(done);
    } else setNotice(result.reason);
  };

  useHelmScenario({
    projectId,
    scenarioId,
    scenarioName,
    role,
    revisionId,
    revisionNumber,
    scenario,
    parts,
    addBlock: (kind: BlockKind, part?: PartSummary) => {
      if (readOnly) return;
      const blocks = scenario.blocks;
      const right = blocks.reduce((x, b) => Math.max(x, (b.position?.x ?? 0) + CARD_WIDTH + 80), 0);
      const r = addBlock(scenario, kind, { x: right, y: 0 }, part);
      edit({ ok: true, scenario: r.scenario }, `Added ${r.id}.`);
    },
    markSystemPort: (at: PortRef, name: string) => edit(setSystemPort(scenario, at, { name }, parts), `${at} is now system port ${name}.`),
    setSwitchState: (id: string, state: number) => edit(setSwitchState(scenario, id, state), `${id} set to throw ${state}.`),
    saveRevision: () => {
      onSaveRevision();
      setNotice("Save revision: add a note and save.");
    },
    duplicateScenario: async () => {
      try {
        const created = await requestJson<{ scenario: { id: string } }>(scenarioUrls.duplicate(projectId, scenarioId), { method: "POST", json: {} });
        router.push(`/projects/${projectId}/scenarios/${created.scenario.id}`);
      } catch (e) {
        setNotice(e instanceof Error ? e.message : String(e));
      }
    },
    downloadTouchstone: () => download(`/api/projects/${projectId}/scenarios/${scenarioId}/solve?format=touchstone&revision=${encodeURIComponent(revisionId)}`),
    exportBundle: () => download(`/api/projects/${projectId}/scenarios/${scenarioId}/bundle?revisionId=${encodeURIComponent(revisionId)}`),
    runCheck,
  });

  /** Opens a spread run's worst sample of a rule as a new scenario and goes to it. */
  async function openWorstSample(runId: string, rule: string) {
    try {
      setNotice(`Opening the worst sample of ${rule}…`);
      const created = await requestJson<{ scenario: { id: string } }>(checkRunUrls.worstSample(projectId, scenarioId, runId), { method: "POST", json: { rule } });
      router.push(`/projects/${projectId}/scenarios/${created.scenario.id}`);
    } catch (e) {
      setNotice(e instanceof Error ? e.message : String(e));
    }
  }

  return (
    <div ref={box} className="scroll-mt-4">
      {notice ? (
        <p role="status" className="mb-2 text-sm text-muted">
          Helm: {notice}
        </p>
      ) : null}
      {job ? <JobProgress job={job} title={CHECK_TITLES[job.kind as CheckName] ?? job.kind} onCancel={cancelJob} /> : null}
      <ChecksPanel
        projectId={projectId}
        scenarioId={scenarioId}
        selectedRunId={selected}
        onSelect={(id) => void select(id)}
        running={running}
        error={error}
        canRun={can(role, "check.run")}
        onRunAll={() => void runCheck("all_rules", {})}
        highlightedPath={pathRank}
        onHighlightPath={setPathRank}
        onRerun={(run) => void runCheck(run.check, run.inputs)}
        onOpenWorstSample={can(role, "scenario.create") ? (runId, rule) => void openWorstSample(runId, rule) : undefined}
      />
      {hasDraft ? (
        <Alert
          tone="warn"
          className="mt-2"
          title={`Your draft has changes not in revision ${latestNumber}`}
          actions={
            <Button size="sm" onClick={onSaveRevision}>
              Save revision…
            </Button>
          }
        >
          Stored checks, verdicts and sign-off judge revision {revisionNumber} (by its content hash), not your draft; the live results on the chart follow the draft. Save a revision to have it judged.
        </Alert>
      ) : revisionNumber > 0 ? (
        <p className="mt-1 text-xs text-muted">Checks run on the saved revision r{revisionNumber}, which is what the chart shows.</p>
      ) : null}
      {readOnly && !can(role, "check.run") ? <Alert tone="info">Your role cannot run checks.</Alert> : null}
      <RunStorage projectId={projectId} scenarioId={scenarioId} canClear={can(role, "runs.clear")} />
    </div>
  );
}
