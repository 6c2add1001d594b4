"use client";

import { useSyncExternalStore } from "react";
import { Monitor, Moon, Sun } from "lucide-react";
import { cn } from "@/components/ui/cn";
import { THEME_STORAGE_KEY } from "./theme-script";

export type ThemeChoice = "system" | "light" | "dark";


const order: ThemeChoice[] = ["system", "light", "dark"];
const labels: Record<ThemeChoice, string> = { system: "Theme: system", light: "Theme: light", dark: "Theme: dark" };

function applyTheme(choice: ThemeChoice) {
  const root = document.documentElement;
  if (choice === "system") delete root.dataset.theme;
  else root.dataset.theme = choice;
  try {
    if (choice === "system") localStorage.removeItem(THEME_STORAGE_KEY);
    else localStorage.setItem(THEME_STORAGE_KEY, choice);
  } catch {
    // Storage may be blocked; the choice then lasts for this page only.
  }
}

function subscribeToTheme(onChange: () => void): () => void {
  const observer = new MutationObserver(onChange);
  observer.observe(document.documentElement, { attributes: true, attributeFilter: ["data-theme"] });
  return () => observer.disconnect();
}

function readTheme(): ThemeChoice {
  const t = document.documentElement.dataset.theme;
  return t === "light" || t === "dark" ? t : "system";
}

/** Cycles system → light → dark. */
export function ThemeToggle({ className }: { className?: string }) {
  // the choice lives on <html data-theme> (set before first paint by the boot script); the server
  // cannot know it and renders "system"
  const choice = useSyncExternalStore(subscribeToTheme, readTheme, () => "system" as const);

  const Icon = choice === "light" ? Sun : choice === "dark" ? Moon : Monitor;
  const next = order[(order.indexOf(choice) + 1) % order.length];

  return (
    <button
      type="button"
      onClick={() => {
        applyTheme(next);
      }}
      title={`${labels[choice]} (switch to ${next})`}
      aria-label={`${labels[choice]}. Switch to ${next}.`}
      className={cn(
        "inline-flex h-8 w-8 items-center justify-center rounded-md text-muted hover:bg-ink/8 hover:text-ink",
        "focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-focus",
        className,
      )}
    >
      <Icon aria-hidden="true" className="h-4 w-4" />
    </button>
  );
}
