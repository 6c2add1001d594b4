import type { Scenario } from "@/engine/types";

/**
 * The working draft of a scenario: edits not yet saved as a revision, kept in this browser's
 * localStorage so that they survive a reload, a closed tab or a failed save, and are offered back when
 * the scenario is opened again. The server has no draft concept; one draft per scenario, with the
 * revision the edits started from (restoring onto a newer revision gives the usual save conflict).
 */
export type WorkingDraft = {
  scenarioId: string;
  baseRevisionId: string;
  baseNumber: number;
  scenario: Scenario;
  /** ISO time of the last edit */
  editedAt: string;
};

const PREFIX = "portolan:working-draft:";

function storage(): Storage | null {
  try {
    return typeof window === "undefined" ? null : window.localStorage;
  } catch {
    return null; // storage disabled (private mode, policy): drafts are then only kept in memory
  }
}

export function readWorkingDraft(scenarioId: string): WorkingDraft | null {
  const raw = storage()?.getItem(PREFIX + scenarioId);
  if (!raw) return null;
  try {
    const value = JSON.parse(raw) as Partial<WorkingDraft>;
    if (value.scenarioId !== scenarioId || typeof value.baseRevisionId !== "string" || typeof value.baseNumber !== "number" || !value.scenario || typeof value.editedAt !== "string") return null;
    if (!Array.isArray((value.scenario as Scenario).blocks)) return null;
    return value as WorkingDraft;
  } catch {
    return null;
  }
}

export function writeWorkingDraft(draft: WorkingDraft): void {
  try {
    storage()?.setItem(PREFIX + draft.scenarioId, JSON.stringify(draft));
  } catch {
    // quota exceeded: the edits remain in the page and the leave guard still asks
  }
}

export function clearWorkingDraft(scenarioId: string): void {
  storage()?.removeItem(PREFIX + scenarioId);
}
