"use client";

import { useState, type FormEvent } from "react";
import useSWR from "swr";
import { useForm, useWatch } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { RuleSpec } from "@/engine/types";
import { Alert, Button, ConfirmButton, Field, Input, Select } from "@/components/ui";
import { ApiError, fetchJson, requestJson } from "@/lib/browser/api-client";
import { loadExpressions } from "@/lib/browser/expressions";
import { useExpressionsReady } from "@/lib/browser/use-expressions-ready";
import { SortableTable, type SortColumn } from "@/components/ui/sortable-table";
import { describeRule as describe } from "@/lib/domain/rules/describe";
import { RULE_KIND_LABELS, RULE_KINDS } from "@/lib/domain/rules/schema";
import { EMPTY_RULE_FORM, formFromSpec, ruleFormSchema, specFromForm, type RuleFormValues } from "./rule-form";

export type RuleItem = { id: string; kind: RuleSpec["kind"]; spec: RuleSpec; createdByName: string | null; updatedAt: string };

async function send(url: string, method: string, body?: unknown): Promise<{ ok: true } | { ok: false; message: string; fields?: Record<string, string> }> {
  try {
    await requestJson(url, { method, json: body });
    return { ok: true };
  } catch (e) {
    if (e instanceof ApiError) return { ok: false, message: e.message, fields: e.fields };
    throw e;
  }
}

/** Whether the rule form edits this kind (project rules hold only those; see RULE_KINDS). */
function formEdits(spec: RuleSpec): spec is Extract<RuleSpec, { kind: RuleFormValues["kind"] }> {
  return (RULE_KINDS as readonly string[]).includes(spec.kind);
}

/** A project's rules: a table for everyone; create, edit and delete for engineers and owners. */
/** How scenarios depart from a rule (lib/server/verdicts.ts `projectRuleUsage`), by rule name. */
export type RuleUsageItem = {
  overrides: { scenarioId: string; scenarioName: string; rule: RuleSpec; by?: string }[];
  optOuts: { scenarioId: string; scenarioName: string; reason: string; by?: string }[];
};

function UsageCell({ projectId, usage }: { projectId: string; usage: RuleUsageItem | undefined }) {
  if (!usage || (usage.overrides.length === 0 && usage.optOuts.length === 0)) return <span className="text-muted">all inherit</span>;
  return (
    <ul className="flex flex-col gap-0.5 text-xs">
      {usage.overrides.map((o) => (
        <li key={`o:${o.scenarioId}`}>
          <a className="underline underline-offset-2" href={`/projects/${projectId}/scenarios/${o.scenarioId}#scenario-rules`}>
            {o.scenarioName}
          </a>{" "}
          overrides: {describe(o.rule).limit}
          {o.by ? ` (${o.by})` : ""}
        </li>
      ))}
      {usage.optOuts.map((o) => (
        <li key={`x:${o.scenarioId}`}>
          <a className="underline underline-offset-2" href={`/projects/${projectId}/scenarios/${o.scenarioId}#scenario-rules`}>
            {o.scenarioName}
          </a>{" "}
          opts out: {o.reason}
        </li>
      ))}
    </ul>
  );
}

