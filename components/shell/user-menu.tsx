"use client";

import { useEffect, useId, useRef, useState } from "react";
import { IntentLink as Link } from "@/components/ui/intent-link";
import { ChevronDown, LogOut } from "lucide-react";
import { cn } from "@/components/ui/cn";

export type UserMenuProps = {
  name: string;
  email: string;
  isSiteAdmin?: boolean;
  /** Server action that ends the session; the menu posts a form to it. */
  signOutAction?: () => Promise<void>;
  /** The header's navigation, repeated in the menu on narrow screens (where the header hides it). */
  links?: { href: string; label: string }[];
};

function initialsOf(name: string, email: string): string {
  const words = name.trim().split(/\s+/).filter(Boolean);
  if (words.length >= 2) return (words[0][0] + words[words.length - 1][0]).toUpperCase();
  if (words.length === 1) return words[0].slice(0, 2).toUpperCase();
  return email.slice(0, 2).toUpperCase();
}

/** The signed-in person's menu: who they are, and sign out. Escape or a click elsewhere closes it. */
export function UserMenu({ name, email, isSiteAdmin = false, signOutAction, links = [] }: UserMenuProps) {
  const [open, setOpen] = useState(false);
  const rootRef = useRef<HTMLDivElement>(null);
  const buttonRef = useRef<HTMLButtonElement>(null);
  const menuId = useId();

  useEffect(() => {
    if (!open) return;
    function onPointer(e: PointerEvent) {
      if (rootRef.current && !rootRef.current.contains(e.target as Node)) setOpen(false);
    }
    function onKey(e: KeyboardEvent) {
      if (e.key !== "Escape") return;
      setOpen(false);
      buttonRef.current?.focus();
    }
    document.addEventListener("pointerdown", onPointer);
    document.addEventListener("keydown", onKey);
    return () => {
      document.removeEventListener("pointerdown", onPointer);
      document.removeEventListener("keydown", onKey);
    };
  }, [open]);

  return (
    <div ref={rootRef} className="relative">
      <button
        ref={buttonRef}
        type="button"
        aria-expanded={open}
        aria-controls={menuId}
        onClick={() => setOpen((o) => !o)}
        className={cn(
          "inline-flex items-center gap-2 rounded-md py-1 pr-1.5 pl-1 text-sm text-ink hover:bg-ink/8",
          "focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-focus",
        )}
      >
        <span aria-hidden="true" className="inline-flex h-7 w-7 items-center justify-center rounded-full border border-rule-strong bg-sunken text-xs font-semibold">
          {initialsOf(name, email)}
        </span>
        <span className="hidden max-w-[12rem] truncate sm:inline">{name || email}</span>
        <span className="sr-only">Account menu</span>
        <ChevronDown aria-hidden="true" className="h-3.5 w-3.5 text-muted" />
      </button>
      <div
        id={menuId}
        hidden={!open}
        className="absolute right-0 z-50 mt-1.5 w-[min(16rem,calc(100vw-1.5rem))] rounded-card border border-rule bg-surface p-1.5 shadow-lg"
      >
        <div className="border-b border-rule px-2.5 pt-1.5 pb-2.5">
          <p className="truncate text-sm font-medium text-ink">{name}</p>
          <p className="truncate text-xs text-muted">{email}</p>
          {isSiteAdmin ? <p className="mt-1 text-xs font-medium text-sea">Site admin</p> : null}
        </div>
        {links.length > 0 ? (
          <nav aria-label="Main (menu)" className="border-b border-rule py-1.5 sm:hidden">
            <ul>
              {links.map((l) => (
                <li key={l.href}>
                  <Link
                    href={l.href}
                    onClick={() => setOpen(false)}
                    className="block rounded-md px-2.5 py-1.5 text-sm text-ink hover:bg-ink/8 focus-visible:outline-2 focus-visible:outline-focus"
                  >
                    {l.label}
                  </Link>
                </li>
              ))}
            </ul>
          </nav>
        ) : null}
        {signOutAction ? (
          <form action={signOutAction} className="pt-1.5">
            <button
              type="submit"
              className={cn(
                "flex w-full items-center gap-2 rounded-md px-2.5 py-1.5 text-left text-sm text-ink hover:bg-ink/8",
                "focus-visible:outline-2 focus-visible:outline-focus",
              )}
            >
              <LogOut aria-hidden="true" className="h-4 w-4 text-muted" />
              Sign out
            </button>
          </form>
        ) : null}
      </div>
    </div>
  );
}
