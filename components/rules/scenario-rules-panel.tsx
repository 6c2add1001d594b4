"use client";

import { useMemo, useState } from "react";
import useSWR from "swr";
import { effectiveRuleSet, RULE_SOURCE_LABELS, type EffectiveRule, type RuleSource } from "@/engine/checks";
import type { RuleOptOut, RuleOverride, RuleSpec, Scenario } from "@/engine/types";
import { Alert, Badge, Button, Field, Textarea, type BadgeTone } from "@/components/ui";
import { fetchJson } from "@/lib/browser/api-client";
import { describeRule } from "@/lib/domain/rules/describe";
import { EMPTY_RULE_FORM, formFromSpec } from "./rule-form";
import { RuleFormPanel, type RuleItem } from "./rules-editor";

const SOURCE_TONES: Record<RuleSource, BadgeTone> = { project: "neutral", "scenario-override": "warn", scenario: "info" };

type Editing = { mode: "add" } | { mode: "edit"; index: number } | { mode: "override"; project: RuleSpec & { id: string } } | { mode: "opt-out"; id: string } | null;

export type ScenarioRulesPanelProps = {
  projectId: string;
  /** the scenario as edited on the page: rule edits go through onChange and are saved with it */
  scenario: Scenario;
  onChange: (next: Scenario) => void;
  readOnly: boolean;
};

/**
 * The scenario's effective rules beside its checks (docs/checks.md "Effective rules"): the project's rules
 * it inherits, its overrides (with both limits and who changed them), its opt-outs (with their reasons)
 * and its own rules. Engineers add, override, opt out with a reason and revert; each edit is a scenario
 * edit, saved as a new revision, so verdicts of earlier revisions are marked as such.
 */
