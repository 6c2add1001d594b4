/**
 * Undo/redo as a history of Scenario snapshots. Scenarios are immutable values, so a snapshot is just a
 * reference. Edits that arrive in a burst with the same key (typing in one field) fold into one step.
 */
import type { Scenario } from "@/engine/types";

export type History = {
  past: Scenario[];
  future: Scenario[];
  /** key and time (ms) of the last recorded edit, for folding bursts */
  lastKey?: string;
  lastAt?: number;
};

/** Most undo steps kept. */
export const HISTORY_LIMIT = 200;

/** Edits with the same key closer than this (ms) fold into one undo step. */
export const FOLD_WINDOW_MS = 1500;

export function createHistory(): History {
  return { past: [], future: [] };
}

/**
 * Records that the scenario is about to change from `previous`. Clears the redo list.
 * @param options.key - edits with the same key within FOLD_WINDOW_MS fold into the step already recorded
 * @param options.at - time of the edit, ms
 */
export function recordEdit(history: History, previous: Scenario, options: { key?: string; at?: number } = {}): History {
  const at = options.at ?? Date.now();
  const folds =
    options.key !== undefined &&
    options.key === history.lastKey &&
    history.lastAt !== undefined &&
    at - history.lastAt < FOLD_WINDOW_MS &&
    history.past.length > 0;
  const past = folds ? history.past : [...history.past, previous].slice(-HISTORY_LIMIT);
  return { past, future: [], lastKey: options.key, lastAt: at };
}

/** Steps back: returns the scenario to show and the new history, or null when there is nothing to undo. */
export function undo(history: History, current: Scenario): { history: History; scenario: Scenario } | null {
  if (history.past.length === 0) return null;
  const scenario = history.past[history.past.length - 1];
  return {
    scenario,
    history: { past: history.past.slice(0, -1), future: [current, ...history.future] },
  };
}

/** Steps forward again after an undo; null when there is nothing to redo. */
export function redo(history: History, current: Scenario): { history: History; scenario: Scenario } | null {
  if (history.future.length === 0) return null;
  const [scenario, ...rest] = history.future;
  return {
    scenario,
    history: { past: [...history.past, current].slice(-HISTORY_LIMIT), future: rest },
  };
}
