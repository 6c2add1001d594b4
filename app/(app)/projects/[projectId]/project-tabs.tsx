"use client";

import { IntentLink as Link } from "@/components/ui/intent-link";
import { usePathname } from "next/navigation";
import { cn } from "@/components/ui/cn";

export type ProjectTab = { href: string; label: string; exact?: boolean };

/** The project's sections as links (each is its own page, so they are navigation, not ARIA tabs). */
export function ProjectTabs({ tabs }: { tabs: ProjectTab[] }) {
  const pathname = usePathname() ?? "";
  return (
    <nav aria-label="Project sections" className="border-b border-rule">
      <ul className="-mb-px flex flex-wrap gap-1">
        {tabs.map((tab) => {
          const current = tab.exact ? pathname === tab.href : pathname === tab.href || pathname.startsWith(`${tab.href}/`);
          return (
            <li key={tab.href}>
              <Link
                href={tab.href}
                aria-current={current ? "page" : undefined}
                className={cn(
                  "inline-flex border-b-2 px-3 py-2 text-sm font-medium",
                  "focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-focus",
                  current ? "border-ink text-ink" : "border-transparent text-muted hover:text-ink",
                )}
              >
                {tab.label}
              </Link>
            </li>
          );
        })}
      </ul>
    </nav>
  );
}
