"use client";

import { IntentLink as Link } from "@/components/ui/intent-link";
import { usePathname } from "next/navigation";
import { cn } from "@/components/ui/cn";

export type NavLink = { href: string; label: string };

export function NavLinks({ links }: { links: NavLink[] }) {
  const pathname = usePathname() ?? "";
  return (
    <ul className="flex items-center gap-1">
      {links.map((l) => {
        const current = pathname === l.href || pathname.startsWith(`${l.href}/`);
        return (
          <li key={l.href}>
            <Link
              href={l.href}
              aria-current={current ? "page" : undefined}
              className={cn(
                "rounded-md px-2.5 py-1.5 text-sm font-medium transition-colors",
                "focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-focus",
                current ? "bg-ink/8 text-ink" : "text-muted hover:bg-ink/5 hover:text-ink",
              )}
            >
              {l.label}
            </Link>
          </li>
        );
      })}
    </ul>
  );
}
