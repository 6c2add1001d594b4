"use client";

import { useEffect, useRef } from "react";
import type { PortRef, Scenario } from "@/engine/types";
import { linkedPeer, systemPortAt } from "@/lib/browser/scenario-model";
import { portLabelsOf } from "@/lib/browser/catalogue";

export type PortMenuAction = "mark" | "unmark" | "unlink" | "inspect";

export type PortMenuProps = {
  scenario: Scenario;
  refId: PortRef;
  anchor: { x: number; y: number };
  readOnly: boolean;
  onAction: (action: PortMenuAction) => void;
  onClose: () => void;
};

/** The context menu of a port handle: mark or unmark it as a system port, unlink it, or open it in the inspector. */
export function PortMenu({ scenario, refId, anchor, readOnly, onAction, onClose }: PortMenuProps) {
  const box = useRef<HTMLDivElement>(null);
  const sys = systemPortAt(scenario, refId);
  const peer = linkedPeer(scenario, refId);
  const name = portName(scenario, refId);

  useEffect(() => {
    box.current?.querySelector<HTMLButtonElement>("button:not([disabled])")?.focus();
    const onDown = (e: MouseEvent) => {
      if (box.current && !box.current.contains(e.target as Node)) onClose();
    };
    const onKey = (e: KeyboardEvent) => {
      if (e.key === "Escape") onClose();
    };
    document.addEventListener("mousedown", onDown);
    document.addEventListener("keydown", onKey);
    return () => {
      document.removeEventListener("mousedown", onDown);
      document.removeEventListener("keydown", onKey);
    };
  }, [onClose]);

  const item = "w-full rounded px-3 py-1.5 text-left text-sm text-ink hover:bg-sunken focus-visible:bg-sunken focus-visible:outline-none disabled:opacity-50";
  return (
    <div
      ref={box}
      role="menu"
      aria-label={name ? `Port ${refId} (${name})` : `Port ${refId}`}
      className="fixed z-50 min-w-52 rounded-card border-[1.5px] border-ink bg-surface p-1 shadow-lg"
      style={{ left: anchor.x + 4, top: anchor.y + 4 }}
      onKeyDown={(e) => {
        if (e.key !== "ArrowDown" && e.key !== "ArrowUp") return;
        e.preventDefault();
        const items = [...(box.current?.querySelectorAll<HTMLButtonElement>("button:not([disabled])") ?? [])];
        const at = items.indexOf(document.activeElement as HTMLButtonElement);
        items[(at + (e.key === "ArrowDown" ? 1 : items.length - 1)) % items.length]?.focus();
      }}
    >
      <p className="px-3 py-1 text-xs text-ink">
        <span className="font-mono">{refId}</span>
        {name ? <span className="ml-1.5 whitespace-nowrap rounded border border-rule px-1.5 py-0.5">{name}</span> : null}
      </p>
      {sys ? (
        <button type="button" role="menuitem" className={item} disabled={readOnly} onClick={() => onAction("unmark")}>
          Unmark system port {sys.name}
        </button>
      ) : (
        <button type="button" role="menuitem" className={item} disabled={readOnly || Boolean(peer)} onClick={() => onAction("mark")}>
          Mark as system port{peer ? " (unlink first)" : ""}
        </button>
      )}
      {peer ? (
        <button type="button" role="menuitem" className={item} disabled={readOnly} onClick={() => onAction("unlink")}>
          Unlink from {peer}
        </button>
      ) : null}
      <button type="button" role="menuitem" className={item} onClick={() => onAction("inspect")}>
        Show in inspector
      </button>
    </div>
  );
}

/** The catalogue's name of a port ("output", "throw 2"); parts number their ports, so they have none beyond it. */
function portName(scenario: Scenario, refId: PortRef): string | null {
  const [blockId, portText] = [refId.slice(0, refId.lastIndexOf(":")), refId.slice(refId.lastIndexOf(":") + 1)];
  const block = scenario.blocks.find((b) => b.id === blockId);
  if (!block || block.kind === "touchstone") return null;
  const label = portLabelsOf(block, 0)[Number(portText) - 1];
  return label && label !== portText ? label : null;
}
