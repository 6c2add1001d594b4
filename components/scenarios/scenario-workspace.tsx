"use client";

import Link from "next/link";
import { useCallback, useEffect, useMemo, useRef, useState, type ReactNode } from "react";
import useSWR from "swr";
import { History, Save } from "lucide-react";
import { Workspace } from "@/components/scenario-editor";
import { PaneBox } from "@/components/scenario-editor/workspace-panes";
import type { PartSummary } from "@/lib/browser/scenario-model";
import { Alert, Button, ConfirmDialog, Kbd } from "@/components/ui";
import { ScenarioChecks } from "@/components/checks/scenario-checks";
import { ScenarioRulesPanel } from "@/components/rules/scenario-rules-panel";
import type { ChartHighlight } from "@/components/checks/leak-trace-view";
import type { Role } from "@/lib/base/permission-table";
import { fetchJson, scenarioUrls } from "@/lib/browser/api-client";
import { formatDate } from "@/lib/base/dates";
import { partFilesOf } from "@/lib/domain/scenarios/part-files";
import { parsePinnedPartPath, pinnedPartPath } from "@/engine/system/parts";
import { RevisionHistory } from "./revision-history";
import { MergeConflictDialog, SaveRevisionDialog } from "./save-revision-dialog";
import { useAutosave, type SaveRevisionOutcome } from "./use-autosave";
import type { PartView } from "@/lib/domain/parts/types";
import type { RevisionView, ScenarioDraftView, ScenarioView } from "@/lib/domain/scenarios/types";
import type { MergeChoice, MergeConflict } from "@/lib/domain/scenarios/merge";
import type { RuleSpec, Scenario } from "@/engine/types";
import { publishDraftStatus } from "@/lib/browser/draft-status";

export type ScenarioWorkspaceProps = {
  projectId: string;
  scenario: ScenarioView;
  revision: RevisionView;
  /** the viewer's working draft of this scenario on the server, with its base revision's content */
  draft?: (ScenarioDraftView & { baseContent: Scenario }) | null;
  parts: PartView[];
  readOnly: boolean;
  /** the viewer's role (from the server), for the helm and the checks */
  role?: Role;
  /** the sign-off panel (a server component of the page), shown in the checks pane */
  signoff?: ReactNode;
};

/**
 * The host of the workspace on the scenario page: holds the edited scenario, keeps it as the person's
 * working draft (autosave), and saves named revisions deliberately ("Save revision", Ctrl/Cmd+S) with a
 * note, merging with what others saved since and asking only about real conflicts.
 */
