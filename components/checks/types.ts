import type { Verdict } from "@/engine/checks/types";
import type { CheckName } from "./check-inputs";
import type { RuleSource } from "@/components/rules/rule-spec";

/** A rule left out of a run because the scenario lacks a system port it names. */
export type SkippedRule = { id: string; source: RuleSource; reason: string };

/**
 * What a stored run's `figures` hold: a one-line headline, the engine's result for the check as it
 * returned it (plain JSON, see engine/checks), and for rule-based checks where each rule came from.
 */
export type CheckFigures = {
  headline: string;
  result: unknown;
  ruleSources?: { id: string; source: RuleSource }[];
  skipped?: SkippedRule[];
};

/** A run in the history (dates as ISO strings on the client). */
export type CheckRunSummary = {
  id: string;
  scenarioId: string;
  revisionId: string | null;
  revisionNumber: number | null;
  check: CheckName;
  inputs: Record<string, unknown>;
  verdict: Verdict;
  headline: string;
  userName: string | null;
  createdAt: string | Date;
};

export type CheckRunView = CheckRunSummary & { figures: CheckFigures };
