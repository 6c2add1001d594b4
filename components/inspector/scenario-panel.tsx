"use client";

import { useCallback, useMemo, useState } from "react";
import { Plus, Trash2 } from "lucide-react";
import type { Scenario } from "@/engine/types";
import { Button, Input } from "@/components/ui";
import { evaluateQuantity, reevaluateExpressions, resolveVariables, validateVariableName } from "@/lib/browser/expressions";
import { useExpressionsReady } from "@/lib/browser/use-expressions-ready";
import { formatNumber, formatSi } from "@/lib/browser/format";
import type { ParamInput } from "@/lib/browser/param-input";
import { ExpressionForm, type ExpressionFieldSpec } from "./expression-form";

export type ScenarioPanelProps = {
  scenario: Scenario;
  readOnly: boolean;
  resetToken: number;
  commit: (next: Scenario, key?: string) => void;
};

/** What the inspector shows when no block is selected: system Z0, frequency plan and project variables. */
export function ScenarioPanel({ scenario, readOnly, resetToken, commit }: ScenarioPanelProps) {
  return (
    <section aria-label="Scenario settings" className="flex flex-col gap-5">
      <div>
        <h2 className="text-base font-semibold text-ink">{scenario.name}</h2>
        <p className="text-sm text-muted">
          {scenario.blocks.length} block{scenario.blocks.length === 1 ? "" : "s"} · {scenario.links.length} link{scenario.links.length === 1 ? "" : "s"} ·{" "}
          {scenario.ports.length} system port{scenario.ports.length === 1 ? "" : "s"}. Select a block to edit it.
        </p>
      </div>
      <PlanForm key={`plan:${resetToken}`} scenario={scenario} readOnly={readOnly} commit={commit} />
      <VariablesEditor key={`vars:${resetToken}`} scenario={scenario} readOnly={readOnly} commit={commit} />
    </section>
  );
}

function positive(text: string, q: "Hz" | "ohm"): ParamInput {
  const r = evaluateQuantity(text, q);
  if (!r.ok) return r;
  if (typeof r.value !== "number" || !(r.value > 0)) return { ok: false, error: "Must be greater than 0." };
  return r;
}

/** The plan form: the system Z0 and a linear plan (start, stop, points). */
const PLAN_FIELDS: ExpressionFieldSpec[] = [
  { name: "z0", label: "System Z0", unit: "Ω", required: true, read: (t) => positive(t, "ohm"), help: "Reference of every block port inside the system." },
  { name: "start", label: "Start", unit: "Hz", required: true, read: (t) => positive(t, "Hz") },
  { name: "stop", label: "Stop", unit: "Hz", required: true, read: (t) => positive(t, "Hz") },
  {
    name: "points",
    label: "Points",
    unit: "",
    required: true,
    read: (t) => {
      const r = evaluateQuantity(t, "integer");
      if (!r.ok) return r;
      const n = r.value as number;
      return n >= 1 && n <= 100_001 ? r : { ok: false, error: "Between 1 and 100001 points." };
    },
  },
];

function PlanForm({ scenario, readOnly, commit }: Omit<ScenarioPanelProps, "resetToken">) {
  const plan = scenario.frequency;
  const range = "list" in plan ? null : plan;
  // the form's text at mount; the parent re-creates the panel (key = resetToken) to start afresh
  const [initial] = useState(() => ({
    z0: String(scenario.z0),
    start: range ? formatSi(range.start, "Hz", 12) : "",
    stop: range ? formatSi(range.stop, "Hz", 12) : "",
    points: range ? String(range.points) : "",
  }));
  const onCommit = useCallback(
    (name: string, value: unknown) => {
      if (typeof value !== "number") return;
      if (name === "z0") {
        commit({ ...scenario, z0: value }, "scenario.z0");
        return;
      }
      const base = "list" in scenario.frequency ? { start: 1e9, stop: 2e9, points: 101 } : scenario.frequency;
      commit({ ...scenario, frequency: { ...base, [name]: value } }, `plan.${name}`);
    },
    [scenario, commit],
  );
  return (
    <div className="flex flex-col gap-2">
      <h3 className="text-sm font-semibold text-ink">Frequency plan</h3>
      {!range && "list" in plan ? (
        <p className="text-sm text-muted">
          The plan is a list of {plan.list.length} frequencies ({formatSi(Math.min(...plan.list), "Hz")} to {formatSi(Math.max(...plan.list), "Hz")}); editing
          start, stop or points replaces it with an even range.
        </p>
      ) : null}
      {range && range.start >= range.stop && range.points > 1 ? <p className="text-xs text-fail-strong">Start should be below stop.</p> : null}
      <ExpressionForm label="Frequency plan" fields={PLAN_FIELDS} initial={initial} disabled={readOnly} onCommit={onCommit} />
    </div>
  );
}

