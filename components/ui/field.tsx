"use client";

import { createContext, useContext, useId, type ReactNode } from "react";
import { cn } from "./cn";

type FieldContextValue = {
  id: string;
  describedBy: string | undefined;
  invalid: boolean;
  required: boolean;
};

const FieldContext = createContext<FieldContextValue | null>(null);

export type FieldProps = {
  label: ReactNode;
  /** Shown under the control; read with it via aria-describedby. */
  hint?: ReactNode;
  /** Error text (or several); marks the control aria-invalid and is announced with it. */
  error?: string | string[] | null;
  /** Id of the control; generated when omitted. */
  id?: string;
  required?: boolean;
  className?: string;
  /** One control: Input, Textarea or Select from this folder pick up id and aria attributes themselves. */
  children: ReactNode;
};

/** Label + control + hint + error, wired together for assistive technology. */
export function Field({ label, hint, error, id, required = false, className, children }: FieldProps) {
  const generated = useId();
  const controlId = id ?? `field-${generated}`;
  const hintId = hint ? `${controlId}-hint` : undefined;
  const errors = error == null ? [] : Array.isArray(error) ? error : [error];
  const errorId = errors.length > 0 ? `${controlId}-error` : undefined;
  const describedBy = [hintId, errorId].filter(Boolean).join(" ") || undefined;

  return (
    <FieldContext.Provider value={{ id: controlId, describedBy, invalid: errors.length > 0, required }}>
      <div className={cn("flex flex-col gap-1.5", className)}>
        <label htmlFor={controlId} className="text-sm font-medium text-ink">
          {label}
          {required ? (
            <span className="ml-1 text-muted" aria-hidden="true">
              (required)
            </span>
          ) : null}
        </label>
        {children}
        {hint ? (
          <p id={hintId} className="text-xs text-muted">
            {hint}
          </p>
        ) : null}
        {errorId ? (
          <p id={errorId} className="text-xs font-medium text-fail-strong">
            {errors.join(" ")}
          </p>
        ) : null}
      </div>
    </FieldContext.Provider>
  );
}

/** Props a control inside a Field should carry; explicit props win. */
export function useFieldControlProps<
  T extends { id?: string; "aria-describedby"?: string; "aria-invalid"?: boolean | "true" | "false" | "grammar" | "spelling"; required?: boolean },
>(props: T): T {
  const field = useContext(FieldContext);
  if (!field) return props;
  return {
    ...props,
    id: props.id ?? field.id,
    "aria-describedby": props["aria-describedby"] ?? field.describedBy,
    "aria-invalid": props["aria-invalid"] ?? (field.invalid || undefined),
    required: props.required ?? (field.required || undefined),
  };
}