export function RulesEditor({ projectId, initial, canEdit, usage = {} }: { projectId: string; initial: RuleItem[]; canEdit: boolean; usage?: Record<string, RuleUsageItem> }) {
  const url = `/api/projects/${projectId}/rules`;
  const { data, mutate } = useSWR<{ rules: RuleItem[] }>(url, fetchJson, { fallbackData: { rules: initial } });
  const rules = data?.rules ?? [];
  const [editing, setEditing] = useState<RuleItem | "new" | null>(null);
  const [error, setError] = useState<string | null>(null);

  const columns: SortColumn<RuleItem>[] = [
    { id: "name", header: "Name", value: (r) => r.spec.id ?? "", cell: (r) => <span id={`rule-${r.spec.id}`} className="font-mono">{r.spec.id}</span> },
    { id: "kind", header: "Kind", value: (r) => RULE_KIND_LABELS[r.kind] },
    { id: "ports", header: "Ports", value: (r) => describe(r.spec).ports, cell: (r) => <span className="font-mono">{describe(r.spec).ports}</span> },
    { id: "band", header: "Band", value: (r) => ("band" in r.spec && r.spec.band ? r.spec.band[0] : 0), cell: (r) => describe(r.spec).band },
    { id: "limit", header: "Requirement", value: (r) => describe(r.spec).limit, sortable: false },
    {
      id: "scenarios",
      header: "Scenarios",
      sortable: false,
      value: () => null,
      cell: (r) => <UsageCell projectId={projectId} usage={r.spec.id ? usage[r.spec.id] : undefined} />,
    },
    ...(canEdit
      ? [
          {
            id: "actions",
            header: "Actions",
            sortable: false,
            value: () => null,
            cell: (r: RuleItem) => (
              <span className="flex gap-2">
                <Button size="sm" variant="secondary" onClick={() => setEditing(r)} aria-label={`Edit rule ${r.spec.id}`}>
                  Edit
                </Button>
                <ConfirmButton
                  buttonProps={{ size: "sm", "aria-label": `Delete rule ${r.spec.id}` }}
                  title={`Delete rule ${r.spec.id}?`}
                  description="Scenarios stop inheriting it; their overrides and opt-outs of it stay visible on their Rules panels. Verdicts judged with it are marked stale."
                  confirmLabel="Delete rule"
                  onConfirm={async () => {
                    const res = await send(`${url}/${r.id}`, "DELETE");
                    if (!res.ok) setError(res.message);
                    await mutate();
                  }}
                >
                  Delete
                </ConfirmButton>
              </span>
            ),
          } satisfies SortColumn<RuleItem>,
        ]
      : []),
  ];

  return (
    <div className="flex flex-col gap-4">
      {error ? (
        <Alert tone="error" title="Not saved">
          {error}
        </Alert>
      ) : null}
      {rules.length === 0 ? <p className="text-sm text-muted">No project rules yet.</p> : <SortableTable caption="Project rules" columns={columns} rows={rules} rowKey={(r) => r.id} />}
      {canEdit && editing === null ? (
        <div>
          <Button onClick={() => setEditing("new")}>New rule</Button>
        </div>
      ) : null}
      {canEdit && editing !== null ? (
        <RuleFormPanel
          key={editing === "new" ? "new" : editing.id}
          initial={editing === "new" || !formEdits(editing.spec) ? EMPTY_RULE_FORM : formFromSpec(editing.spec)}
          title={editing === "new" ? "New rule" : `Edit rule ${editing.spec.id}`}
          onCancel={() => setEditing(null)}
          onSubmit={async (spec) => {
            const res = editing === "new" ? await send(url, "POST", { spec }) : await send(`${url}/${editing.id}`, "PUT", { spec });
            if (!res.ok) return res;
            setEditing(null);
            setError(null);
            await mutate();
            return res;
          }}
        />
      ) : null}
    </div>
  );
}

