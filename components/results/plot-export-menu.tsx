"use client";

import { useEffect, useId, useRef, useState } from "react";
import { Download } from "lucide-react";
import { Button } from "@/components/ui";
import { exportPlot, type PlotExportKind } from "@/lib/browser/plot-export";

export type PlotExportMenuProps = {
  /** what the plot shows, for the button's accessible name and the SVG's title, e.g. "trace plot" */
  what: string;
  /** file name without extension (from fileStem) */
  stem: string;
  /** the plot's <svg> when drawn */
  svg: () => SVGSVGElement | null;
  /** the plot's data as CSV */
  csv: () => string;
};

const ITEMS: { kind: PlotExportKind; label: string }[] = [
  { kind: "png", label: "PNG image" },
  { kind: "svg", label: "SVG image" },
  { kind: "csv", label: "CSV data" },
];

/** A small menu beside a plot: download it as PNG or SVG, or its data as CSV. */
export function PlotExportMenu({ what, stem, svg, csv }: PlotExportMenuProps) {
  const [open, setOpen] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const box = useRef<HTMLDivElement>(null);
  const menuId = useId();

  useEffect(() => {
    if (!open) return;
    const away = (e: PointerEvent) => {
      if (!box.current?.contains(e.target as Node)) setOpen(false);
    };
    document.addEventListener("pointerdown", away);
    box.current?.querySelector<HTMLButtonElement>('[role="menuitem"]')?.focus();
    return () => document.removeEventListener("pointerdown", away);
  }, [open]);

  const choose = (kind: PlotExportKind) => {
    setOpen(false);
    setError(null);
    exportPlot(kind, stem, svg(), csv, what).catch((e: unknown) => setError(e instanceof Error ? e.message : String(e)));
  };

  return (
    <div
      ref={box}
      className="relative"
      onKeyDown={(e) => {
        if (e.key === "Escape" && open) {
          e.stopPropagation();
          setOpen(false);
          box.current?.querySelector<HTMLButtonElement>("button")?.focus();
        }
        if (open && (e.key === "ArrowDown" || e.key === "ArrowUp")) {
          e.preventDefault();
          const items = Array.from(box.current?.querySelectorAll<HTMLButtonElement>('[role="menuitem"]') ?? []);
          const at = items.indexOf(document.activeElement as HTMLButtonElement);
          items[(at + (e.key === "ArrowDown" ? 1 : items.length - 1)) % items.length]?.focus();
        }
      }}
    >
      <Button variant="ghost" size="sm" aria-label={`Export ${what}`} aria-haspopup="menu" aria-expanded={open} aria-controls={open ? menuId : undefined} onClick={() => setOpen((o) => !o)}>
        <Download aria-hidden="true" className="h-3.5 w-3.5" /> Export
      </Button>
      {open ? (
        <div id={menuId} role="menu" aria-label={`Export ${what}`} className="absolute right-0 z-20 mt-1 flex min-w-36 flex-col rounded-card border border-rule bg-surface p-1 shadow-md">
          {ITEMS.map((item) => (
            <button key={item.kind} type="button" role="menuitem" className="rounded px-2 py-1 text-left text-sm text-ink hover:bg-sunken focus-visible:bg-sunken" onClick={() => choose(item.kind)}>
              {item.label}
            </button>
          ))}
        </div>
      ) : null}
      {error ? (
        <p role="alert" className="absolute right-0 mt-1 w-56 text-xs text-fail-strong">
          {error}
        </p>
      ) : null}
    </div>
  );
}
