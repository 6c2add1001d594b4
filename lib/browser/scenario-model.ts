/**
 * The scenario editing model of the workspace: pure functions from one Scenario to the next.
 * The chart, the inspector and the keyboard commands all edit through these, so the rules (one link per
 * port, a system port is never linked, ids are unique) live in one place and are unit-tested.
 *
 * Port counts come from the engine's block catalogue (engine/blocks/catalogue.ts, docs/blocks.md), read
 * as declarations: editing works (and is testable) without evaluating any model.
 */
import { BLOCK_CATALOGUE } from "@/engine/blocks/catalogue";
import type { BlockKind, BlockSpec, PortRef, Scenario, SystemPortSpec } from "@/engine/types";

/**
 * A block as the workspace stores it: the engine's BlockSpec plus `expr`, the expression text typed for
 * each parameter (e.g. `{ loss_db: "0.12 dB/m * L_feed" }`), so that the evaluated number in `params` can
 * be re-derived when a variable changes. The engine never reads `expr` (it is stripped before solving).
 */
export type WorkspaceBlock = BlockSpec & { expr?: Record<string, string> };

/** A project's part as the workspace lists it; `text` is the Touchstone text when it has been loaded. */
export type PartSummary = {
  id: string;
  name: string;
  fileName: string;
  ports: number;
  text?: string;
  /** the latest version of the part in the library (absent: 1); a block added now pins it */
  version?: number;
  /** loaded texts of the versions blocks pin, keyed as the engine looks them up (pinnedPartPath) */
  texts?: Record<string, string>;
  /** the part's data shows gain (set at upload), with the reason */
  active?: boolean;
  activeReason?: string | null;
};

export type PortAddress = { block: string; port: number };

/** The outcome of an edit that may be refused, with a message a person can act on. */
export type EditResult = { ok: true; scenario: Scenario } | { ok: false; reason: string };

/** Blocks copied with the links among them. */
export type Clipboard = { blocks: WorkspaceBlock[]; links: [PortRef, PortRef][] };

/** Short id stems per kind; ids become e.g. PAD1, SW2. */
const ID_STEMS: Record<BlockKind, string> = {
  load: "LOAD",
  antenna: "ANT",
  attenuator: "PAD",
  line: "LINE",
  phase_shifter: "PS",
  isolator: "ISO",
  amplifier: "AMP",
  filter: "FLT",
  splitter: "SPL",
  tee: "TEE",
  circulator: "CIRC",
  coupler: "CPL",
  hybrid90: "HYB",
  hybrid180: "HYB",
  switch: "SW",
  array: "ARR",
  touchstone: "PART",
};

/** Parses "BLOCK:PORT" (PORT 1-based); null when malformed. Block ids may not contain ':'. */
export function parsePortRef(ref: PortRef): PortAddress | null {
  const at = ref.lastIndexOf(":");
  if (at <= 0) return null;
  const port = Number(ref.slice(at + 1));
  if (!Number.isInteger(port) || port < 1) return null;
  return { block: ref.slice(0, at), port };
}

export function formatPortRef(block: string, port: number): PortRef {
  return `${block}:${port}`;
}

function touchstonePortsFromFile(file: string | undefined): number | undefined {
  const match = file ? /\.s(\d+)p$/i.exec(file) : null;
  return match ? Number(match[1]) : undefined;
}

