import type { ReactNode } from "react";
import { cn } from "@/components/ui/cn";
import { Breadcrumbs, type BreadcrumbItem } from "./breadcrumbs";

export type PageHeaderProps = {
  title: ReactNode;
  description?: ReactNode;
  /** Buttons at the right (wrap under the title on narrow screens). */
  actions?: ReactNode;
  breadcrumbs?: BreadcrumbItem[];
  className?: string;
};

export function PageHeader({ title, description, actions, breadcrumbs, className }: PageHeaderProps) {
  return (
    <div className={cn("flex flex-col gap-3 border-b border-rule pb-5", className)}>
      {breadcrumbs && breadcrumbs.length > 0 ? <Breadcrumbs items={breadcrumbs} /> : null}
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div className="flex min-w-0 flex-col gap-1">
          <h1 className="text-2xl font-semibold text-ink">{title}</h1>
          {description ? <div className="max-w-prose text-sm text-muted">{description}</div> : null}
        </div>
        {actions ? <div className="flex flex-wrap items-center gap-2">{actions}</div> : null}
      </div>
    </div>
  );
}
