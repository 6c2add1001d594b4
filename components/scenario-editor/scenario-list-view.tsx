"use client";

import type { Scenario } from "@/engine/types";
import { blockTitle, kindTitle, paramsOf, portLabelsOf, type ParamInfo } from "@/lib/browser/catalogue";
import { formatImpedance, formatNumber, formatSi } from "@/lib/browser/format";
import { findPart, parsePortRef, type PartSummary, type WorkspaceBlock } from "@/lib/browser/scenario-model";

export type ScenarioListViewProps = {
  scenario: Scenario;
  parts: readonly PartSummary[];
  /** the block shown in the inspector, if any */
  selected: string | null;
  onSelect: (blockId: string) => void;
};

/**
 * The scenario as text, for screens too narrow for the chart: each block with its kind or part and its
 * parameters, the links between ports, and the system ports. Choosing a block opens it in the inspector.
 */
export function ScenarioListView({ scenario, parts, selected, onSelect }: ScenarioListViewProps) {
  return (
    <section aria-label="Scenario as a list" className="flex min-w-0 flex-col gap-4 text-sm">
      <div>
        <h2 className="text-base font-semibold text-ink">Blocks</h2>
        {scenario.blocks.length === 0 ? (
          <p className="text-muted">No blocks yet. Add one with Add block.</p>
        ) : (
          <ul className="mt-1 flex flex-col divide-y divide-rule rounded-card border border-rule bg-surface/60" aria-label="Blocks">
            {scenario.blocks.map((block) => (
              <li key={block.id} className="px-3 py-2">
                <button
                  type="button"
                  onClick={() => onSelect(block.id)}
                  aria-pressed={selected === block.id}
                  className="flex w-full min-w-0 flex-wrap items-baseline gap-x-2 text-left focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-focus"
                >
                  <span className="font-mono font-semibold break-all text-ink">{block.id}</span>
                  <span className="text-muted">{blockKindText(block, parts)}</span>
                  {selected === block.id ? <span className="text-xs text-sea">in the inspector</span> : null}
                </button>
                <BlockFacts block={block} parts={parts} />
              </li>
            ))}
          </ul>
        )}
      </div>

      <div>
        <h2 className="text-base font-semibold text-ink">Links</h2>
        {scenario.links.length === 0 ? (
          <p className="text-muted">No links.</p>
        ) : (
          <ul className="mt-1 flex flex-col gap-0.5 font-mono text-xs" aria-label="Links">
            {scenario.links.map(([a, b]) => (
              <li key={`${a}~${b}`} className="break-all">
                {portText(scenario, a)} <span aria-label="linked to">—</span> {portText(scenario, b)}
              </li>
            ))}
          </ul>
        )}
      </div>

      <div>
        <h2 className="text-base font-semibold text-ink">System ports</h2>
        {scenario.ports.length === 0 ? (
          <p className="text-muted">No system ports.</p>
        ) : (
          <ul className="mt-1 flex flex-col gap-0.5 text-xs" aria-label="System ports">
            {scenario.ports.map((p) => (
              <li key={p.name} className="break-all">
                <span className="font-semibold">{p.name}</span> at <span className="font-mono">{portText(scenario, p.at)}</span>, Z0 {formatNumber(p.z0 ?? scenario.z0)} Ω
              </li>
            ))}
          </ul>
        )}
      </div>
    </section>
  );
}

function blockKindText(block: WorkspaceBlock, parts: readonly PartSummary[]): string {
  if (block.kind !== "touchstone") return kindTitle(block.kind);
  const part = findPart(block, parts);
  return `Part ${blockTitle(block, parts)}${part ? ` (${part.fileName})` : ""}`;
}

/** "SW1:2 (throw 1)": a port with its label when the kind names its ports. */
function portText(scenario: Scenario, ref: string): string {
  const parsed = parsePortRef(ref);
  if (!parsed) return ref;
  const block = scenario.blocks.find((b) => b.id === parsed.block);
  if (!block || block.kind === "touchstone") return ref;
  const label = portLabelsOf(block, parsed.port)[parsed.port - 1];
  return label && label !== String(parsed.port) ? `${ref} (${label})` : ref;
}

function BlockFacts({ block, parts }: { block: WorkspaceBlock; parts: readonly PartSummary[] }) {
  const facts: [string, string][] = [];
  for (const info of paramsOf(block.kind)) {
    const text = paramText(block, info);
    if (text !== null) facts.push([info.label, text]);
  }
  if (block.kind === "switch") facts.push(["Throw", String(block.state ?? 1)]);
  if (block.kind === "touchstone") {
    const part = findPart(block, parts);
    if (part) facts.push(["Ports", String(part.ports)]);
  }
  if (block.rating_dbm !== undefined) facts.push(["Rating", `${formatNumber(block.rating_dbm)} dBm`]);
  if (facts.length === 0) return null;
  return (
    <dl className="mt-1 grid grid-cols-[auto_minmax(0,1fr)] gap-x-3 gap-y-0.5 text-xs">
      {facts.map(([name, value]) => (
        <div key={name} className="contents">
          <dt className="text-muted">{name}</dt>
          <dd className="break-words text-ink">{value}</dd>
        </div>
      ))}
    </dl>
  );
}

/** A parameter as the inspector would read it: its expression if it has one, else the value with its unit. */
function paramText(block: WorkspaceBlock, info: ParamInfo): string | null {
  const expr = block.expr?.[info.name];
  const value = block.params?.[info.name];
  if (value === undefined && expr === undefined) return null;
  const shown = valueText(value, info);
  if (expr !== undefined && expr.trim() !== "" && expr.trim() !== shown) return `${expr} = ${shown}`;
  return shown;
}

function valueText(value: unknown, info: ParamInfo): string {
  if (value === null) return "∞";
  if (typeof value === "number") {
    if (info.unit === "Hz" || info.unit === "m") return formatSi(value, info.unit);
    return `${formatNumber(value)}${info.unit ? ` ${info.unit}` : ""}`;
  }
  if (Array.isArray(value) && value.length === 2 && typeof value[0] === "number" && typeof value[1] === "number") return formatImpedance(value[0], value[1]);
  return typeof value === "string" ? value : JSON.stringify(value);
}
