"use client";

import { useCallback, useEffect, useRef, useState } from "react";
import type { Scenario } from "@/engine/types";
import type { SaveState } from "@/components/scenario-editor";
import { ApiError, requestJson, scenarioUrls } from "@/lib/browser/api-client";
import type { RevisionView, ScenarioView } from "@/lib/domain/scenarios/types";
import { clearWorkingDraft, readWorkingDraft, writeWorkingDraft, type WorkingDraft } from "@/lib/browser/working-draft";

/** Wait after the last edit before saving, ms. */
const AUTOSAVE_DELAY_MS = 1500;

/** Someone saved a revision after the one the edits started from. */
export type SaveConflict = { revisionId: string; number: number; authorName: string | null; message: string };

export type Autosave = {
  /** the scenario as edited */
  draft: Scenario;
  /** the saved revision the edits start from */
  base: { id: string; number: number };
  saveState: SaveState;
  conflict: SaveConflict | null;
  saveError: string | null;
  reportError: (message: string | null) => void;
  /** the saved revision's engine warnings */
  warnings: string[];
  /** changes when the edits are replaced from the server: a fresh editor (and undo history) */
  generation: number;
  /** an edit: saved AUTOSAVE_DELAY_MS after the last one, unless a conflict holds the edits */
  edit: (next: Scenario) => void;
  /** save now instead of waiting */
  saveNow: () => void;
  /** replace the edits with the latest saved revision (after a conflict or a restore) */
  loadLatest: () => Promise<void>;
  /** the edits went elsewhere (saved as a new scenario): leaving no longer asks */
  forget: () => void;
  /** unsaved edits of an earlier visit (reload, closed tab, failed save), kept in this browser */
  offeredDraft: WorkingDraft | null;
  /** put the offered draft back on the chart as unsaved edits (saved as usual after that) */
  restoreDraft: () => void;
  /** throw the offered draft away */
  discardDraft: () => void;
};

/** Asked before an in-app link leaves the page while edits are unsaved. */
export const LEAVE_QUESTION = "This scenario has unsaved edits. Leave the page anyway? They are kept in this browser as a working draft and offered back when you open the scenario again.";

/**
 * The autosave machine of the scenario page, in one place. States: saved → (edit) unsaved → (delay or
 * save now) saving → saved, or unsaved again when edits came in meanwhile (they go out next), or error
 * (try again), or conflict (a stale base: 409 from the revisions route). A conflict keeps the edits and
 * stops saving until loadLatest replaces them or forget lets them go. Leaving the page with unsaved
 * edits asks first.
 */
