"use client";

import { useSyncExternalStore, type HTMLAttributes, type ReactNode } from "react";
import { Group, Panel, Separator, useDefaultLayout, type LayoutStorage } from "react-resizable-panels";
import { cn } from "@/components/ui/cn";

/**
 * How the workspace is framed at the current viewport width:
 * - wide (1280 px and up): three columns, chart over results | inspector | checks
 * - stacked (700 to 1279 px): chart | inspector above, results | checks below
 * - narrow (below 700 px): no panes; a list of the scenario instead of the chart (the page scrolls)
 */
export type WorkspaceFrame = "wide" | "stacked" | "narrow";

const WIDE_QUERY = "(min-width: 1280px)";
// keep in step with the fill-viewport rule in app/globals.css (the page stops scrolling at 700 px)
const NARROW_QUERY = "(max-width: 699.98px)";

function subscribe(onChange: () => void): () => void {
  const queries = [window.matchMedia(WIDE_QUERY), window.matchMedia(NARROW_QUERY)];
  for (const q of queries) q.addEventListener("change", onChange);
  return () => {
    for (const q of queries) q.removeEventListener("change", onChange);
  };
}

function readFrame(): WorkspaceFrame {
  if (window.matchMedia(NARROW_QUERY).matches) return "narrow";
  return window.matchMedia(WIDE_QUERY).matches ? "wide" : "stacked";
}

/** The frame for this viewport; null while server-rendering and hydrating (the width is not known there). */
export function useWorkspaceFrame(): WorkspaceFrame | null {
  return useSyncExternalStore(subscribe, readFrame, () => null);
}

// pane sizes are remembered per browser; a browser that refuses storage (private mode) just forgets them
const paneStorage: LayoutStorage = {
  getItem: (key) => {
    try {
      return window.localStorage.getItem(key);
    } catch {
      return null;
    }
  },
  setItem: (key, value) => {
    try {
      window.localStorage.setItem(key, value);
    } catch {
      // not remembered; the panes still resize
    }
  },
};

/** A group of panes whose sizes the person set are kept in localStorage under `portolan.panes.<id>`. */
function RememberedGroup({ id, orientation, children }: { id: string; orientation: "horizontal" | "vertical"; children: ReactNode }) {
  const { defaultLayout, onLayoutChanged } = useDefaultLayout({ id: `portolan.panes.${id}`, storage: paneStorage, onlySaveAfterUserInteractions: true });
  return (
    <Group id={`panes-${id}`} orientation={orientation} defaultLayout={defaultLayout} onLayoutChanged={onLayoutChanged} className="h-full w-full">
      {children}
    </Group>
  );
}

/**
 * A separator between two panes: drag it, or focus it (Tab) and use the arrow keys; the library gives it
 * role="separator" with aria-valuenow. `across` is the direction the separator runs.
 */
function PaneHandle({ label, across }: { label: string; across: "vertical" | "horizontal" }) {
  return (
    <Separator
      aria-label={label}
      title={`${label} (drag, or focus and use the arrow keys)`}
      className={cn(
        "group flex shrink-0 items-center justify-center outline-none",
        across === "vertical" ? "w-2.5 cursor-col-resize" : "h-2.5 cursor-row-resize",
      )}
    >
      <span
        aria-hidden="true"
        className={cn(
          "rounded-full bg-rule transition-colors group-hover:bg-rule-strong group-focus-visible:bg-focus group-data-[separator=active]:bg-focus",
          "group-focus-visible:outline-2 group-focus-visible:outline-offset-2 group-focus-visible:outline-focus",
          across === "vertical" ? "h-10 w-1" : "h-1 w-10",
        )}
      />
    </Separator>
  );
}

/** A pane's frame: it scrolls on its own, never the page. A region (section) unless `as` says aside. */
export function PaneBox({
  as: Tag = "section",
  dense = false,
  children,
  className,
  ...rest
}: { as?: "section" | "aside"; dense?: boolean; children: ReactNode; className?: string } & HTMLAttributes<HTMLElement>) {
  return (
    <Tag {...rest} className={cn("h-full min-h-0 overflow-auto rounded-card border border-rule bg-surface/60", dense ? "p-2" : "p-3", className)}>
      {children}
    </Tag>
  );
}

export type WorkspacePanesProps = {
  frame: Exclude<WorkspaceFrame, "narrow">;
  chart: ReactNode;
  inspector: ReactNode;
  results: ReactNode;
  /** the checks column: checks, rules, sign-off (from the host page) */
  side?: ReactNode;
};

/** The workspace's resizable panes for the wide and the stacked frames. */
export function WorkspacePanes({ frame, chart, inspector, results, side }: WorkspacePanesProps) {
  if (frame === "wide") {
    return (
      <RememberedGroup id={side ? "wide" : "wide-no-side"} orientation="horizontal">
        <Panel id="pane-main" defaultSize="50%" minSize="30%">
          <RememberedGroup id="wide-main" orientation="vertical">
            <Panel id="pane-chart" defaultSize="60%" minSize="20%">
              {chart}
            </Panel>
            <PaneHandle label="Resize chart and results" across="horizontal" />
            <Panel id="pane-results" defaultSize="40%" minSize="12%">
              {results}
            </Panel>
          </RememberedGroup>
        </Panel>
        <PaneHandle label="Resize chart and inspector" across="vertical" />
        <Panel id="pane-inspector" defaultSize={side ? "22%" : "50%"} minSize="14%">
          {inspector}
        </Panel>
        {side ? (
          <>
            <PaneHandle label="Resize inspector and checks" across="vertical" />
            <Panel id="pane-side" defaultSize="28%" minSize="14%">
              {side}
            </Panel>
          </>
        ) : null}
      </RememberedGroup>
    );
  }
  return (
    <RememberedGroup id="stacked" orientation="vertical">
      <Panel id="pane-top" defaultSize="58%" minSize="25%">
        <RememberedGroup id="stacked-top" orientation="horizontal">
          <Panel id="pane-chart" defaultSize="66%" minSize="30%">
            {chart}
          </Panel>
          <PaneHandle label="Resize chart and inspector" across="vertical" />
          <Panel id="pane-inspector" defaultSize="34%" minSize="20%">
            {inspector}
          </Panel>
        </RememberedGroup>
      </Panel>
      <PaneHandle label="Resize chart and results" across="horizontal" />
      <Panel id="pane-bottom" defaultSize="42%" minSize="15%">
        {side ? (
          <RememberedGroup id="stacked-bottom" orientation="horizontal">
            <Panel id="pane-results" defaultSize="55%" minSize="25%">
              {results}
            </Panel>
            <PaneHandle label="Resize results and checks" across="vertical" />
            <Panel id="pane-side" defaultSize="45%" minSize="25%">
              {side}
            </Panel>
          </RememberedGroup>
        ) : (
          results
        )}
      </Panel>
    </RememberedGroup>
  );
}