export function RuleFormPanel({
  initial,
  title,
  onCancel,
  onSubmit,
  fixedName = false,
  submitLabel = "Save rule",
}: {
  initial: RuleFormValues;
  title: string;
  onCancel: () => void;
  /** the name and kind stay as given (a scenario's override of a project rule keeps its name) */
  fixedName?: boolean;
  submitLabel?: string;
  onSubmit: (spec: RuleSpec) => Promise<{ ok: true } | { ok: false; message: string; fields?: Record<string, string> }>;
}) {
  const form = useForm<RuleFormValues>({ resolver: zodResolver(ruleFormSchema), defaultValues: initial, mode: "onSubmit" });
  const { register, handleSubmit, control, formState, setError } = form;
  const [serverError, setServerError] = useState<string | null>(null);
  const kind = useWatch({ control, name: "kind" });
  const matchBy = useWatch({ control, name: "matchBy" });
  const err = (k: keyof RuleFormValues) => formState.errors[k]?.message;

  // bands and levels are read as expressions ("2.4 GHz to 2.48 GHz", "-20 dBm"): load the reader with
  // the form, and have it before the form is judged
  useExpressionsReady();
  const submitForm = handleSubmit(async (values) => {
    const r = specFromForm(values);
    if (!r.ok) return;
    const res = await onSubmit(r.spec);
    if (!res.ok) {
      setServerError(res.message);
      for (const [path, message] of Object.entries(res.fields ?? {})) {
        const key = path.replace(/^spec\./, "").split(".")[0];
        const field = (
          key === "input_dbm" ? "inputDbm" : key === "max_db" && values.kind === "gain" ? "limitMax" : ["min_db", "max_db", "min_return_loss_db", "max_vswr"].includes(key) ? "limit" : key
        ) as keyof RuleFormValues;
        if (field in initial) setError(field, { message });
      }
    }
  });
  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    void loadExpressions().then(() => submitForm());
  };

  const limitLabel =
    kind === "isolation"
      ? "Least isolation (dB)"
      : kind === "insertion_loss"
        ? "Largest insertion loss (dB)"
        : kind === "noise_figure"
          ? "Largest noise figure (dB)"
          : kind === "gain"
            ? "Least gain (dB)"
            : kind === "headroom"
              ? "Least headroom to P1dB (dB)"
              : matchBy === "vswr"
                ? "Largest VSWR"
                : "Least return loss (dB)";
  const twoPorts = kind === "isolation" || kind === "insertion_loss" || kind === "noise_figure" || kind === "gain" || kind === "headroom";
  const bandOptional = kind === "drive" || kind === "headroom";

  return (
    <form onSubmit={submit} noValidate aria-label={title} className="flex max-w-3xl flex-col gap-3 rounded-card border border-rule bg-surface p-4">
      <h3 className="text-base font-semibold">{title}</h3>
      {serverError ? <Alert tone="error">{serverError}</Alert> : null}
      <div className="grid gap-3 sm:grid-cols-2">
        <Field label="Name" error={err("id")} hint={fixedName ? "The project rule's name." : "Letters, digits, dots, dashes; shown in verdicts."} required>
          <Input {...register("id")} autoComplete="off" readOnly={fixedName} />
        </Field>
        {fixedName ? (
          <Field label="Kind">
            <Input value={RULE_KIND_LABELS[initial.kind]} readOnly />
          </Field>
        ) : (
          <Field label="Kind" error={err("kind")}>
            <Select {...register("kind")}>
              {RULE_KINDS.map((k) => (
                <option key={k} value={k}>
                  {RULE_KIND_LABELS[k]}
                </option>
              ))}
            </Select>
          </Field>
        )}
        {twoPorts ? (
          <>
            <Field label="From port" error={err("from")} required>
              <Input {...register("from")} />
            </Field>
            <Field label="To port" error={err("to")} required>
              <Input {...register("to")} />
            </Field>
          </>
        ) : null}
        {kind === "match" ? (
          <>
            <Field label="Port" error={err("port")} required>
              <Input {...register("port")} />
            </Field>
            <Field label="Limit on">
              <Select {...register("matchBy")}>
                <option value="return_loss">Return loss</option>
                <option value="vswr">VSWR</option>
              </Select>
            </Field>
          </>
        ) : null}
        <Field label="Band" error={err("band")} hint={bandOptional ? "Optional; e.g. 2.4 GHz to 2.48 GHz" : "e.g. 2.4 GHz to 2.48 GHz"} required={!bandOptional}>
          <Input {...register("band")} placeholder="2.4 GHz to 2.48 GHz" />
        </Field>
        {kind !== "drive" ? (
          <Field label={limitLabel} error={err("limit")} hint={kind === "gain" ? "Optional when a largest gain is given" : undefined} required={kind !== "gain"}>
            <Input {...register("limit")} inputMode="decimal" />
          </Field>
        ) : (
          <Field label="Source powers" error={err("sources")} hint="e.g. TX 30 dBm, ANT-A 1 W" required>
            <Input {...register("sources")} />
          </Field>
        )}
        {kind === "gain" ? (
          <Field label="Largest gain (dB)" error={err("limitMax")} hint="Optional when a least gain is given">
            <Input {...register("limitMax")} inputMode="decimal" />
          </Field>
        ) : null}
        {kind === "headroom" ? (
          <Field label="Input level (dBm)" error={err("inputDbm")} hint="The level entering at the from port" required>
            <Input {...register("inputDbm")} inputMode="decimal" />
          </Field>
        ) : null}
        {kind === "isolation" ? (
          <label className="flex items-center gap-2 text-sm">
            <input type="checkbox" {...register("oneWay")} /> One way only (from → to)
          </label>
        ) : null}
        {kind === "drive" ? (
          <label className="flex items-center gap-2 text-sm">
            <input type="checkbox" {...register("coherent")} /> Judge ratings on the coherent (worst-case) sum
          </label>
        ) : null}
      </div>
      <div className="flex gap-2">
        <Button type="submit" loading={formState.isSubmitting}>
          {submitLabel}
        </Button>
        <Button type="button" variant="secondary" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
