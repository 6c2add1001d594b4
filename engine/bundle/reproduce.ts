/**
 * Re-running a bundle from its own files (scenario.json and parts/) and comparing with what it records
 * (results/checks.json and the composite Touchstone): the check a reviewer runs on another machine.
 */
import { EffectiveRuleSetSchema, type EffectiveRuleSet } from "../checks";
import { parseTouchstone } from "../touchstone";
import { EngineInputError, SingularSystemError } from "../types";
import { computeBundleResults, CHECKS_FORMAT, type ChecksDocument } from "./contents";
import { CanonicalJsonError } from "../canonical-json";
import { BUNDLE_PATHS, canonicalJson, hashRuleSet, sha256 } from "./format";
import { compareSettings, settingText } from "./settings";
import type { OpenedBundle } from "./bundle-zip";

/** Largest difference of a rule figure (dB or dBm) still counted as the same result. */
export const FIGURE_TOLERANCE_DB = 1e-6;
/** Largest |ΔS| between the stored and the re-solved composite still counted as the same. */
export const COMPOSITE_TOLERANCE = 1e-9;

/** One compared item. */
export type ReproducedItem = { name: string; stored: string; rerun: string; same: boolean; note?: string };

export type ReproduceResult = {
  /** every stored verdict and figure came out the same */
  reproduced: boolean;
  /** the overall verdict of the re-run */
  verdict: "pass" | "fail" | "warn";
  items: ReproducedItem[];
  /** largest |ΔS| between results/composite and the re-solved composite (null when not comparable) */
  compositeMaxDiff: number | null;
  /** why the re-run could not be made at all (bad scenario), else null */
  error: string | null;
  /**
   * SHA-256 of scenario.json's canonical JSON equals the revision content hash in the manifest (the hash a
   * sign-off binds to). Informational: a scenario renamed after the revision was saved exports its new name.
   */
  contentHashMatches: boolean;
  /** the rules re-judged by: checks.json's effective rule set, or the scenario file's own rules for a bundle written before it carried one */
  ruleSet: "bundle" | "scenario file";
  /** rules that fail in the re-run (ids) */
  failingRules: string[];
};

function figure(x: unknown): number | null {
  return typeof x === "number" && Number.isFinite(x) ? x : null;
}

function sameFigure(a: unknown, b: unknown, tol: number): boolean {
  const x = figure(a);
  const y = figure(b);
  if (x === null || y === null) return x === y;
  return Math.abs(x - y) <= tol;
}

/**
 * Re-runs the checks of an opened bundle from scenario.json and parts/ alone, judged by the effective rule
 * set recorded in results/checks.json (its SHA-256 checked), and compares every verdict (overall and per
 * check), every rule's worst value, its frequency and margin, and the composite S.
 *
 * @param bundle - from openBundle (hashes already verified)
 * @returns what reproduced and what did not
 * @example reproduceBundle(openBundle(bytes)).reproduced // true
 */
