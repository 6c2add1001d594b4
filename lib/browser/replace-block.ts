/**
 * Replacing a block in place: same id, place, links and system ports, another kind or part. Before this a
 * change of part meant delete, re-add, re-link and re-mark, and the system port's name and Z0 were lost.
 */
import type { BlockKind, PortRef, Scenario, SystemPortSpec } from "@/engine/types";
import { defaultParams, getBlock, parsePortRef, pinLatest, portCountOf, type PartSummary, type WorkspaceBlock } from "./scenario-model";

export type ReplaceChoice = { kind: BlockKind; part?: PartSummary };

export type ReplaceResult =
  | { ok: true; scenario: Scenario; droppedLinks: [PortRef, PortRef][]; droppedPorts: SystemPortSpec[] }
  | { ok: false; reason: string };

/** The block that `choice` would put in place of `old`: its id, position and (for a switch) its state kept. */
function blockFor(old: WorkspaceBlock, choice: ReplaceChoice, scenario: Scenario): WorkspaceBlock {
  const base = { id: old.id, ...(old.position ? { position: old.position } : {}) };
  if (choice.part) return { ...base, kind: "touchstone", file: `parts/${choice.part.fileName}`, ...pinLatest(choice.part), ports: choice.part.ports };
  const block: WorkspaceBlock = { ...base, kind: choice.kind, params: defaultParams(choice.kind, scenario) };
  if (choice.kind === "switch") block.state = 1;
  return block;
}

/**
 * Puts another kind or part in the place of block `id`. Links and system ports on port numbers the new
 * block still has are kept as they are; those past its port count are dropped and returned, so that the
 * person is told which.
 */
export function replaceBlock(scenario: Scenario, id: string, choice: ReplaceChoice, parts: readonly PartSummary[] = []): ReplaceResult {
  const old = getBlock(scenario, id);
  if (!old) return { ok: false, reason: `There is no block ${id}.` };
  if (choice.part && old.kind === "touchstone" && old.file === `parts/${choice.part.fileName}`) return { ok: false, reason: `${id} already uses ${choice.part.name}.` };
  if (!choice.part && old.kind === choice.kind && choice.kind !== "touchstone") return { ok: false, reason: `${id} is already a ${choice.kind} block.` };
  const next = blockFor(old, choice, scenario);
  const n = portCountOf(next, parts);
  const gone = (ref: PortRef): boolean => {
    const at = parsePortRef(ref);
    return at !== null && at.block === id && n > 0 && at.port > n;
  };
  const droppedLinks = scenario.links.filter(([a, b]) => gone(a) || gone(b));
  const droppedPorts = scenario.ports.filter((p) => gone(p.at));
  return {
    ok: true,
    scenario: {
      ...scenario,
      blocks: scenario.blocks.map((b) => (b.id === id ? next : b)),
      links: scenario.links.filter(([a, b]) => !gone(a) && !gone(b)),
      ports: scenario.ports.filter((p) => !gone(p.at)),
    },
    droppedLinks,
    droppedPorts,
  };
}

/** "Dropped: link SW:3–ANT2:1; system port RX2 at SW:3." or null when nothing was dropped. */
export function describeDropped(r: Extract<ReplaceResult, { ok: true }>): string | null {
  const items = [...r.droppedLinks.map(([a, b]) => `link ${a}–${b}`), ...r.droppedPorts.map((p) => `system port ${p.name} at ${p.at}`)];
  return items.length === 0 ? null : `Dropped (no such port on the new block): ${items.join("; ")}.`;
}
