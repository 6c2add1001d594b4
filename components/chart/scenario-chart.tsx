"use client";

import { useCallback, useLayoutEffect, useMemo, useRef, useState } from "react";
import {
  applyNodeChanges,
  ConnectionMode,
  ReactFlow,
  type Connection,
  type Edge,
  type EdgeChange,
  type NodeChange,
} from "@xyflow/react";
import "@xyflow/react/dist/base.css";
import type { PortRef, Scenario } from "@/engine/types";
import { BearingBackdrop } from "@/components/shell/bearing-backdrop";
import { blockTitle, portLabelsOf } from "@/lib/browser/catalogue";
import { parsePortRef, portCountOf, type PartSummary } from "@/lib/browser/scenario-model";
import { BlockNode, type BlockNodeData, type BlockNodeType } from "./block-node";

export type ChartSelection = { blocks: string[]; links: string[] };

export type ScenarioChartProps = {
  scenario: Scenario;
  parts: readonly PartSummary[];
  readOnly: boolean;
  selection: ChartSelection;
  onSelectionChange: (selection: ChartSelection) => void;
  /** positions after a drag or a keyboard move, by block id; `key` folds a run of arrow-key moves into one undo step */
  onMoveBlocks: (positions: Record<string, { x: number; y: number }>, key?: string) => void;
  /** a link dragged from one port handle to another (the workspace checks it is legal) */
  onLink: (a: PortRef, b: PortRef) => void;
  onSetSwitch: (id: string, state: number) => void;
  /** context action on a port handle (mark as system port, unlink) */
  onPortMenu: (ref: PortRef, anchor: { x: number; y: number }) => void;
  /** blocks and block ports to mark (a leak path from the checks); a link is marked when both ends are listed */
  highlight?: { blocks: string[]; ports: PortRef[] } | null;
};

const nodeTypes = { block: BlockNode };

/** Edge id of a link; the two refs in scenario order. */
export function linkId(a: PortRef, b: PortRef): string {
  return `${a}~${b}`;
}

function handleRef(node: string | null, handle: string | null | undefined): PortRef | null {
  if (!node || !handle) return null;
  const port = Number(handle.replace(/^p/, ""));
  return Number.isInteger(port) && port >= 1 ? `${node}:${port}` : null;
}

