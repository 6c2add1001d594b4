import type { AllChecksResult, DriveResult, LeakTraceResult, LedgerResult, RuleResult, StabilityResult, StateSweepResult, Verdict } from "@/engine/checks";
import type { RuleSource } from "@/lib/domain/rules/merge";
import type { LineupResult } from "@/engine/lineup";
import type { CheckName } from "./inputs";

/** A rule left out of a run because the scenario lacks a system port it names. */
export type SkippedRule = { id: string; source: RuleSource; reason: string };

/** The engine's result of each check, by check name (engine/checks; docs/checks.md). */
export type CheckResults = {
  isolation: RuleResult;
  match: RuleResult;
  insertion_loss: RuleResult;
  leak_trace: LeakTraceResult;
  power_ledger: LedgerResult;
  drive: DriveResult;
  state_sweep: StateSweepResult;
  stability: StabilityResult[];
  all_rules: AllChecksResult;
  lineup: LineupResult;
};

/**
 * What a stored run's `figures` hold: a one-line headline, the engine's result for the check as it
 * returned it (plain JSON, see engine/checks), and for rule-based checks where each rule came from.
 */
export type CheckFigures<K extends CheckName = CheckName> = {
  headline: string;
  result: CheckResults[K];
  ruleSources?: { id: string; source: RuleSource }[];
  skipped?: SkippedRule[];
};

/** A check's verdict and figures, discriminated by the check's name. */
export type CheckOutcome = { [K in CheckName]: { check: K; verdict: Verdict; figures: CheckFigures<K> } }[CheckName];

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

/** A run with its figures; `check` tells which result `figures.result` holds. */
export type CheckRunView = { [K in CheckName]: Omit<CheckRunSummary, "check"> & { check: K; figures: CheckFigures<K> } }[CheckName];
