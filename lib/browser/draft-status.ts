import { useSyncExternalStore } from "react";

/**
 * What the scenario page's parts outside the workspace (the sign-off panel) need to know of the
 * person's working draft: whether it holds changes not in a revision, the revision it starts from, and
 * how to open "Save revision". The workspace publishes it; one scenario page at a time.
 */
export type DraftStatus = { scenarioId: string; hasDraft: boolean; latestNumber: number; openSaveRevision: (() => void) | null };

let current: DraftStatus | null = null;
const listeners = new Set<() => void>();

export function publishDraftStatus(status: DraftStatus | null): void {
  const same = current && status && current.scenarioId === status.scenarioId && current.hasDraft === status.hasDraft && current.latestNumber === status.latestNumber && current.openSaveRevision === status.openSaveRevision;
  if (same || (current === null && status === null)) return;
  current = status;
  for (const l of listeners) l();
}

function subscribe(listener: () => void): () => void {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

/** The published status of this scenario's draft (null before the workspace mounted, or another scenario). */
export function useDraftStatus(scenarioId: string): DraftStatus | null {
  const status = useSyncExternalStore(
    subscribe,
    () => current,
    () => null,
  );
  return status && status.scenarioId === scenarioId ? status : null;
}
