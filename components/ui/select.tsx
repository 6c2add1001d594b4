"use client";

import type { ComponentProps } from "react";
import { ChevronDown } from "lucide-react";
import { cn } from "./cn";
import { useFieldControlProps } from "./field";
import { controlClassName } from "./control-class";

export type SelectOption = { value: string; label: string; disabled?: boolean };

export type SelectProps = ComponentProps<"select"> & {
  /** Convenience for simple lists; children work as well. */
  options?: SelectOption[];
};

/** A native select (keyboard and screen-reader behaviour come from the browser). */
export function Select({ className, options, children, ...props }: SelectProps) {
  const wired = useFieldControlProps(props);
  return (
    <span className="relative inline-flex w-full">
      <select className={cn(controlClassName, "h-9 appearance-none pr-8", className)} {...wired}>
        {options?.map((o) => (
          <option key={o.value} value={o.value} disabled={o.disabled}>
            {o.label}
          </option>
        ))}
        {children}
      </select>
      <ChevronDown aria-hidden="true" className="pointer-events-none absolute top-1/2 right-2.5 h-4 w-4 -translate-y-1/2 text-muted" />
    </span>
  );
}
