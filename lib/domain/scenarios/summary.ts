import type { Scenario } from "@/engine/types";
import { changeText, diffScenarios, planText, valueText } from "./diff";

/** One change of a revision against the previous one, in words (with units). */
export type RevisionChange = { area: "blocks" | "links" | "parameters" | "ports" | "rules" | "plan" | "settings"; text: string };

/**
 * What a revision changed against the previous one, computed when it is saved and stored with it
 * (scenario_revisions.summary), so that the history reads without diffing contents. `against` is the
 * previous revision's number (null for the first revision).
 */
export type RevisionChangeSummary = { against: number | null; changes: RevisionChange[] };

const ENTRY_TEXT = { override: "override of rule", "opt-out": "opt-out of rule", "scenario rule": "scenario rule" } as const;

/**
 * The changes from `before` to `after` in words: blocks added, removed or replaced (another kind or part
 * file), links added or removed, parameters with old → new values and units, switch states, system ports,
 * rule entries and the frequency plan. Chart positions, labels and typed expressions are not changes.
 * @example summarizeChanges(r1, r2, 1).changes // [{ area: "parameters", text: "LNA gain_db: 12 dB → 15 dB" }]
 */
export function summarizeChanges(before: Scenario | null, after: Scenario, againstNumber: number | null): RevisionChangeSummary {
  if (!before) return { against: null, changes: [{ area: "blocks", text: `first revision: ${after.blocks.length} block${after.blocks.length === 1 ? "" : "s"}, ${after.links.length} link${after.links.length === 1 ? "" : "s"}` }] };
  const d = diffScenarios(before, after);
  const changes: RevisionChange[] = [];
  for (const b of d.blocks) {
    if (b.change === "added") changes.push({ area: "blocks", text: `added ${b.id} (${b.kind})` });
    else if (b.change === "removed") changes.push({ area: "blocks", text: `removed ${b.id} (${b.kind})` });
    else {
      const replaced = b.fields.filter((f) => f.name === "kind" || f.name === "file" || f.name === "data");
      if (replaced.length > 0) {
        const what = replaced.map((f) => (f.name === "data" ? "inline data" : `${valueText(f.name, f.before)} → ${valueText(f.name, f.after)}`)).join(", ");
        changes.push({ area: "blocks", text: `replaced ${b.id}: ${what}` });
      }
      for (const f of b.fields) if (!replaced.includes(f)) changes.push({ area: "parameters", text: `${b.id} ${changeText(f)}` });
      for (const p of b.params) changes.push({ area: "parameters", text: `${b.id} ${changeText(p)}` });
      if (b.state) changes.push({ area: "parameters", text: `${b.id} switch state: ${valueText("state", b.state.before)} → ${valueText("state", b.state.after)}` });
    }
  }
  for (const l of d.links) changes.push({ area: "links", text: `${l.change === "added" ? "linked" : "unlinked"} ${l.link[0]} — ${l.link[1]}` });
  for (const p of d.ports) {
    if (p.change === "added") changes.push({ area: "ports", text: `system port ${p.name} at ${p.at}` });
    else if (p.change === "removed") changes.push({ area: "ports", text: `removed system port ${p.name} (was at ${p.at})` });
    else if (p.change === "moved") changes.push({ area: "ports", text: `system port ${p.name} moved: ${p.before} → ${p.after}` });
    else if (p.change === "z0") changes.push({ area: "ports", text: `system port ${p.name} z0: ${valueText("z0", p.before)} → ${valueText("z0", p.after)}` });
  }
  for (const r of d.rules) changes.push({ area: "rules", text: `${r.change} ${ENTRY_TEXT[r.entry]} ${r.id}` });
  for (const s of d.settings) {
    if (s.name === "frequency") changes.push({ area: "plan", text: `frequency plan: ${planText(s.before)} → ${planText(s.after)}` });
    else changes.push({ area: "settings", text: changeText(s) });
  }
  return { against: againstNumber, changes };
}

/** The summary as one line for the history: "3 changes: added LNA (amplifier); …" or "no change". */
export function summaryText(summary: RevisionChangeSummary | null): string {
  if (!summary) return "";
  if (summary.changes.length === 0) return summary.against === null ? "first revision" : "no change to what the engine reads";
  return summary.changes.map((c) => c.text).join("; ");
}
