"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import useSWR from "swr";
import { History, Save } from "lucide-react";
import type { Scenario } from "@/engine/types";
import { Workspace, type PartSummary, type SaveState } from "@/components/workspace";
import { Alert, Button } from "@/components/ui";
import { ScenarioChecks } from "@/components/checks/scenario-checks";
import { ScenarioRulesPanel } from "@/components/rules/scenario-rules-panel";
import type { ChartHighlight } from "@/components/checks/leak-trace-view";
import type { Role } from "@/lib/base/permission-table";
import { ApiError, fetchJson, requestJson, scenarioUrls } from "./api-client";
import { RevisionHistory } from "./revision-history";
import type { PartView } from "@/lib/domain/parts/types";
import type { RevisionView, ScenarioView } from "@/lib/domain/scenarios/types";

/** Wait after the last edit before saving, ms. */
export const AUTOSAVE_DELAY_MS = 1500;

type Conflict = { revisionId: string; number: number; authorName: string | null; message: string };

export type ScenarioWorkspaceProps = {
  projectId: string;
  scenario: ScenarioView;
  revision: RevisionView;
  parts: PartView[];
  readOnly: boolean;
  /** the viewer's role (from the server), for the helm and the checks */
  role?: Role;
};

/**
 * The host of the workspace on the scenario page: holds the edited scenario, autosaves it as a new
 * revision after edits, and on a conflict (someone saved first) keeps the edits and offers to reload
 * the latest revision or to save the edits as a new scenario.
 */
