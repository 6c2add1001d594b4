"use client";

import { useId, useRef, useState, type KeyboardEvent, type ReactNode } from "react";
import { cn } from "./cn";

export type TabItem = {
  id: string;
  label: ReactNode;
  content: ReactNode;
  disabled?: boolean;
};

export type TabsProps = {
  tabs: TabItem[];
  /** Accessible name of the tab list. */
  label: string;
  /** Uncontrolled starting tab (defaults to the first). */
  defaultValue?: string;
  /** Controlled selected tab. */
  value?: string;
  onValueChange?: (id: string) => void;
  className?: string;
  /** Keep every panel mounted (hidden) instead of mounting only the selected one. */
  keepMounted?: boolean;
};

/** WAI-ARIA tabs: arrow keys, Home and End move between tabs; only the selected tab is in the tab order. */
export function Tabs({ tabs, label, defaultValue, value, onValueChange, className, keepMounted = false }: TabsProps) {
  const baseId = useId();
  const [inner, setInner] = useState(defaultValue ?? tabs[0]?.id);
  const selected = value ?? inner;
  const refs = useRef<Map<string, HTMLButtonElement>>(new Map());

  function select(id: string) {
    if (value === undefined) setInner(id);
    onValueChange?.(id);
  }

  function onKeyDown(e: KeyboardEvent<HTMLDivElement>) {
    const enabled = tabs.filter((t) => !t.disabled);
    const at = enabled.findIndex((t) => t.id === selected);
    let next: TabItem | undefined;
    if (e.key === "ArrowRight") next = enabled[(at + 1) % enabled.length];
    else if (e.key === "ArrowLeft") next = enabled[(at - 1 + enabled.length) % enabled.length];
    else if (e.key === "Home") next = enabled[0];
    else if (e.key === "End") next = enabled[enabled.length - 1];
    if (!next) return;
    e.preventDefault();
    select(next.id);
    refs.current.get(next.id)?.focus();
  }

  return (
    <div className={cn("flex flex-col", className)}>
      <div role="tablist" aria-label={label} onKeyDown={onKeyDown} className="flex gap-1 border-b border-rule">
        {tabs.map((t) => {
          const isSelected = t.id === selected;
          return (
            <button
              key={t.id}
              ref={(el) => {
                if (el) refs.current.set(t.id, el);
                else refs.current.delete(t.id);
              }}
              type="button"
              role="tab"
              id={`${baseId}-tab-${t.id}`}
              aria-controls={`${baseId}-panel-${t.id}`}
              aria-selected={isSelected}
              tabIndex={isSelected ? 0 : -1}
              disabled={t.disabled}
              onClick={() => select(t.id)}
              className={cn(
                "-mb-px border-b-2 px-3 py-2 text-sm font-medium transition-colors",
                "focus-visible:outline-2 focus-visible:-outline-offset-2 focus-visible:outline-focus disabled:opacity-50",
                isSelected ? "border-ink text-ink" : "border-transparent text-muted hover:text-ink",
              )}
            >
              {t.label}
            </button>
          );
        })}
      </div>
      {tabs.map((t) => {
        const isSelected = t.id === selected;
        if (!isSelected && !keepMounted) return null;
        return (
          <div
            key={t.id}
            role="tabpanel"
            id={`${baseId}-panel-${t.id}`}
            aria-labelledby={`${baseId}-tab-${t.id}`}
            hidden={!isSelected}
            tabIndex={0}
            className="pt-4 focus-visible:outline-2 focus-visible:outline-focus"
          >
            {t.content}
          </div>
        );
      })}
    </div>
  );
}
