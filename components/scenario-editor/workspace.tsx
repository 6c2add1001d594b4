"use client";

import { useCallback, useEffect, useLayoutEffect, useMemo, useRef, useState, type ReactNode } from "react";
import { ReactFlowProvider, useReactFlow } from "@xyflow/react";
import { Compass, Copy, ClipboardPaste, List, Maximize, Network, Plus, Redo2, Trash2, Undo2 } from "lucide-react";
import type { PortRef, RuleSpec, Scenario } from "@/engine/types";
import { Badge, Button, Kbd, Spinner, Tabs } from "@/components/ui";
import { cn } from "@/components/ui/cn";
import { AddBlockPalette, ScenarioChart, CARD_WIDTH, type AddBlockChoice, type ChartSelection } from "@/components/chart";
import { BlockInspector, ScenarioPanel } from "@/components/inspector";
import { ResultsPanel } from "@/components/results";
import { useHelmOpener } from "@/components/helm/helm-context";
import { resolveVariables } from "@/lib/browser/expressions";
import { useExpressionsReady } from "@/lib/browser/use-expressions-ready";
import { createHistory, recordEdit, redo, undo, type History } from "@/lib/browser/history";
import {
  addBlock,
  addLink,
  copyBlocks,
  moveBlocks,
  nextSystemPortName,
  parsePortRef,
  pasteBlocks,
  removeBlocks,
  removeLinkAt,
  removeSystemPort,
  setSwitchState,
  setSystemPort,
  type Clipboard,
  type PartSummary,
} from "@/lib/browser/scenario-model";
import { useSolver } from "@/lib/browser/use-solver";
import { PortMenu, type PortMenuAction } from "./port-menu";
import { ShortcutSheet } from "./shortcut-sheet";
import { ScenarioListView } from "./scenario-list-view";
import { PaneBox, WorkspacePanes, useWorkspaceFrame } from "./workspace-panes";

/** The working draft's state: saved = nothing beyond the revision; draft = stored on the server; local = kept in this browser only. */
export type SaveState = "saved" | "unsaved" | "saving" | "draft" | "local" | "conflict" | "error";

export type WorkspaceProps = {
  /** the scenario shown; the workspace never keeps its own copy (fully controlled) */
  scenario: Scenario;
  /** the project's parts: offered in the add-block list and resolved by file name when solving */
  parts: PartSummary[];
  /** reviewers: everything visible, nothing editable */
  readOnly: boolean;
  /** every edit, undo and redo produces the next scenario here */
  onChange: (next: Scenario) => void;
  saveState: SaveState;
  /** extra toolbar content from the host page (save button, revision menu…) */
  toolbarExtras?: ReactNode;
  /** blocks and block ports to mark on the chart (a leak path from the checks) */
  highlight?: { blocks: string[]; ports: PortRef[] } | null;
  /** the project's rules, for the limit lines on the results' traces */
  projectRules?: readonly RuleSpec[];
  /** the checks column from the host page (checks, rules, sign-off): a pane beside or below the results */
  side?: ReactNode;
};

const EMPTY_SELECTION: ChartSelection = { blocks: [], links: [] };

/** The scenario workspace: chart, inspector and results, with undo/redo and keyboard commands. */
export function Workspace(props: WorkspaceProps) {
  return (
    <ReactFlowProvider>
      <WorkspaceInner {...props} />
    </ReactFlowProvider>
  );
}

function isEditable(target: EventTarget | null): boolean {
  if (!(target instanceof HTMLElement)) return false;
  if (target.isContentEditable) return true;
  const tag = target.tagName;
  return tag === "INPUT" || tag === "TEXTAREA" || tag === "SELECT" || target.closest("[role=dialog],[role=menu]") !== null;
}

