"use client";

import type { ComponentProps } from "react";
import { cn } from "./cn";
import { useFieldControlProps } from "./field";
import { controlClassName } from "./control-class";

export type TextareaProps = ComponentProps<"textarea"> & { mono?: boolean };

export function Textarea({ className, mono = false, rows = 4, ...props }: TextareaProps) {
  const wired = useFieldControlProps(props);
  return <textarea rows={rows} className={cn(controlClassName, "py-2 leading-relaxed", mono && "font-mono text-xs", className)} {...wired} />;
}