/** The part a touchstone block refers to (`file: "parts/<fileName>"`), if listed. */
export function findPart(block: BlockSpec, parts: readonly PartSummary[] = []): PartSummary | undefined {
  if (block.kind !== "touchstone" || !block.file) return undefined;
  const name = block.file.replace(/^parts\//, "");
  return parts.find((p) => p.fileName === name);
}

/**
 * Number of ports of a block: fixed per kind, 1 + throws for a switch, `elements` for an array, and for
 * a part its declared count (block.ports, the part list, or the .sNp file name). 0 when unknown.
 */
export function portCountOf(block: BlockSpec, parts: readonly PartSummary[] = []): number {
  const fixed = block.kind === "touchstone" ? undefined : BLOCK_CATALOGUE[block.kind].ports;
  if (typeof fixed === "number") return fixed;
  const params = block.params ?? {};
  if (block.kind === "switch") return 1 + positiveInt(params.throws, 1);
  if (block.kind === "array") return positiveInt(params.elements, 1);
  return block.ports ?? findPart(block, parts)?.ports ?? touchstonePortsFromFile(block.file) ?? 0;
}

function positiveInt(value: unknown, fallback: number): number {
  return typeof value === "number" && Number.isInteger(value) && value >= 1 ? value : fallback;
}

export function getBlock(scenario: Scenario, id: string): WorkspaceBlock | undefined {
  return scenario.blocks.find((b) => b.id === id);
}

/** The port linked to `ref`, if any. */
export function linkedPeer(scenario: Scenario, ref: PortRef): PortRef | undefined {
  for (const [a, b] of scenario.links) {
    if (a === ref) return b;
    if (b === ref) return a;
  }
  return undefined;
}

export function systemPortAt(scenario: Scenario, ref: PortRef): SystemPortSpec | undefined {
  return scenario.ports.find((p) => p.at === ref);
}

/** Why `id` cannot name a block (null when it can). `except` is the block being renamed. */
export function validateBlockId(scenario: Scenario, id: string, except?: string): string | null {
  if (id.length === 0) return "Enter a block id.";
  if (id.length > 64) return "Keep the block id to 64 characters or fewer.";
  if (id.includes(":")) return "A block id cannot contain ':'.";
  if (id.trim() !== id) return "A block id cannot start or end with a space.";
  if (scenario.blocks.some((b) => b.id === id && b.id !== except)) return `Another block is already called ${id}.`;
  return null;
}

/** A free id built from `stem`: "PAD" → PAD1, PAD2…; "SW1" → SW2 when SW1 is taken. */
export function nextBlockId(scenario: Scenario, stem: string, taken: ReadonlySet<string> = new Set()): string {
  const used = new Set([...scenario.blocks.map((b) => b.id), ...taken]);
  const base = stem.replace(/\d+$/, "") || "B";
  for (let n = 1; ; n++) {
    const id = `${base}${n}`;
    if (!used.has(id)) return id;
  }
}

function idStemForPart(part: PartSummary): string {
  const stem = part.name.toUpperCase().replace(/[^A-Z0-9_-]+/g, "_").replace(/^_+|_+$/g, "");
  return stem.slice(0, 16) || "PART";
}

function planCentre(scenario: Scenario): { centre: number; span: number } {
  const f = scenario.frequency;
  if ("list" in f) {
    const lo = Math.min(...f.list);
    const hi = Math.max(...f.list);
    return { centre: (lo + hi) / 2, span: Math.max(hi - lo, lo * 0.1) };
  }
  return { centre: (f.start + f.stop) / 2, span: Math.max(f.stop - f.start, f.start * 0.1) };
}

/**
 * Parameters a new block starts with, so that it solves at once. Values are ordinary catalogue-like
 * figures (common practice), not defaults of the models: the inspector shows and edits them.
 */
export function defaultParams(kind: BlockKind, scenario: Scenario): Record<string, unknown> {
  switch (kind) {
    case "load":
      return { return_loss_db: 20 };
    case "antenna":
      return { return_loss_db: 15 };
    case "attenuator":
      return { loss_db: 3 };
    case "line":
      return { length_m: 0.1, velocity_factor: 0.7 };
    case "phase_shifter":
      return { phase_deg: 90 };
    case "isolator":
      return { insertion_loss_db: 0.5, isolation_db: 20 };
    case "amplifier":
      return { gain_db: 20, reverse_isolation_db: 30 };
    case "filter": {
      const { centre, span } = planCentre(scenario);
      return { response: "bandpass", family: "butterworth", order: 3, center_hz: centre, bandwidth_hz: span / 2 };
    }
    case "splitter":
    case "hybrid90":
    case "hybrid180":
      return { excess_loss_db: 0.3 };
    case "circulator":
      return { insertion_loss_db: 0.4, isolation_db: 20 };
    case "coupler":
      return { coupling_db: 20 };
    case "switch":
      return { throws: 2, insertion_loss_db: 0.5, isolation_db: 30 };
    case "array":
      return { elements: 2, return_loss_db: 15, coupling_db: 20 };
    default:
      return {};
  }
}

/** Adds a block of `kind` (or the given part) at `position`; returns the new scenario and the block id. */
export function addBlock(
  scenario: Scenario,
  kind: BlockKind,
  position: { x: number; y: number },
  part?: PartSummary,
): { scenario: Scenario; id: string } {
  const id = nextBlockId(scenario, part ? idStemForPart(part) : ID_STEMS[kind]);
  const block: WorkspaceBlock = part
    ? { id, kind: "touchstone", file: `parts/${part.fileName}`, ...pinLatest(part), ports: part.ports, position: roundPosition(position) }
    : { id, kind, params: defaultParams(kind, scenario), position: roundPosition(position) };
  if (kind === "switch" && !part) block.state = 1;
  return { scenario: { ...scenario, blocks: [...scenario.blocks, block] }, id };
}

/** A block placed now pins the part's latest version (written only above 1: absent means 1). */
export function pinLatest(part: PartSummary): { part_version?: number } {
  return part.version !== undefined && part.version > 1 ? { part_version: part.version } : {};
}

function roundPosition(p: { x: number; y: number }): { x: number; y: number } {
  return { x: Math.round(p.x), y: Math.round(p.y) };
}

function refBlock(ref: PortRef): string | undefined {
  return parsePortRef(ref)?.block;
}

/** Removes blocks with their links and system ports. */
export function removeBlocks(scenario: Scenario, ids: readonly string[]): Scenario {
  const gone = new Set(ids);
  if (!scenario.blocks.some((b) => gone.has(b.id))) return scenario;
  return {
    ...scenario,
    blocks: scenario.blocks.filter((b) => !gone.has(b.id)),
    links: scenario.links.filter(([a, b]) => !gone.has(refBlock(a) ?? "") && !gone.has(refBlock(b) ?? "")),
    ports: scenario.ports.filter((p) => !gone.has(refBlock(p.at) ?? "")),
  };
}

export function moveBlocks(scenario: Scenario, positions: Record<string, { x: number; y: number }>): Scenario {
  return {
    ...scenario,
    blocks: scenario.blocks.map((b) => (positions[b.id] ? { ...b, position: roundPosition(positions[b.id]) } : b)),
  };
}

/** Replaces fields of one block (not its id: see renameBlock), then drops links and ports past its new port count. */
export function updateBlock(
  scenario: Scenario,
  id: string,
  patch: Partial<Omit<WorkspaceBlock, "id">>,
  parts: readonly PartSummary[] = [],
): Scenario {
  const next = { ...scenario, blocks: scenario.blocks.map((b) => (b.id === id ? { ...b, ...patch } : b)) };
  return pruneMissingPorts(next, parts);
}

/** Drops links and system ports whose block or port number no longer exists. */
export function pruneMissingPorts(scenario: Scenario, parts: readonly PartSummary[] = []): Scenario {
  const counts = new Map(scenario.blocks.map((b) => [b.id, portCountOf(b, parts)]));
  const exists = (ref: PortRef): boolean => {
    const at = parsePortRef(ref);
    if (!at || !counts.has(at.block)) return false;
    const n = counts.get(at.block) ?? 0;
    return n === 0 || at.port <= n; // unknown count (part not listed): keep
  };
  const links = scenario.links.filter(([a, b]) => exists(a) && exists(b));
  const ports = scenario.ports.filter((p) => exists(p.at));
  if (links.length === scenario.links.length && ports.length === scenario.ports.length) return scenario;
  return { ...scenario, links, ports };
}

function checkPortExists(scenario: Scenario, ref: PortRef, parts: readonly PartSummary[]): string | null {
  const at = parsePortRef(ref);
  if (!at) return `${ref} is not a block port.`;
  const block = getBlock(scenario, at.block);
  if (!block) return `There is no block ${at.block}.`;
  const n = portCountOf(block, parts);
  if (n > 0 && at.port > n) return `${at.block} has ${n} port${n === 1 ? "" : "s"}; there is no port ${at.port}.`;
  return null;
}

/** Whether `a` and `b` may be linked: distinct existing ports, neither already linked nor a system port. */
export function checkLink(scenario: Scenario, a: PortRef, b: PortRef, parts: readonly PartSummary[] = []): { ok: true } | { ok: false; reason: string } {
  if (a === b) return { ok: false, reason: `A port cannot be linked to itself (${a}).` };
  for (const ref of [a, b]) {
    const missing = checkPortExists(scenario, ref, parts);
    if (missing) return { ok: false, reason: missing };
  }
  for (const ref of [a, b]) {
    const peer = linkedPeer(scenario, ref);
    if (peer) return { ok: false, reason: `${ref} is already linked to ${peer}; a port takes one link.` };
    const sys = systemPortAt(scenario, ref);
    if (sys) return { ok: false, reason: `${ref} is the system port ${sys.name}; unmark it before linking.` };
  }
  return { ok: true };
}

export function addLink(scenario: Scenario, a: PortRef, b: PortRef, parts: readonly PartSummary[] = []): EditResult {
  const check = checkLink(scenario, a, b, parts);
  if (!check.ok) return check;
  return { ok: true, scenario: { ...scenario, links: [...scenario.links, [a, b]] } };
}

/** Removes the link at `ref` (whichever end), if any. */
export function removeLinkAt(scenario: Scenario, ref: PortRef): Scenario {
  const links = scenario.links.filter(([a, b]) => a !== ref && b !== ref);
  return links.length === scenario.links.length ? scenario : { ...scenario, links };
}

/** Why `name` cannot name a system port (null when it can). `except` is the port ref being edited. */
export function validateSystemPortName(scenario: Scenario, name: string, except?: PortRef): string | null {
  if (name.trim().length === 0) return "Enter a port name.";
  if (name.length > 64) return "Keep the port name to 64 characters or fewer.";
  if (scenario.ports.some((p) => p.name === name && p.at !== except)) return `Another system port is already called ${name}.`;
  return null;
}

/**
 * Marks `at` as a system port (or updates the one there). Refused when the port is linked, the name is
 * taken or the Z0 is not a positive number. `z0` undefined means the scenario's Z0.
 */
export function setSystemPort(
  scenario: Scenario,
  at: PortRef,
  spec: { name: string; z0?: number },
  parts: readonly PartSummary[] = [],
): EditResult {
  const missing = checkPortExists(scenario, at, parts);
  if (missing) return { ok: false, reason: missing };
  const peer = linkedPeer(scenario, at);
  if (peer) return { ok: false, reason: `${at} is linked to ${peer}; remove the link before making it a system port.` };
  const name = spec.name.trim();
  const bad = validateSystemPortName(scenario, name, at);
  if (bad) return { ok: false, reason: bad };
  if (spec.z0 !== undefined && !(Number.isFinite(spec.z0) && spec.z0 > 0)) {
    return { ok: false, reason: "Z0 must be a positive number of ohms." };
  }
  const port: SystemPortSpec = spec.z0 === undefined ? { name, at } : { name, at, z0: spec.z0 };
  const exists = scenario.ports.some((p) => p.at === at);
  const ports = exists ? scenario.ports.map((p) => (p.at === at ? port : p)) : [...scenario.ports, port];
  return { ok: true, scenario: { ...scenario, ports } };
}

export function removeSystemPort(scenario: Scenario, at: PortRef): Scenario {
  const ports = scenario.ports.filter((p) => p.at !== at);
  return ports.length === scenario.ports.length ? scenario : { ...scenario, ports };
}

/** A name for a new system port: "P1", "P2"… not yet used. */
export function nextSystemPortName(scenario: Scenario): string {
  const used = new Set(scenario.ports.map((p) => p.name));
  for (let n = 1; ; n++) if (!used.has(`P${n}`)) return `P${n}`;
}

function renameRef(ref: PortRef, from: string, to: string): PortRef {
  const at = parsePortRef(ref);
  return at && at.block === from ? formatPortRef(to, at.port) : ref;
}

/** Renames a block and every link and system port that refers to it. */
export function renameBlock(scenario: Scenario, from: string, to: string): EditResult {
  if (!getBlock(scenario, from)) return { ok: false, reason: `There is no block ${from}.` };
  if (from === to) return { ok: true, scenario };
  const bad = validateBlockId(scenario, to, from);
  if (bad) return { ok: false, reason: bad };
  return {
    ok: true,
    scenario: {
      ...scenario,
      blocks: scenario.blocks.map((b) => (b.id === from ? { ...b, id: to } : b)),
      links: scenario.links.map(([a, b]) => [renameRef(a, from, to), renameRef(b, from, to)]),
      ports: scenario.ports.map((p) => ({ ...p, at: renameRef(p.at, from, to) })),
    },
  };
}

/** Number of throws of a switch block (1 when unset). */
export function switchThrows(block: BlockSpec): number {
  return positiveInt(block.params?.throws, 1);
}

/** Selects throw `state` (1-based) of a switch; refused outside 1…throws. */
export function setSwitchState(scenario: Scenario, id: string, state: number): EditResult {
  const block = getBlock(scenario, id);
  if (!block || block.kind !== "switch") return { ok: false, reason: `${id} is not a switch.` };
  const throws = switchThrows(block);
  if (!Number.isInteger(state) || state < 1 || state > throws) {
    return { ok: false, reason: `${id} has throws 1 to ${throws}.` };
  }
  return { ok: true, scenario: updateBlock(scenario, id, { state }) };
}

/** Steps a switch to its next throw, wrapping after the last. */
export function cycleSwitchState(scenario: Scenario, id: string): Scenario {
  const block = getBlock(scenario, id);
  if (!block || block.kind !== "switch") return scenario;
  const throws = switchThrows(block);
  const current = block.state ?? 1;
  const result = setSwitchState(scenario, id, (current % throws) + 1);
  return result.ok ? result.scenario : scenario;
}

/** Copies blocks and the links whose both ends are among them (system ports are not copied: names are unique). */
export function copyBlocks(scenario: Scenario, ids: readonly string[]): Clipboard {
  const chosen = new Set(ids);
  const blocks = scenario.blocks.filter((b) => chosen.has(b.id)).map((b) => structuredClone(b));
  const links = scenario.links.filter(([a, b]) => chosen.has(refBlock(a) ?? "") && chosen.has(refBlock(b) ?? ""));
  return { blocks, links: links.map(([a, b]) => [a, b]) };
}

/** Pastes a clipboard with fresh ids, shifted by `offset`; returns the new ids in clipboard order. */
export function pasteBlocks(
  scenario: Scenario,
  clipboard: Clipboard,
  offset: { x: number; y: number } = { x: 40, y: 40 },
): { scenario: Scenario; ids: string[] } {
  const renamed = new Map<string, string>();
  const taken = new Set<string>();
  for (const b of clipboard.blocks) {
    const id = nextBlockId(scenario, b.id, taken);
    taken.add(id);
    renamed.set(b.id, id);
  }
  const blocks = clipboard.blocks.map((b) => {
    const copy = structuredClone(b);
    copy.id = renamed.get(b.id) ?? b.id;
    const p = b.position ?? { x: 0, y: 0 };
    copy.position = { x: p.x + offset.x, y: p.y + offset.y };
    return copy;
  });
  const move = (ref: PortRef): PortRef => {
    const at = parsePortRef(ref);
    return at && renamed.has(at.block) ? formatPortRef(renamed.get(at.block) as string, at.port) : ref;
  };
  const links = clipboard.links.map(([a, b]): [PortRef, PortRef] => [move(a), move(b)]);
  return {
    scenario: { ...scenario, blocks: [...scenario.blocks, ...blocks], links: [...scenario.links, ...links] },
    ids: blocks.map((b) => b.id),
  };
}

/**
 * Touchstone texts of the loaded parts keyed as the engine looks them up: `parts/<fileName>` for version 1,
 * `parts/v<N>/<fileName>` for a pinned version N (docs/scenario-format.md#part-versions).
 */
export function partTexts(parts: readonly PartSummary[]): Record<string, string> {
  const out: Record<string, string> = {};
  for (const p of parts) {
    if (p.texts) Object.assign(out, p.texts);
    else if (p.text !== undefined) out[`parts/${p.fileName}`] = p.text;
  }
  return out;
}