/** The chart: blocks as cards with one handle per port, links as lines between handles. */
export function ScenarioChart(props: ScenarioChartProps) {
  const { scenario, parts, readOnly, selection, onSelectionChange, onMoveBlocks, onLink, onSetSwitch, onPortMenu, highlight } = props;
  // selection as last reported, so that node and edge changes arriving in one gesture add up
  const selectionRef = useRef(selection);
  useLayoutEffect(() => {
    selectionRef.current = selection;
  }, [selection]);

  const built = useMemo<BlockNodeType[]>(() => {
    const selected = new Set(selection.blocks);
    const marked = new Set(highlight?.blocks ?? []);
    return scenario.blocks.map((block, index) => {
      const n = portCountOf(block, parts);
      const systemPorts: BlockNodeData["systemPorts"] = {};
      for (const p of scenario.ports) {
        const at = parsePortRef(p.at);
        if (at && at.block === block.id) systemPorts[at.port] = { name: p.name, z0: p.z0 ?? scenario.z0 };
      }
      const linkedPorts: number[] = [];
      for (const [a, b] of scenario.links) {
        for (const ref of [a, b]) {
          const at = parsePortRef(ref);
          if (at && at.block === block.id) linkedPorts.push(at.port);
        }
      }
      return {
        id: block.id,
        type: "block" as const,
        position: block.position ?? { x: 40 + (index % 4) * 220, y: 40 + Math.floor(index / 4) * 160 },
        selected: selected.has(block.id),
        draggable: !readOnly,
        connectable: !readOnly,
        ariaLabel: `Block ${block.id}, ${blockTitle(block, parts)}, ${n} port${n === 1 ? "" : "s"}${marked.has(block.id) ? ", on the highlighted leak path" : ""}`,
        className: marked.has(block.id) ? "pt-highlighted" : undefined,
        style: marked.has(block.id) ? { outline: "3px solid var(--pt-fail)", outlineOffset: 3, borderRadius: 6 } : undefined,
        data: {
          block,
          title: blockTitle(block, parts),
          portCount: n,
          portLabels: portLabelsOf(block, n),
          systemPorts,
          linkedPorts,
          readOnly,
          onSetSwitch,
          onPortMenu,
        },
      };
    });
  }, [scenario, parts, readOnly, selection.blocks, onSetSwitch, onPortMenu, highlight]);

  // Local copy so that a drag moves the card at once; the scenario gets the position when the drag ends.
  const [nodes, setNodes] = useState<BlockNodeType[]>(built);
  const [shownBuilt, setShownBuilt] = useState(built);
  if (shownBuilt !== built) {
    // the scenario changed: take its nodes, keeping what React Flow measured
    setShownBuilt(built);
    setNodes((previous) => {
      const measured = new Map(previous.map((n) => [n.id, n.measured]));
      return built.map((n) => (measured.get(n.id) ? { ...n, measured: measured.get(n.id) } : n));
    });
  }

  const edges = useMemo<Edge[]>(() => {
    const selected = new Set(selection.links);
    const markedPorts = new Set(highlight?.ports ?? []);
    return scenario.links.flatMap(([a, b]) => {
      const pa = parsePortRef(a);
      const pb = parsePortRef(b);
      if (!pa || !pb) return [];
      const id = linkId(a, b);
      const isSelected = selected.has(id);
      const isMarked = markedPorts.has(a) && markedPorts.has(b);
      return [
        {
          id,
          source: pa.block,
          sourceHandle: `p${pa.port}`,
          target: pb.block,
          targetHandle: `p${pb.port}`,
          selected: isSelected,
          ariaLabel: `Link ${a} to ${b}${isMarked ? ", on the highlighted leak path" : ""}`,
          style: { stroke: isSelected ? "var(--pt-focus)" : isMarked ? "var(--pt-fail)" : "var(--pt-ink)", strokeWidth: isSelected || isMarked ? 3 : 1.5 },
          interactionWidth: 14,
        },
      ];
    });
  }, [scenario.links, selection.links, highlight]);

  const onNodesChange = useCallback(
    (changes: NodeChange<BlockNodeType>[]) => {
      setNodes((current) => applyNodeChanges(changes, current));
      const moved: Record<string, { x: number; y: number }> = {};
      let anyMoved = false;
      const chosen = new Set(selectionRef.current.blocks);
      let anySelect = false;
      for (const c of changes) {
        if (c.type === "position" && c.position && !c.dragging) {
          moved[c.id] = c.position;
          anyMoved = true;
        }
        if (c.type === "select") {
          anySelect = true;
          if (c.selected) chosen.add(c.id);
          else chosen.delete(c.id);
        }
      }
      if (anyMoved && !readOnly) onMoveBlocks(moved, `move:${Object.keys(moved).sort().join(",")}`);
      if (anySelect) {
        const next = { blocks: [...chosen], links: selectionRef.current.links };
        selectionRef.current = next;
        onSelectionChange(next);
      }
    },
    [onMoveBlocks, onSelectionChange, readOnly],
  );

  const onEdgesChange = useCallback(
    (changes: EdgeChange[]) => {
      const chosen = new Set(selectionRef.current.links);
      let anySelect = false;
      for (const c of changes) {
        if (c.type !== "select") continue;
        anySelect = true;
        if (c.selected) chosen.add(c.id);
        else chosen.delete(c.id);
      }
      if (!anySelect) return;
      const next = { blocks: selectionRef.current.blocks, links: [...chosen] };
      selectionRef.current = next;
      onSelectionChange(next);
    },
    [onSelectionChange],
  );

  const onConnect = useCallback(
    (c: Connection) => {
      const a = handleRef(c.source, c.sourceHandle);
      const b = handleRef(c.target, c.targetHandle);
      if (a && b) onLink(a, b);
    },
    [onLink],
  );

  const onNodeDragStop = useCallback(
    (_: unknown, _node: BlockNodeType, dragged: BlockNodeType[]) => {
      if (readOnly) return;
      const moved: Record<string, { x: number; y: number }> = {};
      for (const n of dragged) moved[n.id] = n.position;
      onMoveBlocks(moved);
    },
    [onMoveBlocks, readOnly],
  );

  return (
    <div className="absolute inset-0 overflow-hidden bg-paper" data-testid="scenario-chart">
      <BearingBackdrop origin={[0.35, 0.82]} lines={32} ring={false} />
      <ReactFlow<BlockNodeType, Edge>
        nodes={nodes}
        edges={edges}
        nodeTypes={nodeTypes}
        onNodesChange={onNodesChange}
        onEdgesChange={onEdgesChange}
        onConnect={onConnect}
        onNodeDragStop={onNodeDragStop}
        connectionMode={ConnectionMode.Loose}
        nodesDraggable={!readOnly}
        nodesConnectable={!readOnly}
        edgesFocusable
        nodesFocusable
        deleteKeyCode={null}
        selectionKeyCode="Shift"
        multiSelectionKeyCode={["Meta", "Control", "Shift"]}
        fitView
        fitViewOptions={{ padding: 0.25, maxZoom: 1.25 }}
        minZoom={0.2}
        maxZoom={2.5}
        attributionPosition="bottom-right"
        connectionLineStyle={{ stroke: "var(--pt-ink)", strokeWidth: 1.5, strokeDasharray: "4 3" }}
        aria-label="Chart"
        className="portolan-chart"
      />
    </div>
  );
}
