"use client";

import { useCallback, useEffect, useRef, useState } from "react";
import type { Scenario } from "@/engine/types";
import type { SaveState } from "@/components/scenario-editor";
import { ApiError, requestJson, scenarioUrls } from "@/lib/browser/api-client";
import type { RevisionView, ScenarioView } from "@/lib/domain/scenarios/types";

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
};

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

  // refs so that timers and in-flight saves see the latest values
  const draftRef = useRef(draft);
  const baseRef = useRef(base);
  const dirtyRef = useRef(false);
  const savingRef = useRef(false);
  const conflictRef = useRef<SaveConflict | null>(null);
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
  }, [projectId, readOnly, scenarioId, schedule]);

  useEffect(() => {
    saveRef.current = save;
  }, [save]);

  useEffect(
    () => () => {
      if (timer.current !== null) window.clearTimeout(timer.current);
    },
    [],
  );

  const edit = useCallback(
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
  }, [projectId, scenarioId]);

  const saveNow = useCallback(() => {
    if (timer.current !== null) window.clearTimeout(timer.current);
    timer.current = null;
    void save();
  }, [save]);

  const forget = useCallback(() => {
    dirtyRef.current = false;
  }, []);

  return { draft, base, saveState, conflict, saveError, reportError: setSaveError, warnings, generation, edit, saveNow, loadLatest, forget };
}