export function ScenarioRulesPanel({ projectId, scenario, onChange, readOnly }: ScenarioRulesPanelProps) {
  const { data, error } = useSWR<{ rules: RuleItem[] }>(`/api/projects/${projectId}/rules`, fetchJson, { revalidateOnFocus: true });
  const { data: session } = useSWR<{ user: { name: string; email: string } }>("/api/auth/session", fetchJson);
  const [editing, setEditing] = useState<Editing>(null);
  const [reason, setReason] = useState("");
  const [reasonError, setReasonError] = useState<string | null>(null);
  const projectRules = useMemo(() => (data?.rules ?? []).map((r) => r.spec), [data]);
  const set = useMemo(() => effectiveRuleSet(projectRules, scenario), [projectRules, scenario]);
  const stamp = () => ({ by: session?.user.email ?? session?.user.name, at: new Date().toISOString() });

  const overrides = scenario.rule_overrides ?? [];
  const optOuts = scenario.rule_opt_outs ?? [];
  const own = scenario.rules ?? [];
  const write = (next: Partial<Pick<Scenario, "rules" | "rule_overrides" | "rule_opt_outs">>) => {
    const merged: Scenario = { ...scenario, ...next };
    // empty lists are left out of the file, as the demo and the templates write it
    for (const key of ["rules", "rule_overrides", "rule_opt_outs"] as const) if (merged[key]?.length === 0) delete merged[key];
    onChange(merged);
    setEditing(null);
  };
  const revert = (id: string) => write({ rule_overrides: overrides.filter((o) => o.id !== id), rule_opt_outs: optOuts.filter((o) => o.id !== id) });
  const ownIndex = (entry: EffectiveRule) => own.findIndex((r, i) => (r.id ?? `rules[${i}]`) === entry.id);

  const actions = (entry: EffectiveRule) => {
    if (readOnly) return null;
    if (entry.source === "project") {
      return (
        <>
          <Button size="sm" variant="secondary" onClick={() => setEditing({ mode: "override", project: entry.rule })} aria-label={`Override rule ${entry.id}`}>
            Override
          </Button>
          <Button
            size="sm"
            variant="secondary"
            onClick={() => {
              setReason("");
              setReasonError(null);
              setEditing({ mode: "opt-out", id: entry.id });
            }}
            aria-label={`Opt out of rule ${entry.id}`}
          >
            Opt out
          </Button>
        </>
      );
    }
    if (entry.source === "scenario-override" && overrides.some((o) => o.id === entry.id)) {
      return (
        <>
          <Button size="sm" variant="secondary" onClick={() => setEditing({ mode: "override", project: entry.project_rule ?? entry.rule })} aria-label={`Edit override of ${entry.id}`}>
            Edit
          </Button>
          <Button size="sm" variant="secondary" onClick={() => revert(entry.id)} aria-label={`Revert rule ${entry.id} to the project's`}>
            Revert
          </Button>
        </>
      );
    }
    const i = ownIndex(entry);
    if (entry.source === "scenario" && i >= 0) {
      return (
        <>
          <Button size="sm" variant="secondary" onClick={() => setEditing({ mode: "edit", index: i })} aria-label={`Edit rule ${entry.id}`}>
            Edit
          </Button>
          <Button size="sm" variant="secondary" onClick={() => write({ rules: own.filter((_, k) => k !== i) })} aria-label={`Remove rule ${entry.id}`}>
            Remove
          </Button>
        </>
      );
    }
    if (entry.source === "scenario") {
      return (
        <Button size="sm" variant="secondary" onClick={() => revert(entry.id)} aria-label={`Remove rule ${entry.id}`}>
          Remove
        </Button>
      );
    }
    return null;
  };

  const current = overrides.find((o) => editing?.mode === "override" && o.id === editing.project.id);
  return (
    <section aria-labelledby="scenario-rules-heading" id="scenario-rules" className="flex flex-col gap-3 rounded-card border border-rule bg-surface/60 p-3">
      <div className="flex flex-wrap items-center gap-2">
        <h2 id="scenario-rules-heading" className="text-base font-semibold">
          Rules
        </h2>
        <span className="text-xs text-muted">
          {set.rules.length} judging this scenario{set.opted_out.length > 0 ? `, ${set.opted_out.length} opted out` : ""}. Project rules apply unless overridden or opted out here.
        </span>
        {!readOnly && editing === null ? (
          <Button size="sm" variant="secondary" onClick={() => setEditing({ mode: "add" })}>
            Add scenario rule
          </Button>
        ) : null}
      </div>
      {error ? <Alert tone="warn">The project&apos;s rules could not be loaded: {error instanceof Error ? error.message : String(error)}</Alert> : null}
      {set.rules.length === 0 && set.opted_out.length === 0 ? (
        <p className="text-sm text-muted">No rules: the project has none and this scenario adds none.</p>
      ) : (
        <table aria-label="Effective rules" className="w-full border-collapse text-sm">
          <thead>
            <tr className="border-b border-rule text-left text-xs text-muted">
              <th className="py-1 pr-2 font-medium">Rule</th>
              <th className="py-1 pr-2 font-medium">Source</th>
              <th className="py-1 pr-2 font-medium">Requirement</th>
              {!readOnly ? <th className="py-1 font-medium">Actions</th> : null}
            </tr>
          </thead>
          <tbody>
            {set.rules.map((entry) => {
              const d = describeRule(entry.rule);
              return (
                <tr key={`${entry.source}:${entry.id}`} className="border-b border-rule/60 align-top" data-rule={entry.id}>
                  <td className="py-1 pr-2 font-mono">{entry.id}</td>
                  <td className="py-1 pr-2">
                    <Badge tone={SOURCE_TONES[entry.source]}>{RULE_SOURCE_LABELS[entry.source]}</Badge>
                  </td>
                  <td className="py-1 pr-2">
                    <span className="figures">
                      {d.limit} · {d.ports} · {d.band}
                    </span>
                    {entry.project_rule ? (
                      <div className="text-xs text-muted">
                        project: {describeRule(entry.project_rule).limit} · {describeRule(entry.project_rule).band}
                        {entry.by ? ` — changed by ${entry.by}` : " — changed before overrides were recorded"}
                        {entry.at ? ` on ${entry.at.slice(0, 10)}` : ""}
                      </div>
                    ) : null}
                    {entry.not_run ? <div className="text-xs text-warn-strong">Not run: {entry.not_run}</div> : null}
                    {entry.note ? <div className="text-xs text-muted">{entry.note}</div> : null}
                  </td>
                  {!readOnly ? <td className="flex flex-wrap gap-1 py-1">{actions(entry)}</td> : null}
                </tr>
              );
            })}
            {set.opted_out.map((o) => (
              <tr key={`opt-out:${o.id}`} className="border-b border-rule/60 align-top" data-rule={o.id}>
                <td className="py-1 pr-2 font-mono text-muted line-through">{o.id}</td>
                <td className="py-1 pr-2">
                  <Badge tone="fail">opted out</Badge>
                </td>
                <td className="py-1 pr-2">
                  <span className="text-muted">{o.project_rule ? `${describeRule(o.project_rule).limit} · ${describeRule(o.project_rule).ports}` : "no longer a project rule"}</span>
                  <div className="text-xs">
                    Reason: {o.reason}
                    {o.by ? ` — ${o.by}` : ""}
                    {o.at ? ` on ${o.at.slice(0, 10)}` : ""}
                  </div>
                </td>
                {!readOnly ? (
                  <td className="py-1">
                    <Button size="sm" variant="secondary" onClick={() => revert(o.id)} aria-label={`Revert opt-out of ${o.id}`}>
                      Revert
                    </Button>
                  </td>
                ) : null}
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {editing?.mode === "opt-out" ? (
        <form
          aria-label={`Opt out of ${editing.id}`}
          className="flex max-w-3xl flex-col gap-2 rounded-card border border-rule bg-surface p-3"
          onSubmit={(e) => {
            e.preventDefault();
            if (reason.trim() === "") {
              setReasonError("Give the reason this scenario does not answer to the rule.");
              return;
            }
            const entry: RuleOptOut = { id: editing.id, reason: reason.trim(), ...stamp() };
            write({ rule_opt_outs: [...optOuts.filter((o) => o.id !== editing.id), entry], rule_overrides: overrides.filter((o) => o.id !== editing.id) });
          }}
        >
          <Field label={`Why does this scenario not answer to ${editing.id}?`} error={reasonError ?? undefined} required>
            <Textarea value={reason} onChange={(e) => setReason(e.target.value)} rows={2} />
          </Field>
          <div className="flex gap-2">
            <Button type="submit" size="sm">
              Opt out
            </Button>
            <Button type="button" size="sm" variant="secondary" onClick={() => setEditing(null)}>
              Cancel
            </Button>
          </div>
        </form>
      ) : null}
      {editing?.mode === "override" ? (
        <RuleFormPanel
          key={`override:${editing.project.id}`}
          title={`Override ${editing.project.id} for this scenario`}
          initial={formFromSpec(current ? (withoutStamp(current) as RuleSpec) : editing.project)}
          fixedName
          submitLabel="Save override"
          onCancel={() => setEditing(null)}
          onSubmit={async (spec) => {
            const entry = { ...spec, id: editing.project.id, ...stamp() } as RuleOverride;
            write({ rule_overrides: [...overrides.filter((o) => o.id !== entry.id), entry] });
            return { ok: true };
          }}
        />
      ) : null}
      {editing?.mode === "add" || editing?.mode === "edit" ? (
        <RuleFormPanel
          key={editing.mode === "add" ? "add" : `edit:${editing.index}`}
          title={editing.mode === "add" ? "New scenario rule" : `Edit rule ${own[editing.index]?.id ?? ""}`}
          initial={editing.mode === "add" ? EMPTY_RULE_FORM : formFromSpec(own[editing.index])}
          onCancel={() => setEditing(null)}
          onSubmit={async (spec) => {
            if (projectRules.some((r) => r.id === spec.id)) {
              return { ok: false, message: `The project has a rule named "${spec.id}": override it instead, or choose another name.`, fields: { id: "Choose another name." } };
            }
            const next = editing.mode === "add" ? [...own, spec] : own.map((r, i) => (i === editing.index ? spec : r));
            write({ rules: next });
            return { ok: true };
          }}
        />
      ) : null}
    </section>
  );
}

function withoutStamp(o: RuleOverride): Omit<RuleOverride, "by" | "at"> {
  const { by: _by, at: _at, ...rule } = o;
  void _by;
  void _at;
  return rule;
}