type Row = { key: number; name: string; text: string };

function VariablesEditor({ scenario, readOnly, commit }: Omit<ScenarioPanelProps, "resetToken">) {
  const [rows, setRows] = useState<Row[]>(() =>
    Object.entries(scenario.variables ?? {}).map(([name, v], k) => ({ key: k, name, text: String(v) })),
  );
  const [nextKey, setNextKey] = useState(rows.length);
  const expressionsReady = useExpressionsReady();
  const resolved = useMemo(() => {
    const table: Record<string, string> = {};
    for (const r of rows) if (r.name) table[r.name] = r.text;
    return resolveVariables(table);
    // eslint-disable-next-line react-hooks/exhaustive-deps -- recomputed once mathjs has loaded
  }, [rows, expressionsReady]);

  const save = (list: Row[]) => {
    const names = list.map((r) => r.name).filter(Boolean);
    if (new Set(names).size !== names.length) return; // shown beside the row; not saved until fixed
    if (list.some((r) => r.name && validateVariableName(r.name))) return;
    const variables: Record<string, string> = {};
    for (const r of list) if (r.name) variables[r.name] = r.text;
    const withVars: Scenario = { ...scenario, variables: Object.keys(variables).length > 0 ? variables : undefined };
    if (!withVars.variables) delete withVars.variables;
    commit(reevaluateExpressions(withVars).scenario, "variables");
  };

  const update = (key: number, patch: Partial<Row>) => {
    const list = rows.map((r) => (r.key === key ? { ...r, ...patch } : r));
    setRows(list);
    save(list);
  };

  return (
    <div className="flex flex-col gap-2">
      <h3 className="text-sm font-semibold text-ink">Project variables</h3>
      <p className="text-xs text-muted">
        Names usable in any parameter, e.g. <span className="font-mono">L_feed = 35 cm</span>. Blocks that use a variable are updated when it changes.
      </p>
      <fieldset disabled={readOnly} className="flex flex-col gap-2">
        <ul className="flex flex-col gap-2" aria-label="Project variables">
          {rows.map((r) => {
            const dup = r.name !== "" && rows.filter((o) => o.name === r.name).length > 1;
            const nameError = r.name === "" ? null : dup ? `${r.name} is defined twice.` : validateVariableName(r.name);
            const valueError = r.name && !nameError ? resolved.errors[r.name] : null;
            const value = r.name ? resolved.scope.get(r.name) : undefined;
            return (
              <li key={r.key} className="flex flex-col gap-1">
                <div className="flex items-center gap-1.5">
                  <div className="w-28 shrink-0">
                    <Input aria-label="Variable name" className="font-mono" value={r.name} onChange={(e) => update(r.key, { name: e.target.value.trim() })} />
                  </div>
                  <span aria-hidden="true" className="text-muted">
                    =
                  </span>
                  <div className="min-w-0 flex-1">
                    <Input aria-label={`Value of ${r.name || "new variable"}`} className="font-mono" value={r.text} onChange={(e) => update(r.key, { text: e.target.value })} />
                  </div>
                  <Button
                    variant="ghost"
                    size="sm"
                    aria-label={`Remove variable ${r.name}`}
                    onClick={() => {
                      const list = rows.filter((o) => o.key !== r.key);
                      setRows(list);
                      save(list);
                    }}
                  >
                    <Trash2 aria-hidden="true" className="h-4 w-4" />
                  </Button>
                </div>
                {nameError || valueError ? (
                  <p className="text-xs font-medium text-fail-strong">{nameError ?? valueError}</p>
                ) : value !== undefined ? (
                  <p className="figures text-xs text-muted">= {typeof value === "number" ? formatNumber(value, 6) : String(value)}</p>
                ) : null}
              </li>
            );
          })}
        </ul>
        <Button
          variant="secondary"
          size="sm"
          className="self-start"
          onClick={() => {
            setRows([...rows, { key: nextKey, name: "", text: "" }]);
            setNextKey(nextKey + 1);
          }}
        >
          <Plus aria-hidden="true" className="h-4 w-4" /> Add variable
        </Button>
      </fieldset>
    </div>
  );
}
