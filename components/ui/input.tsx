"use client";

import type { ComponentProps } from "react";
import { cn } from "./cn";
import { controlClassName } from "./control-class";
import { useFieldControlProps } from "./field";

export type InputProps = ComponentProps<"input"> & {
  /** Right-aligned tabular figures, for numeric entries. */
  numeric?: boolean;
};

export function Input({ className, numeric = false, ...props }: InputProps) {
  const wired = useFieldControlProps(props);
  return <input className={cn(controlClassName, "h-9", numeric && "figures text-right", className)} {...wired} />;
}
