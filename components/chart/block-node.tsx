"use client";

import { memo, type CSSProperties } from "react";
import { Handle, Position, type Node, type NodeProps } from "@xyflow/react";
import type { PortRef } from "@/engine/types";
import { cn } from "@/components/ui/cn";
import type { WorkspaceBlock } from "@/lib/browser/scenario-model";
import { formatNumber } from "@/lib/browser/format";
import { cardHeight, placePorts, type Side } from "./port-layout";

export const CARD_WIDTH = 156;

export type BlockNodeData = {
  block: WorkspaceBlock;
  /** kind title from the catalogue, or the part's name */
  title: string;
  portCount: number;
  portLabels: string[];
  /** system ports on this block by port number */
  systemPorts: Record<number, { name: string; z0: number }>;
  linkedPorts: number[];
  readOnly: boolean;
  onSetSwitch: (id: string, state: number) => void;
  onPortMenu: (ref: PortRef, anchor: { x: number; y: number }) => void;
};

export type BlockNodeType = Node<BlockNodeData, "block">;

const POSITION: Record<Side, Position> = { left: Position.Left, right: Position.Right, top: Position.Top, bottom: Position.Bottom };

function handleStyle(side: Side, at: number): CSSProperties {
  return side === "left" || side === "right" ? { top: `${at * 100}%` } : { left: `${at * 100}%` };
}

function numberStyle(side: Side, at: number): CSSProperties {
  const pct = `${at * 100}%`;
  switch (side) {
    case "left":
      return { left: 8, top: pct, transform: "translateY(-50%)" };
    case "right":
      return { right: 8, top: pct, transform: "translateY(-50%)" };
    case "top":
      return { top: 4, left: pct, transform: "translateX(-50%)" };
    default:
      return { bottom: 4, left: pct, transform: "translateX(-50%)" };
  }
}

function flagStyle(side: Side, at: number): CSSProperties {
  const pct = `${at * 100}%`;
  switch (side) {
    // Links leave a left/right port horizontally and a top/bottom port vertically, so the tag sits just
    // above the link's line (or beside it), never on it.
    case "left":
      return { right: "calc(100% + 4px)", top: pct, transform: "translateY(calc(-100% - 7px))" };
    case "right":
      return { left: "calc(100% + 4px)", top: pct, transform: "translateY(calc(-100% - 7px))" };
    case "top":
      return { bottom: "calc(100% + 4px)", left: `calc(${pct} + 10px)` };
    default:
      return { top: "calc(100% + 4px)", left: `calc(${pct} + 10px)` };
  }
}

function BlockNodeView({ data, selected }: NodeProps<BlockNodeType>) {
  const { block, title, portCount, portLabels, systemPorts, linkedPorts, readOnly } = data;
  const placements = placePorts(block.kind, portCount);
  const height = cardHeight(placements);
  const throws = block.kind === "switch" ? Math.max(1, portCount - 1) : 0;
  const state = block.state ?? 1;

  return (
    <div
      className={cn(
        "relative rounded-card border-[1.5px] border-ink bg-surface text-ink shadow-[2px_2px_0_0_var(--pt-rule)]",
        selected && "outline-2 outline-offset-2 outline-focus",
      )}
      style={{ width: CARD_WIDTH, minHeight: height }}
    >
      <div className="pointer-events-none flex flex-col items-center px-7 pt-2 text-center">
        {/* wrap, never clip: "DIRECTIONAL C…" told the reader nothing (the card grows to fit) */}
        <span className="max-w-full font-mono text-sm font-semibold break-all" data-testid="block-id">
          {block.id}
        </span>
        <span className="max-w-full text-[0.68rem] leading-tight tracking-wide text-balance break-words text-muted uppercase" data-testid="block-title">
          {title}
        </span>
      </div>
      {block.spread && Object.keys(block.spread).length > 0 ? (
        // the block takes part in the spread analysis: its parameters named here carry a spread
        <span
          className="pointer-events-none absolute top-1 right-1.5 rounded-sm border border-rule-strong bg-surface px-1 font-mono text-[0.65rem] leading-4 text-muted"
          title={`Spread on ${Object.keys(block.spread).join(", ")}`}
          aria-label={`${block.id} has spreads`}
          data-testid="spread-badge"
        >
          ±
        </span>
      ) : null}

      {throws > 0 ? (
        <div className="nodrag nopan absolute inset-x-0 bottom-1.5 flex justify-center gap-1" role="group" aria-label={`${block.id} throw`}>
          {Array.from({ length: throws }, (_, k) => k + 1).map((t) => (
            <button
              key={t}
              type="button"
              disabled={readOnly}
              aria-pressed={t === state}
              aria-label={`${block.id}: select throw ${t}`}
              title={`Throw ${t} (port ${t + 1})`}
              onClick={(e) => {
                e.stopPropagation();
                data.onSetSwitch(block.id, t);
              }}
              className={cn(
                "h-5 min-w-5 rounded border px-1 font-mono text-[0.65rem] leading-none",
                t === state ? "border-ink bg-ink text-on-ink" : "border-rule-strong bg-paper text-muted hover:border-ink",
                "disabled:cursor-default",
              )}
            >
              {t}
            </button>
          ))}
        </div>
      ) : null}

      {placements.map(({ port, side, at }) => {
        const sys = systemPorts[port];
        const ref = `${block.id}:${port}`;
        const linked = linkedPorts.includes(port);
        const label = portLabels[port - 1];
        return (
          <div key={port}>
            <Handle
              id={`p${port}`}
              type="source"
              position={POSITION[side]}
              style={handleStyle(side, at)}
              // always connectable: an illegal link is refused by the workspace with a message, not silently
              isConnectable={!readOnly}
              // a named graphic: the handle is a mouse target (the keyboard way is the inspector's port list),
              // and an aria-label needs a role to be announced at all
              role="img"
              aria-label={`Port ${ref}${label && label !== String(port) ? ` (${label})` : ""}${sys ? `, system port ${sys.name}` : ""}${linked ? ", linked" : ""}`}
              title={`${ref}${label && label !== String(port) ? ` — ${label}` : ""}. Drag to another port to link; right-click for system port.`}
              onContextMenu={(e) => {
                e.preventDefault();
                e.stopPropagation();
                data.onPortMenu(ref, { x: e.clientX, y: e.clientY });
              }}
              className={cn(
                "!h-3 !w-3 !rounded-full !border-[1.5px] !border-ink",
                sys ? "!bg-ink" : linked ? "!bg-rule-strong" : "!bg-paper",
              )}
            />
            <span className="pointer-events-none absolute font-mono text-[0.62rem] text-muted" style={numberStyle(side, at)} aria-hidden="true">
              {port}
            </span>
            {sys ? (
              <span
                className="pointer-events-none absolute flex items-center gap-1 whitespace-nowrap rounded-sm border-[1.5px] border-ink bg-paper px-1.5 py-0.5 font-mono text-[0.68rem] font-semibold text-ink"
                style={flagStyle(side, at)}
                data-system-port={sys.name}
              >
                <span aria-hidden="true">⚑</span>
                {sys.name}
                <span className="font-normal text-muted">{formatNumber(sys.z0, 4)} Ω</span>
              </span>
            ) : null}
          </div>
        );
      })}
    </div>
  );
}

export const BlockNode = memo(BlockNodeView);
