"use client";

import { useEffect, useMemo } from "react";
import { useForm, useWatch } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { z } from "zod";
import { Field, Input, Select } from "@/components/ui";
import type { ParamInput } from "@/lib/browser/param-input";

/** One field of an expression form: how its text is read and what it is called. */
export type ExpressionFieldSpec = {
  name: string;
  label: string;
  /** unit shown beside the input ("dB", "Hz"…) */
  unit: string;
  help?: string;
  required?: boolean;
  /** a select instead of a text input */
  options?: string[];
  /** shown when the field is empty and optional */
  placeholder?: string;
  read: (text: string) => ParamInput;
};

export type ExpressionFormProps = {
  /** accessible name of the form, e.g. "Parameters of PAD1" */
  label: string;
  fields: ExpressionFieldSpec[];
  /** field texts as stored (expression or formatted value) */
  initial: Record<string, string>;
  disabled: boolean;
  /** a field whose text reads correctly; value undefined means "leave the parameter out" */
  onCommit: (name: string, value: Extract<ParamInput, { ok: true }>["value"], text: string) => void;
};

/**
 * A form of expression fields (react-hook-form + zod): each field is validated as it is typed, shows
 * its evaluated value, and is committed to the scenario as soon as it reads correctly.
 */
export function ExpressionForm({ label, fields, initial, disabled, onCommit }: ExpressionFormProps) {
  const schema = useMemo(
    () =>
      z.object(
        Object.fromEntries(
          fields.map((f) => [
            f.name,
            z.string().superRefine((text, ctx) => {
              const r = f.read(text);
              if (!r.ok) ctx.addIssue({ code: "custom", message: r.error });
            }),
          ]),
        ),
      ),
    [fields],
  );
  const form = useForm<Record<string, string>>({
    resolver: zodResolver(schema) as never,
    defaultValues: initial,
    mode: "onChange",
  });
  const values = useWatch({ control: form.control }) as Record<string, string | undefined>;

  // commit each typed change that reads (subscribe, not watch: no re-render of the form per keystroke)
  useEffect(
    () =>
      form.subscribe({
        formState: { values: true },
        callback: ({ values: all, name, type }) => {
          if (!name || type !== "change") return;
          const spec = fields.find((f) => f.name === name);
          if (!spec) return;
          const text = all[name] ?? "";
          const r = spec.read(text);
          if (r.ok) onCommit(name, r.value, text);
        },
      }),
    [form, fields, onCommit],
  );

  const errors = form.formState.errors;
  return (
    <form aria-label={label} className="flex flex-col gap-3" onSubmit={(e) => e.preventDefault()} noValidate>
      <fieldset disabled={disabled} className="flex flex-col gap-3">
        {fields.map((f) => {
          const text = values[f.name] ?? "";
          const read = f.read(text);
          const error = errors[f.name]?.message;
          // the evaluated value is shown when the text is more than a plain number
          const plain = /^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(text.trim());
          const evaluated = read.ok && text.trim() !== "" && !plain && read.display !== text.trim() ? `= ${read.display}` : null;
          return (
            <Field
              key={f.name}
              label={`${f.label}${f.unit ? ` (${f.unit})` : ""}`}
              required={f.required}
              error={typeof error === "string" ? error : null}
              hint={
                !evaluated && !f.help ? null : (
                <span className="flex flex-col gap-0.5">
                  {evaluated ? (
                    <span className="figures text-ink" data-testid={`evaluated-${f.name}`}>
                      {evaluated}
                    </span>
                  ) : null}
                  {f.help ? <span>{f.help}</span> : null}
                </span>
                )
              }
            >
              {f.options ? (
                <Select
                  {...form.register(f.name)}
                  options={[...(f.required ? [] : [{ value: "", label: f.placeholder ?? "default" }]), ...f.options.map((o) => ({ value: o, label: o }))]}
                />
              ) : (
                <Input {...form.register(f.name)} autoComplete="off" spellCheck={false} placeholder={f.placeholder} className="font-mono" />
              )}
            </Field>
          );
        })}
      </fieldset>
    </form>
  );
}
