import type { ReactNode } from "react";
import { CircleCheck, CircleX, Info, TriangleAlert } from "lucide-react";
import { cn } from "./cn";

export type AlertTone = "info" | "error" | "success" | "warn";

const tones: Record<AlertTone, string> = {
  info: "border-sea/50 bg-sea/8 text-ink",
  error: "border-fail/60 bg-fail/10 text-ink",
  success: "border-pass/60 bg-pass/10 text-ink",
  warn: "border-warn/70 bg-warn/12 text-ink",
};

const icons: Record<AlertTone, ReactNode> = {
  info: <Info aria-hidden="true" className="h-4 w-4 text-sea" />,
  error: <CircleX aria-hidden="true" className="h-4 w-4 text-fail" />,
  success: <CircleCheck aria-hidden="true" className="h-4 w-4 text-pass" />,
  warn: <TriangleAlert aria-hidden="true" className="h-4 w-4 text-warn" />,
};

export type AlertProps = {
  tone?: AlertTone;
  title?: ReactNode;
  children?: ReactNode;
  /** Buttons or links at the end of the alert. */
  actions?: ReactNode;
  className?: string;
};

/** A message box; errors are announced at once (role="alert"), the rest politely (role="status"). */
export function Alert({ tone = "info", title, children, actions, className }: AlertProps) {
  return (
    <div role={tone === "error" ? "alert" : "status"} className={cn("flex gap-3 rounded-card border px-3.5 py-3 text-sm", tones[tone], className)}>
      <div className="mt-0.5 shrink-0">{icons[tone]}</div>
      <div className="flex min-w-0 flex-1 flex-col gap-1">
        {title ? <p className="font-semibold">{title}</p> : null}
        {children ? <div className="text-ink/90">{children}</div> : null}
        {actions ? <div className="mt-1 flex flex-wrap gap-2">{actions}</div> : null}
      </div>
    </div>
  );
}