export function ScenarioWorkspace({ projectId, scenario: info, revision, draft: initialDraft = null, parts: initialParts, readOnly, role, signoff }: ScenarioWorkspaceProps) {
  const {
    draft,
    base,
    baseContent,
    latestNumber,
    hasDraft,
    saveState,
    saveError,
    reportError,
    warnings,
    generation,
    edit: onChange,
    saveDraftNow,
    saveRevision,
    loadLatest,
    discardDraft,
    openedDraft,
    offeredDraft,
    restoreOffered,
    dropOffered,
  } = useAutosave({
    projectId,
    scenarioId: info.id,
    revision,
    initialDraft,
    readOnly,
  });
  const [historyOpen, setHistoryOpen] = useState(false);
  const [saveOpen, setSaveOpen] = useState(false);
  const [saveDialogError, setSaveDialogError] = useState<string | null>(null);
  const [pendingNote, setPendingNote] = useState("");
  const [merge, setMerge] = useState<{ conflicts: MergeConflict[]; current: { number: number; authorName: string | null } } | null>(null);
  const [savedNotice, setSavedNotice] = useState<string | null>(null);
  const [discardOpen, setDiscardOpen] = useState(false);
  const saveOpenRef = useRef(false);
  const submitSaveRef = useRef<(() => void) | null>(null);

  const openSaveRevision = useCallback(() => {
    if (readOnly) return;
    setSaveDialogError(null);
    setSavedNotice(null);
    setSaveOpen(true);
  }, [readOnly]);

  /** The outcome of a save in words, or the conflict dialog. */
  const settle = useCallback((outcome: SaveRevisionOutcome, note: string) => {
    if (outcome.ok) {
      setMerge(null);
      setSaveOpen(false);
      const by = outcome.merged ? ` Merged with revision ${outcome.merged.number}${outcome.merged.authorName ? ` by ${outcome.merged.authorName}` : ""}${outcome.merged.settled > 0 ? ` (${outcome.merged.settled} conflict${outcome.merged.settled === 1 ? "" : "s"} settled by you)` : ""}.` : "";
      setSavedNotice(`Saved revision ${outcome.number}.${by}`);
    } else {
      setSaveOpen(false);
      setPendingNote(note);
      setMerge({ conflicts: outcome.conflicts, current: outcome.current });
    }
  }, []);

  const onSave = useCallback(
    async (note: string) => {
      setSaveDialogError(null);
      try {
        settle(await saveRevision(note), note);
      } catch (e) {
        setSaveDialogError(e instanceof Error ? e.message : String(e));
      }
    },
    [saveRevision, settle],
  );

  const onResolve = useCallback(
    async (resolutions: Record<string, MergeChoice>) => {
      setSaveDialogError(null);
      try {
        settle(await saveRevision(pendingNote, resolutions), pendingNote);
      } catch (e) {
        setSaveDialogError(e instanceof Error ? e.message : String(e));
      }
    },
    [pendingNote, saveRevision, settle],
  );

  // Ctrl/Cmd+S opens "Save revision", and in the dialog commits it (never the browser's "save page")
  const mergeOpenRef = useRef(false);
  useEffect(() => {
    saveOpenRef.current = saveOpen;
    mergeOpenRef.current = merge !== null;
  }, [merge, saveOpen]);
  useEffect(() => {
    const onKey = (event: KeyboardEvent) => {
      if (!(event.ctrlKey || event.metaKey) || event.altKey || event.key.toLowerCase() !== "s") return;
      event.preventDefault();
      if (readOnly || mergeOpenRef.current) return; // the conflict dialog has its own button
      if (saveOpenRef.current) submitSaveRef.current?.();
      else openSaveRevision();
    };
    window.addEventListener("keydown", onKey);
    return () => window.removeEventListener("keydown", onKey);
  }, [openSaveRevision, readOnly]);

  // the sign-off panel (outside this component) needs to know whether the draft is beyond the revision
  useEffect(() => {
    publishDraftStatus({ scenarioId: info.id, hasDraft: hasDraft && !readOnly, latestNumber, openSaveRevision: readOnly ? null : openSaveRevision });
  }, [latestNumber, hasDraft, info.id, openSaveRevision, readOnly]);
  useEffect(() => () => publishDraftStatus(null), []);
  const [highlight, setHighlight] = useState<{ blocks: string[]; ports: string[] } | null>(null);
  const onHighlight = useCallback((h: ChartHighlight | null) => {
    setHighlight(h ? { blocks: h.blocks, ports: h.hops.flatMap((x) => [`${x.block}:${x.inPort}`, `${x.block}:${x.outPort}`]) } : null);
  }, []);

  // the list comes without texts; the page brought the texts of the parts this revision places, and a
  // part placed later has its text fetched then (a project's unused parts never travel to the browser)
  const { data: partsData, error: partsError } = useSWR<{ parts: PartView[] }>(scenarioUrls.parts(projectId), fetchJson, {
    fallbackData: { parts: initialParts },
    revalidateOnFocus: true,
  });
  // texts are keyed as the engine looks them up: `parts/<file>` (version 1) or `parts/v<N>/<file>` (pinned)
  const [texts, setTexts] = useState<Record<string, string>>(() =>
    Object.fromEntries(initialParts.flatMap((p) => [...(p.text !== undefined ? [[pinnedPartPath(`parts/${p.fileName}`, p.partVersion), p.text]] : []), ...Object.entries(p.pinnedTexts ?? {})])),
  );
  const [textError, setTextError] = useState<string | null>(null);
  // the same request as the rules panel's (SWR shares it): the results draw these rules' limit lines
  const { data: rulesData } = useSWR<{ rules: { spec: RuleSpec }[] }>(`/api/projects/${projectId}/rules`, fetchJson, { revalidateOnFocus: true });
  const projectRules = useMemo(() => (rulesData?.rules ?? []).map((r) => r.spec), [rulesData]);
  const requested = useRef(new Set<string>(Object.keys(texts)));
  const neededFiles = useMemo(() => partFilesOf(draft).join("\n"), [draft]);
  useEffect(() => {
    for (const key of neededFiles.split("\n")) {
      if (!key || requested.current.has(key)) continue;
      const { file, version } = parsePinnedPartPath(key);
      const part = (partsData?.parts ?? []).find((p) => `parts/${p.fileName}` === file);
      const id = part?.versions?.find((v) => v.partVersion === version)?.id ?? (part && part.partVersion === version ? part.id : undefined);
      if (!id) continue;
      requested.current.add(key);
      fetchJson<{ part: PartView }>(scenarioUrls.part(projectId, id))
        .then(({ part: full }) => {
          if (full.text !== undefined) setTexts((t) => ({ ...t, [key]: full.text as string }));
        })
        .catch((e: unknown) => {
          requested.current.delete(key); // let a later edit or refresh try again
          setTextError(e instanceof Error ? e.message : String(e));
        });
    }
  }, [neededFiles, partsData, projectId]);
  const parts = useMemo<PartSummary[]>(
    () =>
      (partsData?.parts ?? []).map((p) => {
        const own = Object.fromEntries(Object.entries(texts).filter(([key]) => parsePinnedPartPath(key).file === `parts/${p.fileName}`));
        return { id: p.id, name: p.name, fileName: p.fileName, ports: p.ports, version: p.partVersion, text: texts[pinnedPartPath(`parts/${p.fileName}`, p.partVersion)], texts: own, active: p.active, activeReason: p.activeReason };
      }),
    [partsData, texts],
  );

  // The banner about the draft is there when the page opens on one (or others saved since): it never
  // appears in the middle of typing, which would push the panes down under the pointer. A draft begun
  // on this visit shows in the toolbar: the save state, "Save revision" highlighted, "Discard draft" enabled.
  const draftBanner = hasDraft && !readOnly && (openedDraft !== null || base.number !== latestNumber);
  const toolbarExtras = (
    <>
      <span className="figures text-xs text-muted" aria-label="Revision">
        r{base.number}
      </span>
      {!readOnly ? (
        <Button size="sm" variant={hasDraft ? "primary" : "secondary"} onClick={openSaveRevision} title="Save revision (Ctrl+S or ⌘S)">
          <Save aria-hidden="true" className="h-4 w-4" /> Save revision
        </Button>
      ) : null}
      {!readOnly && !draftBanner ? (
        // always there (disabled without a draft), so that the toolbar does not grow a line as one begins
        <Button size="sm" variant="secondary" onClick={() => setDiscardOpen(true)} disabled={!hasDraft} title={hasDraft ? "Throw away your changes since the revision" : "No draft: nothing to discard"}>
          Discard draft
        </Button>
      ) : null}
      <Button size="sm" variant={historyOpen ? "primary" : "secondary"} onClick={() => setHistoryOpen((o) => !o)} aria-pressed={historyOpen} aria-label="Revision history">
        <History aria-hidden="true" className="h-4 w-4" /> History
      </Button>
    </>
  );

  // the checks pane: what is decided on the saved revision (history, checks, rules, sign-off)
  const side = (
    // data-workspace-keys="off": the chart's single keys (A, F, Delete) do not act from here. Its name
    // says neither "checks" nor "sign-off", which name the regions inside it.
    <PaneBox aria-label="Verdicts and review" data-workspace-keys="off" dense className="flex flex-col gap-3">
      {historyOpen ? (
        <RevisionHistory
          projectId={projectId}
          scenarioId={info.id}
          currentNumber={base.number}
          readOnly={readOnly}
          hasUnsavedEdits={hasDraft || saveState === "unsaved" || saveState === "saving"}
          onRestored={loadLatest}
        />
      ) : null}
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
        hasDraft={hasDraft && !readOnly}
        latestNumber={latestNumber}
        onSaveRevision={openSaveRevision}
        onHighlight={onHighlight}
      />
      <ScenarioRulesPanel projectId={projectId} scenario={draft} onChange={onChange} readOnly={readOnly} />
      {signoff}
    </PaneBox>
  );

  return (
    // data-fill-viewport: from 700 px wide this page fills the viewport and its panes scroll, not the page
    // (app/globals.css)
    <div data-fill-viewport className="flex min-h-0 min-w-0 flex-1 flex-col gap-2">
      <div className="flex flex-wrap items-baseline gap-x-3 gap-y-1">
        <h2 className="text-lg font-semibold text-ink">{info.name}</h2>
        <Link href={`/projects/${projectId}/scenarios`} className="text-sm text-muted underline underline-offset-4 hover:text-ink">
          All scenarios
        </Link>
        <a href={scenarioUrls.solve(projectId, info.id, "touchstone", base.id)} className="text-sm text-muted underline underline-offset-4 hover:text-ink" download>
          Composite of r{base.number} (Touchstone)
        </a>
      </div>
      {offeredDraft ? (
        <Alert
          tone="warn"
          title="Unsaved edits from an earlier visit"
          actions={
            <div className="flex flex-wrap gap-2">
              <Button size="sm" onClick={() => void restoreOffered().catch((e: unknown) => reportError(e instanceof Error ? e.message : String(e)))}>
                Restore my edits
              </Button>
              <Button size="sm" variant="secondary" onClick={dropOffered}>
                Discard them
              </Button>
            </div>
          }
        >
          This browser kept edits to r{offeredDraft.baseNumber} made {formatDate(offeredDraft.editedAt)} that the server never received (it could not be reached). Restored, they become your working draft.
        </Alert>
      ) : null}
      {draftBanner ? (
        <Alert
          tone="info"
          title={`Working draft: your changes are not in revision ${latestNumber} yet`}
          actions={
            <div className="flex flex-wrap gap-2">
              <Button size="sm" onClick={openSaveRevision}>
                Save revision…
              </Button>
              <Button size="sm" variant="secondary" onClick={() => setDiscardOpen(true)}>
                Discard draft
              </Button>
            </div>
          }
        >
          {openedDraft ? `Reopened your draft from ${formatDate(openedDraft.updatedAt)}. ` : ""}
          Your draft is kept for you on the server (on any device) and only you see it
          {base.number !== latestNumber ? `; it started from r${base.number}, and saving merges it with what was saved since` : ""}. Save a revision (<Kbd>Ctrl</Kbd> <Kbd>S</Kbd>) to share it, run stored checks on it or request sign-off.
        </Alert>
      ) : null}
      {savedNotice ? <Alert tone="success">{savedNotice}</Alert> : null}
      {saveError ? (
        <Alert tone="error" title="The draft was not saved" actions={!readOnly ? <Button size="sm" variant="secondary" onClick={saveDraftNow}>Try again</Button> : undefined}>
          {saveError}
        </Alert>
      ) : null}
      {saveState === "local" ? (
        <Alert tone="warn" title="The server could not be reached" actions={<Button size="sm" variant="secondary" onClick={saveDraftNow}>Try again</Button>}>
          Your edits are kept in this browser and go to your working draft when the server answers.
        </Alert>
      ) : null}
      {partsError ? <Alert tone="warn" title="The parts could not be loaded">{partsError instanceof Error ? partsError.message : String(partsError)}</Alert> : null}
      {textError && !partsError ? <Alert tone="warn" title="A placed part's data could not be loaded">{textError}</Alert> : null}
      {warnings.length > 0 && draft.blocks.length > 0 ? (
        <p className="text-xs text-warn-strong" aria-label="Revision warnings">
          The revision is incomplete: {warnings.join(" ")}
        </p>
      ) : null}
      <div className="flex min-h-0 flex-1 flex-col">
        <Workspace key={generation} scenario={draft} parts={parts} readOnly={readOnly} onChange={onChange} saveState={saveState} toolbarExtras={toolbarExtras} highlight={highlight} side={side} projectRules={projectRules} />
      </div>
      <SaveRevisionDialog
        open={saveOpen}
        onClose={() => setSaveOpen(false)}
        onSave={onSave}
        baseNumber={base.number}
        baseContent={baseContent}
        draft={draft}
        error={saveDialogError}
        submitRef={submitSaveRef}
      />
      <MergeConflictDialog conflicts={merge?.conflicts ?? null} current={merge?.current ?? null} onClose={() => setMerge(null)} onResolve={onResolve} error={saveDialogError} />
      <ConfirmDialog
        open={discardOpen}
        onClose={() => setDiscardOpen(false)}
        onConfirm={async () => {
          try {
            await discardDraft();
            setDiscardOpen(false);
          } catch (e) {
            reportError(e instanceof Error ? e.message : String(e));
            setDiscardOpen(false);
          }
        }}
        title="Discard your draft?"
        description={`Your changes since r${base.number} are thrown away and the chart shows revision ${latestNumber}. This cannot be undone.`}
        confirmLabel="Discard draft"
      />
    </div>
  );
}
