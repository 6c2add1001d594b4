import type { AllChecksResult, DriveResult, LeakTraceResult, LedgerResult, RuleResult, StabilityResult, StateSweepResult, Verdict } from "@/engine/checks";
import type { EffectiveRuleSet, RuleSource } from "@/engine/checks";
import type { LineupResult } from "@/engine/lineup";
import type { SpreadResult } from "@/engine/spread";
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
  spread: SpreadResult;
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
  /** what the verdict is of: the revision's content hash, the effective rule set's hash, the engine version (null for older runs) */
  contentHash: string | null;
  rulesHash: string | null;
  engineVersion: string | null;
  /** why the verdict is no longer current for its revision (rules changed, engine updated…); empty when current */
  stale: string[];
  /** the run is of the scenario's latest revision */
  latest: boolean;
  userName: string | null;
  createdAt: string | Date;
};

/** A run with its figures; `check` tells which result `figures.result` holds. */
export type CheckRunView = { [K in CheckName]: Omit<CheckRunSummary, "check"> & { check: K; figures: CheckFigures<K> } }[CheckName];

/** A run of one named check. */
export type CheckRunOf<K extends CheckName> = Extract<CheckRunView, { check: K }>;

/** The verdict of a revision under its current rules (lib/server/verdicts.ts), as the sign-off panel, compare and overview show it. */
export type RevisionVerdict = {
  revisionId: string;
  revisionNumber: number;
  contentHash: string;
  rulesHash: string;
  engineVersion: string;
  ruleSet: EffectiveRuleSet;
  /** the stored "all rules" run that is current for (revision, rules, engine), or null when none is */
  run: Extract<CheckRunView, { check: "all_rules" }> | null;
  /** failing rule ids and failing built-in checks (names as in checks.json), when the run fails */
  failing: string[];
};