function WorkspaceInner({ scenario, parts, readOnly, onChange, saveState, toolbarExtras, highlight, side, projectRules }: WorkspaceProps) {
  const frame = useWorkspaceFrame();
  // below 700 px the chart cannot be worked on; the scenario reads as a list, the chart is one toggle away
  const [narrowView, setNarrowView] = useState<"list" | "chart">("list");
  const openHelm = useHelmOpener();
  const narrowInspector = useRef<HTMLDivElement>(null);
  const flow = useReactFlow();
  const root = useRef<HTMLDivElement>(null);
  const chartBox = useRef<HTMLDivElement>(null);
  const [history, setHistory] = useState<History>(createHistory);
  const [selection, setSelection] = useState<ChartSelection>(EMPTY_SELECTION);
  const [paletteOpen, setPaletteOpen] = useState(false);
  const [notice, setNotice] = useState<string | null>(null);
  const [portMenu, setPortMenu] = useState<{ ref: PortRef; anchor: { x: number; y: number } } | null>(null);
  const [resetToken, setResetToken] = useState(0);
  const clipboard = useRef<Clipboard | null>(null);
  const solver = useSolver(scenario, parts);
  const expressionsReady = useExpressionsReady();
  // eslint-disable-next-line react-hooks/exhaustive-deps -- recomputed once mathjs has loaded
  const scope = useMemo(() => resolveVariables(scenario.variables).scope, [scenario.variables, expressionsReady]);

  // the selection, restricted to what still exists (after undo, delete, rename)
  const live = useMemo<ChartSelection>(() => {
    const ids = new Set(scenario.blocks.map((b) => b.id));
    const links = new Set(scenario.links.map(([a, b]) => `${a}~${b}`));
    return { blocks: selection.blocks.filter((id) => ids.has(id)), links: selection.links.filter((id) => links.has(id)) };
  }, [selection, scenario]);

  const notify = useCallback((message: string) => setNotice(message), []);
  useEffect(() => {
    if (!notice) return;
    const t = window.setTimeout(() => setNotice(null), 7000);
    return () => window.clearTimeout(t);
  }, [notice]);

  // commits read the latest scenario even when two edits land before the host re-renders
  const latest = useRef(scenario);
  useLayoutEffect(() => {
    latest.current = scenario;
  }, [scenario]);

  const commit = useCallback(
    (next: Scenario, key?: string) => {
      const previous = latest.current;
      if (readOnly || next === previous) return;
      setHistory((h) => recordEdit(h, previous, { key }));
      latest.current = next;
      onChange(next);
    },
    [readOnly, onChange],
  );

  const doUndo = useCallback(() => {
    if (readOnly) return;
    const r = undo(history, latest.current);
    if (!r) return;
    setHistory(r.history);
    latest.current = r.scenario;
    onChange(r.scenario);
    setResetToken((t) => t + 1);
  }, [history, onChange, readOnly]);

  const doRedo = useCallback(() => {
    if (readOnly) return;
    const r = redo(history, latest.current);
    if (!r) return;
    setHistory(r.history);
    latest.current = r.scenario;
    onChange(r.scenario);
    setResetToken((t) => t + 1);
  }, [history, onChange, readOnly]);

  const centre = useCallback((): { x: number; y: number } => {
    const rect = chartBox.current?.getBoundingClientRect();
    if (!rect) return { x: 0, y: 0 };
    const p = flow.screenToFlowPosition({ x: rect.left + rect.width / 2, y: rect.top + rect.height / 2 });
    const start = { x: p.x - CARD_WIDTH / 2, y: p.y - 36 };
    // do not drop a block on top of another: try below, above, then further out
    const clear = (at: { x: number; y: number }) =>
      !latest.current.blocks.some((b) => b.position && Math.abs(b.position.x - at.x) < CARD_WIDTH + 16 && Math.abs(b.position.y - at.y) < 96);
    for (let ring = 0; ring < 8; ring++) {
      for (const [dx, dy] of [[0, 1], [0, -1], [1, 0], [-1, 0], [1, 1], [-1, 1], [1, -1], [-1, -1]]) {
        const at = { x: start.x + dx * ring * (CARD_WIDTH + 40), y: start.y + dy * ring * 110 };
        if (clear(at)) return at;
      }
    }
    return start;
  }, [flow]);

  const onAddChoice = useCallback(
    (choice: AddBlockChoice) => {
      if (readOnly) return;
      const { scenario: next, id } = addBlock(latest.current, choice.kind, centre(), choice.part);
      commit(next);
      setSelection({ blocks: [id], links: [] });
      // the new block takes the focus (the add-block list has closed), so arrow keys and Delete act on it
      window.setTimeout(() => document.querySelector<HTMLElement>(`.react-flow__node[data-id="${CSS.escape(id)}"]`)?.focus(), 50);
    },
    [centre, commit, readOnly],
  );

  const deleteSelection = useCallback(() => {
    if (readOnly) return;
    let next = removeBlocks(latest.current, live.blocks);
    for (const id of live.links) {
      const [a] = id.split("~");
      next = removeLinkAt(next, a);
    }
    if (next !== latest.current) commit(next);
    setSelection(EMPTY_SELECTION);
  }, [commit, live, readOnly]);

  const copy = useCallback(() => {
    if (live.blocks.length === 0) return;
    clipboard.current = copyBlocks(latest.current, live.blocks);
    notify(`Copied ${live.blocks.length} block${live.blocks.length === 1 ? "" : "s"}.`);
  }, [live.blocks, notify]);

  const paste = useCallback(() => {
    if (readOnly || !clipboard.current || clipboard.current.blocks.length === 0) return;
    const { scenario: next, ids } = pasteBlocks(latest.current, clipboard.current, { x: 40, y: 40 });
    commit(next);
    setSelection({ blocks: ids, links: [] });
    // a second paste lands further along
    clipboard.current = {
      ...clipboard.current,
      blocks: clipboard.current.blocks.map((b) => ({ ...b, position: b.position ? { x: b.position.x + 40, y: b.position.y + 40 } : b.position })),
    };
  }, [commit, readOnly]);

  const fit = useCallback(() => void flow.fitView({ padding: 0.25, maxZoom: 1.25, duration: 200 }), [flow]);

  // keyboard commands while the workspace is on screen (not while typing in a field or a dialog)
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (isEditable(e.target)) return;
      // a click on the chart's background focuses the nearest focusable ancestor (the page's <main>, a
      // skip-link target), so keys whose target contains the workspace count as the workspace's too
      const target = e.target as Node;
      // the checks pane sits inside the workspace but its buttons are not the chart's
      if (target instanceof Element && target.closest('[data-workspace-keys="off"]')) return;
      const inside = root.current?.contains(target) || target === document.body || (root.current !== null && target.contains(root.current));
      if (!inside) return;
      const mod = e.ctrlKey || e.metaKey;
      const key = e.key.toLowerCase();
      if (mod && key === "z" && !e.shiftKey) {
        e.preventDefault();
        doUndo();
      } else if (mod && ((key === "z" && e.shiftKey) || key === "y")) {
        e.preventDefault();
        doRedo();
      } else if (mod && key === "c") {
        copy();
      } else if (mod && key === "v") {
        e.preventDefault();
        paste();
      } else if (!mod && !e.altKey && (e.key === "Delete" || e.key === "Backspace")) {
        if (live.blocks.length > 0 || live.links.length > 0) {
          e.preventDefault();
          deleteSelection();
        }
      } else if (!mod && !e.altKey && key === "a" && !readOnly) {
        e.preventDefault();
        setPaletteOpen(true);
      } else if (!mod && !e.altKey && key === "f") {
        fit();
      } else if (e.key === "Escape") {
        setSelection(EMPTY_SELECTION);
      }
    };
    document.addEventListener("keydown", onKey);
    return () => document.removeEventListener("keydown", onKey);
  }, [copy, deleteSelection, doRedo, doUndo, fit, live, paste, readOnly]);

  const onLink = useCallback(
    (a: PortRef, b: PortRef) => {
      if (readOnly) return;
      const r = addLink(latest.current, a, b, parts);
      if (r.ok) commit(r.scenario);
      else notify(`Link refused: ${r.reason}`);
    },
    [commit, notify, parts, readOnly],
  );

  const onMoveBlocks = useCallback(
    (positions: Record<string, { x: number; y: number }>, key?: string) => {
      const current = latest.current;
      const changed = Object.entries(positions).some(([id, p]) => {
        const b = current.blocks.find((x) => x.id === id);
        return b && (!b.position || Math.round(p.x) !== b.position.x || Math.round(p.y) !== b.position.y);
      });
      if (changed) commit(moveBlocks(current, positions), key);
    },
    [commit],
  );

  const onSetSwitch = useCallback(
    (id: string, state: number) => {
      const r = setSwitchState(latest.current, id, state);
      if (r.ok) commit(r.scenario);
      else notify(r.reason);
    },
    [commit, notify],
  );

  const onPortMenu = useCallback((ref: PortRef, anchor: { x: number; y: number }) => setPortMenu({ ref, anchor }), []);

  const onPortAction = (action: PortMenuAction) => {
    if (!portMenu) return;
    const ref = portMenu.ref;
    const block = parsePortRef(ref)?.block;
    setPortMenu(null);
    if (action === "inspect" || action === "mark") {
      if (block) setSelection({ blocks: [block], links: [] });
    }
    if (action === "mark") {
      const r = setSystemPort(latest.current, ref, { name: nextSystemPortName(latest.current) }, parts);
      if (r.ok) commit(r.scenario);
      else notify(r.reason);
    } else if (action === "unmark") commit(removeSystemPort(latest.current, ref));
    else if (action === "unlink") commit(removeLinkAt(latest.current, ref));
  };

  const single = live.blocks.length === 1 ? live.blocks[0] : null;

  // with a block selected the inspector shows it, and the scenario's settings (frequency plan, system Z0,
  // variables) stay one tab away; choosing another block brings its own tab back
  const [planFor, setPlanFor] = useState<string | null>(null);
  const inspectorTab = single !== null && planFor === single ? "scenario" : "block";

  const scenarioPanel = <ScenarioPanel scenario={scenario} readOnly={readOnly} resetToken={resetToken} commit={commit} />;
  const chartPane = (
    <div ref={chartBox} className="relative h-full min-h-0 overflow-hidden rounded-card border border-rule-strong">
      <ScenarioChart
        scenario={scenario}
        parts={parts}
        readOnly={readOnly}
        selection={live}
        onSelectionChange={setSelection}
        onMoveBlocks={onMoveBlocks}
        onLink={onLink}
        onSetSwitch={onSetSwitch}
        onPortMenu={onPortMenu}
        highlight={highlight}
      />
      {scenario.blocks.length === 0 ? (
        <div className="pointer-events-none absolute inset-0 flex items-center justify-center">
          <p className="rounded-card border border-dashed border-rule-strong bg-surface/90 px-4 py-3 text-sm text-muted">
            An empty chart. Add a block with <span className="font-medium text-ink">Add block</span> or press <Kbd>A</Kbd>.
          </p>
        </div>
      ) : null}
    </div>
  );
  const inspectorPane = (
    <PaneBox as="aside" aria-label="Inspector">
      {single ? (
        <Tabs
          label="Inspector"
          value={inspectorTab}
          onValueChange={(id) => setPlanFor(id === "scenario" ? single : null)}
          tabs={[
            {
              id: "block",
              label: "Block",
              content: (
                <BlockInspector
                  scenario={scenario}
                  blockId={single}
                  parts={parts}
                  readOnly={readOnly}
                  scope={scope}
                  resetToken={resetToken}
                  commit={commit}
                  notify={notify}
                  onRenamed={(_, to) => setSelection({ blocks: [to], links: [] })}
                />
              ),
            },
            { id: "scenario", label: "Plan and Z0", content: scenarioPanel },
          ]}
        />
      ) : live.blocks.length > 1 ? (
        <div className="flex flex-col gap-2 text-sm">
          <p className="text-ink">{live.blocks.length} blocks selected.</p>
          <p className="font-mono text-xs text-muted">{live.blocks.join(", ")}</p>
          <div className="flex gap-2">
            <Button size="sm" variant="secondary" onClick={copy}>
              Copy
            </Button>
            <Button size="sm" variant="danger" onClick={deleteSelection} disabled={readOnly}>
              Delete
            </Button>
          </div>
        </div>
      ) : (
        scenarioPanel
      )}
    </PaneBox>
  );
  const resultsPane = (
    <PaneBox aria-label="Results">
      <h2 className="mb-2 text-base font-semibold text-ink">Results</h2>
      <ResultsPanel scenario={scenario} state={solver} projectRules={projectRules} />
    </PaneBox>
  );

  return (
    <div ref={root} className="flex h-full min-h-0 min-w-0 flex-col gap-2" data-testid="workspace" data-frame={frame ?? undefined}>
      <div role="toolbar" aria-label="Workspace" className="flex flex-wrap items-center gap-1.5 border-b border-rule pb-2">
        <Button size="sm" onClick={() => setPaletteOpen(true)} disabled={readOnly} aria-keyshortcuts="A">
          <Plus aria-hidden="true" className="h-4 w-4" /> Add block <Kbd className="ml-1 bg-transparent text-on-ink/80">A</Kbd>
        </Button>
        <Button size="sm" variant="ghost" onClick={doUndo} disabled={readOnly || history.past.length === 0} aria-label="Undo" aria-keyshortcuts="Control+Z" title="Undo (Ctrl+Z)">
          <Undo2 aria-hidden="true" className="h-4 w-4" />
        </Button>
        <Button
          size="sm"
          variant="ghost"
          onClick={doRedo}
          disabled={readOnly || history.future.length === 0}
          aria-label="Redo"
          aria-keyshortcuts="Control+Shift+Z"
          title="Redo (Ctrl+Shift+Z)"
        >
          <Redo2 aria-hidden="true" className="h-4 w-4" />
        </Button>
        <span className="mx-1 h-5 w-px bg-rule" aria-hidden="true" />
        <Button size="sm" variant="ghost" onClick={copy} disabled={live.blocks.length === 0} aria-label="Copy selected blocks" title="Copy (Ctrl+C)">
          <Copy aria-hidden="true" className="h-4 w-4" />
        </Button>
        <Button size="sm" variant="ghost" onClick={paste} disabled={readOnly} aria-label="Paste blocks" title="Paste (Ctrl+V)">
          <ClipboardPaste aria-hidden="true" className="h-4 w-4" />
        </Button>
        <Button
          size="sm"
          variant="ghost"
          onClick={deleteSelection}
          disabled={readOnly || (live.blocks.length === 0 && live.links.length === 0)}
          aria-label="Delete selection"
          title="Delete (Delete or Backspace)"
        >
          <Trash2 aria-hidden="true" className="h-4 w-4" />
        </Button>
        <Button size="sm" variant="ghost" onClick={fit} aria-label="Fit view" title="Fit view (F)">
          <Maximize aria-hidden="true" className="h-4 w-4" />
        </Button>
        {frame === "narrow" ? (
          <div role="group" aria-label="View" className="flex items-center gap-1">
            <Button size="sm" variant={narrowView === "list" ? "primary" : "ghost"} aria-pressed={narrowView === "list"} onClick={() => setNarrowView("list")}>
              <List aria-hidden="true" className="h-4 w-4" /> List
            </Button>
            <Button size="sm" variant={narrowView === "chart" ? "primary" : "ghost"} aria-pressed={narrowView === "chart"} onClick={() => setNarrowView("chart")}>
              <Network aria-hidden="true" className="h-4 w-4" /> Chart
            </Button>
          </div>
        ) : null}
        {openHelm ? (
          // the helm's button lives here on the scenario page (floating, it covered inspector fields)
          <Button size="sm" variant="secondary" onClick={openHelm} title="Open the helm (Ctrl+K)" aria-keyshortcuts="Control+K Meta+K">
            <Compass aria-hidden="true" className="h-4 w-4" /> Helm
            <span className="ml-0.5 hidden gap-0.5 sm:flex" aria-hidden="true">
              <Kbd>Ctrl</Kbd>
              <Kbd>K</Kbd>
            </span>
          </Button>
        ) : null}
        <div className="ml-auto flex flex-wrap items-center gap-2">
          {readOnly ? <Badge tone="info">Read only</Badge> : null}
          <SaveBadge state={saveState} />
          {toolbarExtras}
        </div>
      </div>

      {notice ? (
        <div role="alert" className="flex items-center justify-between gap-3 rounded-card border border-warn/70 bg-warn/12 px-3 py-1.5 text-sm text-ink">
          <span>{notice}</span>
          <button type="button" className="text-xs text-muted underline" onClick={() => setNotice(null)}>
            Dismiss
          </button>
        </div>
      ) : null}

      {frame === null ? (
        // the width is not known while server-rendering; the panes come with the first client render
        <div className="min-h-0 flex-1" aria-busy="true" />
      ) : frame === "narrow" ? (
        <div className="flex min-w-0 flex-col gap-3">
          {narrowView === "chart" ? <div className="h-[60vh] min-h-[320px]">{chartPane}</div> : (
            <div className="rounded-card border border-rule bg-surface/60 p-3">
              <ScenarioListView
                scenario={scenario}
                parts={parts}
                selected={single}
                onSelect={(id) => {
                  setSelection({ blocks: [id], links: [] });
                  // the inspector is below the list here: bring the chosen block's fields into view
                  window.setTimeout(() => narrowInspector.current?.scrollIntoView({ block: "start" }), 50);
                }}
              />
            </div>
          )}
          <div ref={narrowInspector} className="scroll-mt-2">
            {inspectorPane}
          </div>
          {resultsPane}
          {side}
        </div>
      ) : (
        <div className="min-h-0 flex-1">
          <WorkspacePanes frame={frame} chart={chartPane} inspector={inspectorPane} results={resultsPane} side={side} />
        </div>
      )}

      <AddBlockPalette open={paletteOpen} onOpenChange={setPaletteOpen} parts={parts} onChoose={onAddChoice} />
      <ShortcutSheet />
      {portMenu ? (
        <PortMenu
          scenario={scenario}
          refId={portMenu.ref}
          anchor={portMenu.anchor}
          readOnly={readOnly}
          onAction={onPortAction}
          onClose={() => setPortMenu(null)}
        />
      ) : null}
    </div>
  );
}

const SAVE_TEXT: Record<SaveState, string> = {
  saved: "Saved",
  unsaved: "Unsaved changes",
  saving: "Saving draft…",
  draft: "Draft saved",
  local: "Draft kept in this browser",
  conflict: "Conflict: changed elsewhere",
  error: "Not saved: error",
};

function SaveBadge({ state }: { state: SaveState }) {
  const tone = state === "saved" ? "pass" : state === "draft" ? "info" : state === "unsaved" || state === "saving" || state === "local" ? "warn" : "fail";
  return (
    <Badge tone={tone} role="status" aria-label={`Save state: ${SAVE_TEXT[state]}`} className={cn(state === "saving" && "gap-1.5")}>
      {state === "saving" ? <Spinner size="sm" /> : null}
      {SAVE_TEXT[state]}
    </Badge>
  );
}