export function reproduceBundle(bundle: OpenedBundle): ReproduceResult {
  const items: ReproducedItem[] = [];
  let contentHashMatches = false;
  try {
    contentHashMatches = sha256(canonicalJson(bundle.scenario)) === bundle.manifest.revision.content_hash;
  } catch (err) {
    // a scenario with no canonical form (a lone surrogate in a string) cannot match any content hash
    if (!(err instanceof CanonicalJsonError)) throw err;
  }
  let stored: ChecksDocument | null = null;
  try {
    const doc = JSON.parse(bundle.files.get(BUNDLE_PATHS.checksJson) ?? "null") as ChecksDocument | null;
    if (doc && doc.format === CHECKS_FORMAT && doc.results && Array.isArray(doc.results.checks)) stored = doc;
  } catch {
    stored = null;
  }
  // the rules it was judged by: checks.json's rule set, which must hash to the hash it records
  let ruleSet: EffectiveRuleSet | undefined;
  const recorded = stored?.rule_set;
  if (recorded !== undefined) {
    const parsed = EffectiveRuleSetSchema.safeParse(recorded);
    if (!parsed.success) {
      items.push({ name: "rule set", stored: "(unreadable)", rerun: "(none)", same: false, note: `${BUNDLE_PATHS.checksJson} rule_set: ${parsed.error.issues[0]?.message ?? "invalid"}` });
    } else {
      ruleSet = parsed.data as EffectiveRuleSet;
      const hash = hashRuleSet(ruleSet);
      items.push({ name: "rule set", stored: `sha256 ${String(recorded.sha256).slice(0, 12)}…`, rerun: `sha256 ${hash.slice(0, 12)}…`, same: hash === recorded.sha256 });
    }
  }
  const basis: ReproduceResult["ruleSet"] = ruleSet ? "bundle" : "scenario file";
  let rerun;
  try {
    rerun = computeBundleResults(bundle.scenario, bundle.parts, ruleSet);
  } catch (err) {
    if (err instanceof EngineInputError || err instanceof SingularSystemError) {
      return { reproduced: false, verdict: "fail", items, compositeMaxDiff: null, error: `scenario.json cannot be solved: ${err.message}`, contentHashMatches, ruleSet: basis, failingRules: [] };
    }
    throw err;
  }
  const now = rerun.checks;
  const failingRules = now.results.rules.filter((r) => r.verdict === "fail").map((r) => r.id);
  if (!stored) {
    return { reproduced: false, verdict: now.verdict, items, compositeMaxDiff: null, error: `${BUNDLE_PATHS.checksJson} is missing or not a ${CHECKS_FORMAT} document`, contentHashMatches, ruleSet: basis, failingRules };
  }
  items.push({ name: "overall verdict", stored: stored.verdict, rerun: now.verdict, same: stored.verdict === now.verdict });
  const storedChecks = new Map(stored.results.checks.map((c) => [c.name, c]));
  const storedRules = new Map(stored.results.rules.map((r) => [`rule:${r.id}`, r]));
  const seen = new Set<string>();
  for (const c of now.results.checks) {
    seen.add(c.name);
    const before = storedChecks.get(c.name);
    if (!before) {
      items.push({ name: c.name, stored: "(absent)", rerun: c.verdict, same: false });
      continue;
    }
    let same = before.verdict === c.verdict;
    let note: string | undefined;
    const rule = now.results.rules.find((r) => `rule:${r.id}` === c.name);
    const oldRule = storedRules.get(c.name);
    if (rule && oldRule) {
      const figuresSame =
        sameFigure(oldRule.worst, rule.worst, FIGURE_TOLERANCE_DB) && sameFigure(oldRule.margin, rule.margin, FIGURE_TOLERANCE_DB) && sameFigure(oldRule.worstHz, rule.worstHz, 1e-6 * Math.max(1, Math.abs(rule.worstHz)));
      if (!figuresSame) note = `worst ${String(oldRule.worst)} → ${String(rule.worst)} ${rule.unit}, margin ${String(oldRule.margin)} → ${String(rule.margin)}`;
      same = same && figuresSame;
    }
    items.push({ name: c.name, stored: before.verdict, rerun: c.verdict, same, note });
  }
  for (const name of storedChecks.keys()) {
    if (!seen.has(name)) items.push({ name, stored: storedChecks.get(name)!.verdict, rerun: "(absent)", same: false });
  }
  // the switch setting judged, the state sweep over every setting and the drive tables (settings.ts)
  items.push(...compareSettings(stored, now, FIGURE_TOLERANCE_DB));
  const manifestSetting = bundle.manifest.switch_states;
  if (manifestSetting !== undefined) {
    const a = settingText(manifestSetting.map((s) => s.block), manifestSetting.map((s) => s.state));
    const b = settingText((now.switch_states ?? []).map((s) => s.block), (now.switch_states ?? []).map((s) => s.state));
    items.push({ name: "manifest switch settings", stored: a, rerun: b, same: a === b });
  }
  // the composite: compare the stored Touchstone with the re-solved S
  let compositeMaxDiff: number | null = null;
  const sol = rerun.solution;
  const path = `${BUNDLE_PATHS.composite}.s${sol.ports.length}p`;
  const text = bundle.files.get(path);
  if (text === undefined) {
    items.push({ name: "composite", stored: "(absent)", rerun: path, same: false, note: `${path} is missing` });
  } else {
    try {
      const data = parseTouchstone(text, { name: path });
      if (data.ports !== sol.ports.length || data.frequencies.length !== sol.frequencies.length) {
        items.push({ name: "composite", stored: `${data.ports} ports, ${data.frequencies.length} points`, rerun: `${sol.ports.length} ports, ${sol.frequencies.length} points`, same: false });
      } else {
        let worst = 0;
        for (let k = 0; k < sol.frequencies.length; k++) worst = Math.max(worst, Math.abs(data.frequencies[k] - sol.frequencies[k]) / sol.frequencies[k]);
        for (let i = 0; i < sol.s.data.length; i += 2) worst = Math.max(worst, Math.hypot(data.s.data[i] - sol.s.data[i], data.s.data[i + 1] - sol.s.data[i + 1]));
        compositeMaxDiff = worst;
        items.push({ name: "composite", stored: path, rerun: `max |ΔS| ${worst.toExponential(2)}`, same: worst <= COMPOSITE_TOLERANCE });
      }
    } catch (err) {
      items.push({ name: "composite", stored: path, rerun: "(unreadable)", same: false, note: err instanceof Error ? err.message : String(err) });
    }
  }
  return { reproduced: items.every((i) => i.same), verdict: now.verdict, items, compositeMaxDiff, error: null, contentHashMatches, ruleSet: basis, failingRules };
}
