/**
 * Result shapes of the integration checks (engine/checks/). Every result is plain JSON: numbers,
 * strings and plain arrays, never typed arrays, so the web app can store and render it as is.
 *
 * Decibel figures of a zero magnitude are reported at the floor DB_FLOOR (−400 dB) rather than −∞, so
 * that every figure survives JSON.stringify.
 */
import type { RuleSpec } from "../types";

/** Outcome of one check. */
export type Verdict = "pass" | "fail" | "warn";

/** Lowest dB figure reported for a magnitude of zero (20·log10 of 1e-20). */
export const DB_FLOOR = -400;

/** Result of one saved rule over its band. */
export type RuleResult = {
  /** the rule's `id`, or "rules[i]" when it has none */
  id: string;
  index: number;
  kind: RuleSpec["kind"];
  verdict: Verdict;
  /** what `worst` measures, e.g. "isolation", "return loss", "insertion loss", "incident power" */
  quantity: string;
  unit: "dB" | "dBm";
  /** the worst value over the band (lowest isolation or return loss, highest insertion loss or power) */
  worst: number;
  /** plan frequency of the worst value, Hz */
  worstHz: number;
  /** the requirement the worst value is compared with (same unit) */
  limit: number;
  /** distance from the limit, same unit; positive = met */
  margin: number;
  /** direction of the worst value, e.g. "TX→RX", for two-port rules */
  direction?: string;
  /** plan points inside the band */
  points: number;
  /** evaluated value at every plan point inside the band (same unit as `worst`) */
  frequenciesHz: number[];
  values: number[];
  messages: string[];
  /** extra figures of some rules (match: worst VSWR; drive: the full drive check) */
  extra?: Record<string, unknown>;
};

/** A named check result as collected by runAllChecks. */
export type CheckSummary = {
  /** stable name, e.g. "rule:iso-tx-rx", "ledger:TX", "passivity", "reciprocity", "stability:AMP1" */
  name: string;
  title: string;
  verdict: Verdict;
  messages: string[];
};
