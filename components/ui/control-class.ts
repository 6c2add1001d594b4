// Kept out of the "use client" files so server components can import the string itself.
export const controlClassName =
  "w-full rounded-md border border-rule-strong bg-surface px-3 text-sm text-ink placeholder:text-muted/80 " +
  "focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-focus " +
  "disabled:cursor-not-allowed disabled:opacity-60 aria-invalid:border-fail aria-invalid:ring-1 aria-invalid:ring-fail";
