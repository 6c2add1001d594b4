"use client";

import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import type { Scenario } from "@/engine/types";
import type { SaveState } from "@/components/scenario-editor";
import { ApiError, requestJson, scenarioUrls } from "@/lib/browser/api-client";
import type { RevisionView, ScenarioDraftView, ScenarioView } from "@/lib/domain/scenarios/types";
import { mergeScenarios, type MergeChoice, type MergeConflict } from "@/lib/domain/scenarios/merge";
import { clearWorkingDraft, readWorkingDraft, writeWorkingDraft, type WorkingDraft } from "@/lib/browser/working-draft";

/** Wait after the last edit before the working draft is written, ms. */
const AUTOSAVE_DELAY_MS = 1500;

/** A deliberate save merged with a revision someone saved after this page's base. */
export type SaveMerge = { number: number; authorName: string | null; settled: number };

/** What "Save revision" came to: saved (perhaps merged), or real conflicts to settle (mine or theirs). */
export type SaveRevisionOutcome =
  | { ok: true; number: number; merged: SaveMerge | null }
  | { ok: false; conflicts: MergeConflict[]; current: { number: number; authorName: string | null } };

export type Autosave = {
  /** the scenario as edited (the working draft) */
  draft: Scenario;
  /** the revision the draft starts from */
  base: { id: string; number: number };
  /** the base revision's content (what the draft is compared with) */
  baseContent: Scenario;
  /** the newest revision this page knows of */
  latestNumber: number;
  /** true when the draft holds changes not in its base revision */
  hasDraft: boolean;
  saveState: SaveState;
  saveError: string | null;
  reportError: (message: string | null) => void;
  /** the base revision's engine warnings */
  warnings: string[];
  /** changes when the edits are replaced (a load, a merge): a fresh editor (and undo history) */
  generation: number;
  /** an edit: written to the working draft AUTOSAVE_DELAY_MS after the last one */
  edit: (next: Scenario) => void;
  /** write the working draft now instead of waiting (try again after an error) */
  saveDraftNow: () => void;
  /** save the draft as a named revision; merges with revisions saved since the base */
  saveRevision: (note: string, resolutions?: Record<string, MergeChoice>) => Promise<SaveRevisionOutcome>;
  /** replace the edits with the latest saved revision (after a restore or a discard) */
  loadLatest: () => Promise<void>;
  /** throw the working draft away (server and this browser) and load the latest revision */
  discardDraft: () => Promise<void>;
  /** the edits went elsewhere (saved as a new scenario): leaving no longer asks */
  forget: () => void;
  /** the server draft the page opened with (its time and base), for the notice */
  openedDraft: ScenarioDraftView | null;
  /** edits kept only in this browser (the server could not be reached), newer than the server's draft */
  offeredDraft: WorkingDraft | null;
  /** put the offered edits back on the chart (written to the working draft as usual after that) */
  restoreOffered: () => Promise<void>;
  /** throw the offered edits away */
  dropOffered: () => void;
};

/** Asked before an in-app link leaves the page while edits are not yet in the working draft. */
export const LEAVE_QUESTION = "This scenario has unsaved edits not yet stored as your working draft. Leave the page anyway? They are kept in this browser and offered back when you open the scenario again.";

const sameContent = (a: Scenario, b: Scenario) => a === b || JSON.stringify(a) === JSON.stringify(b);

/**
 * The scenario page's working draft and deliberate saves, in one place. Edits go to the person's working
 * draft on the server (PUT …/draft) 1.5 s after the last one, never to a revision; every edit is also
 * kept in localStorage until the server has it, the fallback when the server cannot be reached. A
 * revision is written only by saveRevision (a note, "Save revision" or Ctrl/Cmd+S), which merges with
 * what others saved since the base and returns real conflicts for the person to settle. States: saved
 * (nothing beyond the base revision) → (edit) unsaved → saving → draft, or local (kept in this browser
 * only), or error (the server refused).
 */