export function useAutosave({ projectId, scenarioId, revision, readOnly }: { projectId: string; scenarioId: string; revision: RevisionView; readOnly: boolean }): Autosave {
  const [draft, setDraft] = useState<Scenario>(revision.content);
  const [base, setBase] = useState<{ id: string; number: number }>({ id: revision.id, number: revision.number });
  const [saveState, setSaveState] = useState<SaveState>("saved");
  const [conflict, setConflict] = useState<SaveConflict | null>(null);
  const [saveError, setSaveError] = useState<string | null>(null);
  const [warnings, setWarnings] = useState<string[]>(revision.warnings);
  const [generation, setGeneration] = useState(0);
  const [offeredDraft, setOfferedDraft] = useState<WorkingDraft | null>(null);

  // refs so that timers and in-flight saves see the latest values
  const draftRef = useRef(draft);
  const baseRef = useRef(base);
  const dirtyRef = useRef(false);
  const savingRef = useRef(false);
  const conflictRef = useRef<SaveConflict | null>(null);
  const timer = useRef<number | null>(null);
  const saveRef = useRef<() => Promise<void>>(async () => undefined);

  // every unsaved edit is also the working draft in localStorage, until a save catches up with it
  const keepDraft = useCallback(() => {
    writeWorkingDraft({ scenarioId, baseRevisionId: baseRef.current.id, baseNumber: baseRef.current.number, scenario: draftRef.current, editedAt: new Date().toISOString() });
  }, [scenarioId]);

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
      const { revision: saved } = await requestJson<{ revision: RevisionView }>(scenarioUrls.revisions(projectId, scenarioId), {
        method: "POST",
        json: { baseRevisionId: baseRef.current.id, scenario: sent },
      });
      baseRef.current = { id: saved.id, number: saved.number };
      setBase(baseRef.current);
      setWarnings(saved.warnings);
      setSaveError(null);
      dirtyRef.current = draftRef.current !== sent;
      setSaveState(dirtyRef.current ? "unsaved" : "saved");
      if (dirtyRef.current) keepDraft();
      else clearWorkingDraft(scenarioId);
    } catch (e) {
      if (e instanceof ApiError && e.status === 409) {
        const current = (e.body as { current?: { revisionId: string; number: number; authorName: string | null } } | null)?.current;
        const c: SaveConflict = { revisionId: current?.revisionId ?? "", number: current?.number ?? 0, authorName: current?.authorName ?? null, message: e.message };
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
  }, [keepDraft, projectId, readOnly, scenarioId, schedule]);

  useEffect(() => {
    saveRef.current = save;
  }, [save]);

  // Leaving the page inside the app (another tab of the project, the helm) unmounts the hook: the
  // pending edits go out now rather than being dropped with the timer; the working draft stays until
  // the save succeeds.
  useEffect(
    () => () => {
      if (timer.current !== null) window.clearTimeout(timer.current);
      timer.current = null;
      if (dirtyRef.current && !conflictRef.current) void saveRef.current();
    },
    [],
  );

  // An earlier visit's unsaved edits are offered back (after mount: localStorage is browser-only).
  useEffect(() => {
    if (readOnly) return;
    const stored = readWorkingDraft(scenarioId);
    if (!stored) return;
    if (JSON.stringify(stored.scenario) === JSON.stringify(revision.content)) {
      clearWorkingDraft(scenarioId); // nothing in it that the revision does not have
      return;
    }
    // One extra render on opening the page: the server cannot know this browser's storage, so the
    // offer cannot be in the first (hydrated) render.
    // eslint-disable-next-line react-hooks/set-state-in-effect
    setOfferedDraft(stored);
    // only on opening the page: later revisions come from this page's own saves
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);

  const edit = useCallback(
    (next: Scenario) => {
      if (readOnly) return;
      draftRef.current = next;
      dirtyRef.current = true;
      setDraft(next);
      keepDraft();
      if (conflictRef.current) return; // keep the edits; the banner decides what happens to them
      setSaveState("unsaved");
      schedule();
    },
    [keepDraft, readOnly, schedule],
  );

  // leaving with unsaved edits asks first
  useEffect(() => {
    const onBeforeUnload = (event: BeforeUnloadEvent) => {
      if (!dirtyRef.current) return;
      event.preventDefault();
    };
    // In-app links (Next's <Link> included) do not fire beforeunload: a click on a link that leaves this
    // page asks too. Capture phase on the document runs before React's handlers, so a "no" stops both
    // the client-side navigation and the browser's own.
    const onClick = (event: MouseEvent) => {
      if (!dirtyRef.current || event.defaultPrevented || event.button !== 0) return;
      if (event.metaKey || event.ctrlKey || event.shiftKey || event.altKey) return; // a new tab or window: this page stays
      const anchor = (event.target as Element | null)?.closest?.("a[href]");
      if (!(anchor instanceof HTMLAnchorElement)) return;
      if (anchor.hasAttribute("download") || (anchor.target && anchor.target !== "_self")) return;
      const url = new URL(anchor.href, window.location.href);
      if (url.origin === window.location.origin && url.pathname === window.location.pathname) return; // same page (hash, query)
      if (window.confirm(LEAVE_QUESTION)) return;
      event.preventDefault();
      event.stopPropagation();
    };
    window.addEventListener("beforeunload", onBeforeUnload);
    document.addEventListener("click", onClick, true);
    return () => {
      window.removeEventListener("beforeunload", onBeforeUnload);
      document.removeEventListener("click", onClick, true);
    };
  }, []);

  const loadLatest = useCallback(async () => {
    const latest = await requestJson<{ scenario: ScenarioView; revision: RevisionView }>(scenarioUrls.one(projectId, scenarioId));
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
    setGeneration((g) => g + 1); // a fresh undo history: the old one describes discarded edits
    clearWorkingDraft(scenarioId);
  }, [projectId, scenarioId]);

  const saveNow = useCallback(() => {
    if (timer.current !== null) window.clearTimeout(timer.current);
    timer.current = null;
    void save();
  }, [save]);

  const forget = useCallback(() => {
    dirtyRef.current = false;
    clearWorkingDraft(scenarioId);
  }, [scenarioId]);

  const restoreDraft = useCallback(() => {
    if (!offeredDraft || readOnly) return;
    // The edits go back onto the revision they started from: if that is not the latest any more, the
    // save answers with the usual conflict, which offers reload or "save as new scenario".
    draftRef.current = offeredDraft.scenario;
    baseRef.current = { id: offeredDraft.baseRevisionId, number: offeredDraft.baseNumber };
    dirtyRef.current = true;
    setDraft(offeredDraft.scenario);
    setBase(baseRef.current);
    setOfferedDraft(null);
    setSaveState("unsaved");
    setGeneration((g) => g + 1);
    schedule();
  }, [offeredDraft, readOnly, schedule]);

  const discardDraft = useCallback(() => {
    clearWorkingDraft(scenarioId);
    setOfferedDraft(null);
  }, [scenarioId]);

  return { draft, base, saveState, conflict, saveError, reportError: setSaveError, warnings, generation, edit, saveNow, loadLatest, forget, offeredDraft, restoreDraft, discardDraft };
}
