import type { ComponentProps } from "react";
import { cn } from "./cn";

/** A keyboard key or shortcut hint, e.g. <Kbd>Ctrl</Kbd> <Kbd>K</Kbd>. */
export function Kbd({ className, ...rest }: ComponentProps<"kbd">) {
  return (
    <kbd
      className={cn(
        "inline-flex min-w-[1.5em] items-center justify-center rounded border border-rule-strong border-b-2 bg-surface px-1 font-mono text-[0.7rem] leading-5 text-muted",
        className,
      )}
      {...rest}
    />
  );
}