export function useAutosave({
  projectId,
  scenarioId,
  revision,
  initialDraft,
  readOnly,
}: {
  projectId: string;
  scenarioId: string;
  revision: RevisionView;
  /** the person's working draft on the server when the page was opened, with its base revision's content */
  initialDraft: (ScenarioDraftView & { baseContent: Scenario }) | null;
  readOnly: boolean;
}): Autosave {
  const opened = !readOnly && initialDraft ? initialDraft : null;
  const [draft, setDraft] = useState<Scenario>(opened ? opened.content : revision.content);
  const [base, setBase] = useState<{ id: string; number: number }>(opened ? { id: opened.baseRevisionId, number: opened.baseNumber } : { id: revision.id, number: revision.number });
  const [baseContent, setBaseContent] = useState<Scenario>(opened ? opened.baseContent : revision.content);
  const [latestNumber, setLatestNumber] = useState(revision.number);
  const [saveState, setSaveState] = useState<SaveState>(opened ? "draft" : "saved");
  const [saveError, setSaveError] = useState<string | null>(null);
  const [warnings, setWarnings] = useState<string[]>(revision.warnings);
  const [generation, setGeneration] = useState(0);
  const [offeredDraft, setOfferedDraft] = useState<WorkingDraft | null>(null);
  const [openedDraft, setOpenedDraft] = useState<ScenarioDraftView | null>(opened);

  // refs so that timers and in-flight requests see the latest values
  const draftRef = useRef(draft);
  const baseRef = useRef(base);
  const baseContentRef = useRef(baseContent);
  const dirtyRef = useRef(false);
  const savingRef = useRef(false);
  const timer = useRef<number | null>(null);
  const flushRef = useRef<() => Promise<void>>(async () => undefined);
  /** the draft write under way, if any: a revision save waits for it, so that it cannot land after the save */
  const inFlight = useRef<Promise<void> | null>(null);

  const hasDraft = useMemo(() => !sameContent(draft, baseContent), [draft, baseContent]);

  // every edit not yet on the server is also kept in this browser
  const keepLocal = useCallback(() => {
    writeWorkingDraft({ scenarioId, baseRevisionId: baseRef.current.id, baseNumber: baseRef.current.number, scenario: draftRef.current, editedAt: new Date().toISOString() });
  }, [scenarioId]);

  const schedule = useCallback(() => {
    if (timer.current !== null) window.clearTimeout(timer.current);
    timer.current = window.setTimeout(() => {
      timer.current = null;
      void flushRef.current();
    }, AUTOSAVE_DELAY_MS);
  }, []);

  /** Write the working draft (or drop it when the edits came back to the base revision). */
  const flush = useCallback(async () => {
    if (readOnly || savingRef.current || !dirtyRef.current) return;
    savingRef.current = true;
    const sent = draftRef.current;
    const unchanged = sameContent(sent, baseContentRef.current);
    setSaveState("saving");
    let refused = false;
    try {
      const request = unchanged
        ? requestJson<void>(scenarioUrls.draft(projectId, scenarioId), { method: "DELETE" })
        : requestJson<void>(scenarioUrls.draft(projectId, scenarioId), { method: "PUT", json: { baseRevisionId: baseRef.current.id, scenario: sent } }).then(() => undefined);
      inFlight.current = request.catch(() => undefined);
      await request;
      dirtyRef.current = draftRef.current !== sent;
      setSaveError(null);
      if (dirtyRef.current) setSaveState("unsaved");
      else {
        clearWorkingDraft(scenarioId);
        setSaveState(unchanged ? "saved" : "draft");
      }
    } catch (e) {
      if (e instanceof ApiError && e.status < 500) {
        // refused (a role, bad content): retrying will not help; the edits stay in this browser
        refused = true;
        setSaveError(e.message);
        setSaveState("error");
      } else {
        // unreachable or failing server: the edits are in localStorage; the next edit or "Try again" retries
        setSaveError(null);
        setSaveState("local");
      }
    } finally {
      savingRef.current = false;
      inFlight.current = null;
    }
    if (dirtyRef.current && !refused && draftRef.current !== sent) schedule();
  }, [projectId, readOnly, scenarioId, schedule]);

  useEffect(() => {
    flushRef.current = flush;
  }, [flush]);

  // Leaving the page inside the app unmounts the hook: pending edits go to the draft now rather than
  // being dropped with the timer; localStorage keeps them until the server has them.
  useEffect(
    () => () => {
      if (timer.current !== null) window.clearTimeout(timer.current);
      timer.current = null;
      if (dirtyRef.current) void flushRef.current();
    },
    [],
  );

  // Edits this browser kept while the server could not be reached are offered back when newer than the
  // server's draft (after mount: localStorage is browser-only).
  useEffect(() => {
    if (readOnly) return;
    const stored = readWorkingDraft(scenarioId);
    if (!stored) return;
    const serverTime = opened ? Date.parse(opened.updatedAt) : 0;
    if (sameContent(stored.scenario, draftRef.current) || Date.parse(stored.editedAt) <= serverTime) {
      clearWorkingDraft(scenarioId); // nothing in it that the server does not have
      return;
    }
    // One extra render on opening the page: the server cannot know this browser's storage.
    setOfferedDraft(stored);
    // only on opening the page
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);

  const edit = useCallback(
    (next: Scenario) => {
      if (readOnly) return;
      draftRef.current = next;
      dirtyRef.current = true;
      setDraft(next);
      keepLocal();
      setSaveState("unsaved");
      schedule();
    },
    [keepLocal, readOnly, schedule],
  );

  // leaving with edits not yet in the working draft asks first
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

  /** Put a revision on the chart as the base, with nothing beyond it. */
  const adopt = useCallback(
    (saved: RevisionView) => {
      draftRef.current = saved.content;
      dirtyRef.current = false;
      baseRef.current = { id: saved.id, number: saved.number };
      baseContentRef.current = saved.content;
      setDraft(saved.content);
      setBase(baseRef.current);
      setBaseContent(saved.content);
      setLatestNumber((n) => Math.max(n, saved.number));
      setWarnings(saved.warnings);
      setSaveError(null);
      setSaveState("saved");
      setOpenedDraft(null);
      clearWorkingDraft(scenarioId);
    },
    [scenarioId],
  );

  const loadLatest = useCallback(async () => {
    const latest = await requestJson<{ scenario: ScenarioView; revision: RevisionView }>(scenarioUrls.one(projectId, scenarioId));
    adopt(latest.revision);
    setLatestNumber(latest.revision.number);
    setGeneration((g) => g + 1); // a fresh undo history: the old one describes replaced edits
  }, [adopt, projectId, scenarioId]);

  const saveRevision = useCallback(
    async (note: string, resolutions?: Record<string, MergeChoice>): Promise<SaveRevisionOutcome> => {
      if (timer.current !== null) window.clearTimeout(timer.current);
      timer.current = null;
      // a draft write still under way would otherwise land after the save and bring the draft back
      if (inFlight.current) await inFlight.current;
      const sent = draftRef.current;
      const sentBase = baseRef.current;
      try {
        const { revision: saved, merged } = await requestJson<{ revision: RevisionView; merged: SaveMerge | null }>(scenarioUrls.revisions(projectId, scenarioId), {
          method: "POST",
          json: { baseRevisionId: sentBase.id, scenario: sent, note: note.trim() || null, ...(resolutions ? { resolutions } : {}) },
        });
        const meanwhile = draftRef.current;
        adopt(saved);
        if (meanwhile !== sent) {
          // edits made while the save was under way stay, on top of what was saved (the saved revision
          // may hold someone else's merged edits: merge rather than overwrite them)
          const onTop = mergeScenarios(sent, meanwhile, saved.content);
          draftRef.current = onTop.ok ? onTop.scenario : meanwhile;
          dirtyRef.current = true;
          setDraft(draftRef.current);
          setSaveState("unsaved");
          keepLocal();
          schedule();
        }
        if (merged || meanwhile !== sent) setGeneration((g) => g + 1); // the chart shows content it did not edit
        return { ok: true, number: saved.number, merged };
      } catch (e) {
        if (e instanceof ApiError && e.status === 409) {
          const body = e.body as { conflicts?: MergeConflict[]; current?: { number: number; authorName: string | null } } | null;
          if (body?.conflicts && body.current) {
            setLatestNumber((n) => Math.max(n, body.current?.number ?? n));
            return { ok: false, conflicts: body.conflicts, current: body.current };
          }
        }
        throw e;
      }
    },
    [adopt, keepLocal, projectId, scenarioId, schedule],
  );

  const saveDraftNow = useCallback(() => {
    if (timer.current !== null) window.clearTimeout(timer.current);
    timer.current = null;
    dirtyRef.current = dirtyRef.current || hasDraft;
    void flush();
  }, [flush, hasDraft]);

  const discardDraft = useCallback(async () => {
    if (timer.current !== null) window.clearTimeout(timer.current);
    timer.current = null;
    dirtyRef.current = false;
    await requestJson(scenarioUrls.draft(projectId, scenarioId), { method: "DELETE" });
    clearWorkingDraft(scenarioId);
    setOfferedDraft(null);
    await loadLatest();
  }, [loadLatest, projectId, scenarioId]);

  const forget = useCallback(() => {
    dirtyRef.current = false;
    clearWorkingDraft(scenarioId);
  }, [scenarioId]);

  const restoreOffered = useCallback(async () => {
    if (!offeredDraft || readOnly) return;
    // The edits go back with the revision they started from as their base, so that "Save revision"
    // merges them with whatever was saved since rather than undoing it.
    if (offeredDraft.baseRevisionId !== baseRef.current.id) {
      const old = await requestJson<{ revision: RevisionView }>(`${scenarioUrls.one(projectId, scenarioId)}?revision=${encodeURIComponent(offeredDraft.baseRevisionId)}`);
      baseRef.current = { id: old.revision.id, number: old.revision.number };
      baseContentRef.current = old.revision.content;
      setBase(baseRef.current);
      setBaseContent(old.revision.content);
    }
    draftRef.current = offeredDraft.scenario;
    dirtyRef.current = true;
    setDraft(offeredDraft.scenario);
    setOfferedDraft(null);
    setSaveState("unsaved");
    setGeneration((g) => g + 1);
    schedule();
  }, [offeredDraft, projectId, readOnly, scenarioId, schedule]);

  const dropOffered = useCallback(() => {
    clearWorkingDraft(scenarioId);
    setOfferedDraft(null);
  }, [scenarioId]);

  return {
    draft,
    base,
    baseContent,
    latestNumber,
    hasDraft,
    saveState,
    saveError,
    reportError: setSaveError,
    warnings,
    generation,
    edit,
    saveDraftNow,
    saveRevision,
    loadLatest,
    discardDraft,
    forget,
    openedDraft,
    offeredDraft,
    restoreOffered,
    dropOffered,
  };
}