export function ScenarioWorkspace({ projectId, scenario: info, revision, parts: initialParts, readOnly, role }: ScenarioWorkspaceProps) {
  const router = useRouter();
  const [draft, setDraft] = useState<Scenario>(revision.content);
  const [base, setBase] = useState<{ id: string; number: number }>({ id: revision.id, number: revision.number });
  const [saveState, setSaveState] = useState<SaveState>("saved");
  const [conflict, setConflict] = useState<Conflict | null>(null);
  const [saveError, setSaveError] = useState<string | null>(null);
  const [warnings, setWarnings] = useState<string[]>(revision.warnings);
  const [historyOpen, setHistoryOpen] = useState(false);
  const [workspaceKey, setWorkspaceKey] = useState(0);
  const [busy, setBusy] = useState<"reload" | "fork" | null>(null);
  const [highlight, setHighlight] = useState<{ blocks: string[]; ports: string[] } | null>(null);
  const onHighlight = useCallback((h: ChartHighlight | null) => {
    setHighlight(h ? { blocks: h.blocks, ports: h.hops.flatMap((x) => [`${x.block}:${x.inPort}`, `${x.block}:${x.outPort}`]) } : null);
  }, []);

  const { data: partsData, error: partsError } = useSWR<{ parts: PartView[] }>(scenarioUrls.parts(projectId, true), fetchJson, {
    fallbackData: { parts: initialParts },
    revalidateOnFocus: true,
  });
  const parts = useMemo<PartSummary[]>(
    () => (partsData?.parts ?? []).map((p) => ({ id: p.id, name: p.name, fileName: p.fileName, ports: p.ports, text: p.text })),
    [partsData],
  );

  // refs so that timers and in-flight saves see the latest values
  const draftRef = useRef(draft);
  const baseRef = useRef(base);
  const dirtyRef = useRef(false);
  const savingRef = useRef(false);
  const conflictRef = useRef<Conflict | null>(null);
  const timer = useRef<number | null>(null);
  const saveRef = useRef<() => Promise<void>>(async () => undefined);

  const schedule = useCallback(() => {
    if (timer.current !== null) window.clearTimeout(timer.current);
    timer.current = window.setTimeout(() => {
      timer.current = null;
      void saveRef.current();
    }, AUTOSAVE_DELAY_MS);
  }, []);

  const save = useCallback(async () => {
    if (readOnly || conflictRef.current || savingRef.current || !dirtyRef.current) return;
    savingRef.current = true;
    const sent = draftRef.current;
    setSaveState("saving");
    try {
      const { revision: saved } = await requestJson<{ revision: RevisionView }>(scenarioUrls.revisions(projectId, info.id), {
        method: "POST",
        json: { baseRevisionId: baseRef.current.id, scenario: sent },
      });
      baseRef.current = { id: saved.id, number: saved.number };
      setBase(baseRef.current);
      setWarnings(saved.warnings);
      setSaveError(null);
      dirtyRef.current = draftRef.current !== sent;
      setSaveState(dirtyRef.current ? "unsaved" : "saved");
    } catch (e) {
      if (e instanceof ApiError && e.status === 409) {
        const current = (e.body as { current?: { revisionId: string; number: number; authorName: string | null } } | null)?.current;
        const c: Conflict = { revisionId: current?.revisionId ?? "", number: current?.number ?? 0, authorName: current?.authorName ?? null, message: e.message };
        conflictRef.current = c;
        setConflict(c);
        setSaveState("conflict");
      } else {
        setSaveError(e instanceof Error ? e.message : String(e));
        setSaveState("error");
      }
    } finally {
      savingRef.current = false;
    }
    // edits made while the save was under way go out next
    if (dirtyRef.current && !conflictRef.current) schedule();
  }, [info.id, projectId, readOnly, schedule]);

  useEffect(() => {
    saveRef.current = save;
  }, [save]);

  useEffect(
    () => () => {
      if (timer.current !== null) window.clearTimeout(timer.current);
    },
    [],
  );

  const onChange = useCallback(
    (next: Scenario) => {
      if (readOnly) return;
      draftRef.current = next;
      dirtyRef.current = true;
      setDraft(next);
      if (conflictRef.current) return; // keep the edits; the banner decides what happens to them
      setSaveState("unsaved");
      schedule();
    },
    [readOnly, schedule],
  );

  // leaving with unsaved edits asks first
  useEffect(() => {
    const onBeforeUnload = (event: BeforeUnloadEvent) => {
      if (!dirtyRef.current) return;
      event.preventDefault();
    };
    window.addEventListener("beforeunload", onBeforeUnload);
    return () => window.removeEventListener("beforeunload", onBeforeUnload);
  }, []);

  /** Replace the edits with the latest saved revision (after a conflict or a restore). */
  const loadLatest = useCallback(async () => {
    const latest = await requestJson<{ scenario: ScenarioView; revision: RevisionView }>(scenarioUrls.one(projectId, info.id));
    draftRef.current = latest.revision.content;
    dirtyRef.current = false;
    baseRef.current = { id: latest.revision.id, number: latest.revision.number };
    conflictRef.current = null;
    setDraft(latest.revision.content);
    setBase(baseRef.current);
    setWarnings(latest.revision.warnings);
    setConflict(null);
    setSaveError(null);
    setSaveState("saved");
    setWorkspaceKey((k) => k + 1); // a fresh undo history: the old one describes discarded edits
  }, [info.id, projectId]);

  const reload = async () => {
    setBusy("reload");
    try {
      await loadLatest();
    } catch (e) {
      setSaveError(e instanceof Error ? e.message : String(e));
    } finally {
      setBusy(null);
    }
  };

  const saveAsNew = async () => {
    setBusy("fork");
    try {
      const name = `${info.name} (my edits)`;
      const created = await requestJson<{ scenario: { id: string } }>(scenarioUrls.list(projectId), {
        method: "POST",
        json: { name, scenario: { ...draftRef.current, name } },
      });
      dirtyRef.current = false;
      router.push(`/projects/${projectId}/scenarios/${created.scenario.id}`);
    } catch (e) {
      setSaveError(e instanceof Error ? e.message : String(e));
      setBusy(null);
    }
  };

  const saveNow = () => {
    if (timer.current !== null) window.clearTimeout(timer.current);
    timer.current = null;
    void save();
  };

  const toolbarExtras = (
    <>
      <span className="figures text-xs text-muted" aria-label="Revision">
        r{base.number}
      </span>
      {!readOnly ? (
        <Button size="sm" variant="secondary" onClick={saveNow} disabled={saveState !== "unsaved" && saveState !== "error"} aria-label="Save now" title="Save now">
          <Save aria-hidden="true" className="h-4 w-4" /> Save
        </Button>
      ) : null}
      <Button size="sm" variant={historyOpen ? "primary" : "secondary"} onClick={() => setHistoryOpen((o) => !o)} aria-pressed={historyOpen} aria-label="Revision history">
        <History aria-hidden="true" className="h-4 w-4" /> History
      </Button>
    </>
  );

  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-baseline gap-3">
        <h2 className="text-lg font-semibold text-ink">{info.name}</h2>
        <Link href={`/projects/${projectId}/scenarios`} className="text-sm text-muted underline underline-offset-4 hover:text-ink">
          All scenarios
        </Link>
        <a href={scenarioUrls.solve(projectId, info.id, "touchstone", base.id)} className="text-sm text-muted underline underline-offset-4 hover:text-ink" download>
          Composite of r{base.number} (Touchstone)
        </a>
      </div>
      {conflict ? (
        <Alert
          tone="error"
          title="This scenario changed elsewhere"
          actions={
            <div className="flex flex-wrap gap-2">
              <Button size="sm" variant="secondary" loading={busy === "reload"} onClick={reload}>
                Reload latest (discard my edits)
              </Button>
              <Button size="sm" loading={busy === "fork"} onClick={saveAsNew}>
                Save as new scenario
              </Button>
            </div>
          }
        >
          {conflict.message} Your edits are still on the chart and are not saved.
        </Alert>
      ) : null}
      {saveError && !conflict ? (
        <Alert tone="error" title="Not saved" actions={!readOnly ? <Button size="sm" variant="secondary" onClick={saveNow}>Try again</Button> : undefined}>
          {saveError}
        </Alert>
      ) : null}
      {partsError ? <Alert tone="warn" title="The parts could not be loaded">{partsError instanceof Error ? partsError.message : String(partsError)}</Alert> : null}
      {warnings.length > 0 && draft.blocks.length > 0 ? (
        <p className="text-xs text-warn-strong" aria-label="Revision warnings">
          Saved as a draft: {warnings.join(" ")}
        </p>
      ) : null}
      {historyOpen ? (
        <RevisionHistory
          projectId={projectId}
          scenarioId={info.id}
          currentNumber={base.number}
          readOnly={readOnly}
          hasUnsavedEdits={saveState !== "saved"}
          onRestored={loadLatest}
        />
      ) : null}
      <div className="min-h-[680px] 2xl:h-[calc(100vh-13rem)]">
        <Workspace key={workspaceKey} scenario={draft} parts={parts} readOnly={readOnly} onChange={onChange} saveState={saveState} toolbarExtras={toolbarExtras} highlight={highlight} />
      </div>
      <ScenarioRulesPanel projectId={projectId} scenario={draft} onChange={onChange} readOnly={readOnly} />
      <ScenarioChecks
        projectId={projectId}
        scenarioId={info.id}
        scenarioName={info.name}
        role={role ?? (readOnly ? "reviewer" : "engineer")}
        revisionId={base.id}
        revisionNumber={base.number}
        scenario={draft}
        parts={parts}
        readOnly={readOnly}
        onChange={onChange}
        saveNow={saveNow}
        onHighlight={onHighlight}
      />
    </div>
  );
}
