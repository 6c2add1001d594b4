import type { ComponentProps, ReactNode } from "react";
import { CircleCheck, CircleX, TriangleAlert } from "lucide-react";
import { cn } from "./cn";

export type BadgeTone = "neutral" | "pass" | "fail" | "warn" | "info";

const tones: Record<BadgeTone, string> = {
  neutral: "border-rule-strong/70 bg-sunken text-ink",
  pass: "border-pass/60 bg-pass/12 text-pass-strong",
  fail: "border-fail/60 bg-fail/12 text-fail-strong",
  warn: "border-warn/70 bg-warn/15 text-warn-strong",
  info: "border-sea/50 bg-sea/10 text-sea",
};

export type BadgeProps = ComponentProps<"span"> & { tone?: BadgeTone };

export function Badge({ tone = "neutral", className, ...rest }: BadgeProps) {
  return (
    <span
      className={cn("inline-flex items-center gap-1 rounded-full border px-2 py-0.5 text-xs font-medium whitespace-nowrap", tones[tone], className)}
      {...rest}
    />
  );
}

export type Verdict = "pass" | "fail" | "warn";

const verdictText: Record<Verdict, string> = { pass: "Pass", fail: "Fail", warn: "Warning" };
const verdictIcon: Record<Verdict, ReactNode> = {
  pass: <CircleCheck aria-hidden="true" className="h-3.5 w-3.5" />,
  fail: <CircleX aria-hidden="true" className="h-3.5 w-3.5" />,
  warn: <TriangleAlert aria-hidden="true" className="h-3.5 w-3.5" />,
};

export type VerdictBadgeProps = {
  verdict: Verdict;
  /** Replaces the default word ("Pass", "Fail", "Warning"). */
  label?: string;
  className?: string;
};

/** A verdict shown by icon and word together, never by colour alone. */
export function VerdictBadge({ verdict, label, className }: VerdictBadgeProps) {
  return (
    <Badge tone={verdict} className={cn("font-semibold", className)} data-verdict={verdict}>
      {verdictIcon[verdict]}
      {label ?? verdictText[verdict]}
    </Badge>
  );
}
