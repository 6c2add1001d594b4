// Size of a solve before it runs: memory and work from the frequency plan, the block port counts and the
// join order (engine/network/plan.ts), so that a scenario too large for the machine is refused before any
// large typed array is allocated. Counts follow the allocations of prepareSystem and solveSystem.

import { blockPortCount } from "../blocks";
import { planFor } from "../network/solve-system";
import { placeBlockError } from "../scenario/block-errors";
import { frequencyPlan } from "../scenario/frequency-plan";
import { parseScenario } from "../scenario/parse-scenario";
import { EngineInputError, type PreparedSystem, type Scenario } from "../types";
import { loadPart, type PartSource } from "./parts";
import { resolveTopology } from "./topology";

/** Default memory limit of a solve: 2 GiB (the CLI's --max-memory default; `solveScenario` applies it too). */
export const DEFAULT_MAX_SOLVE_BYTES = 2 * 1024 ** 3;

/** What a solve will take, from its plan and join order; sizes in bytes, work in real floating-point operations. */
export type SolveEstimate = {
  /** typed-array bytes a prepare + solve holds at its peak (block data, wave maps, working buffers, composite) */
  bytes: number;
  /** floating-point operations, roughly (complex multiply-add = 8), of evaluating and joining */
  work: number;
  details: {
    points: number;
    blocks: number;
    blockPorts: number;
    systemPorts: number;
    /** the block with the most ports */
    largestBlock: { id: string; ports: number } | null;
    /** most ports open on one sub-network during the joins (the join order's frontier) */
    largestFrontier: number;
    joinSteps: number;
    /** every block's S on the plan, 16·points·n² each */
    blockDataBytes: number;
    /** part files as read (and renormalised) before interpolation onto the plan */
    partDataBytes: number;
    /** the solver's wave maps for internal waves (0 when `waves: false`) */
    waveMapBytes: number;
    /** intermediate sub-networks and scratch of the joins */
    workingBytes: number;
    /** the composite S */
    compositeBytes: number;
    /** a built-in model's scratch copy of its S while it builds it (the largest block's) */
    modelScratchBytes: number;
  };
};

export type EstimateOptions = PartSource & {
  /** count the wave maps kept for internal waves (default true, as solveSystem does) */
  waves?: boolean;
};

/** A solve refused before it starts: its estimate is over the limit. The message says what to reduce. */
export class SizeLimitError extends EngineInputError {
  readonly estimate: SolveEstimate;
  readonly limitBytes: number;
  constructor(estimate: SolveEstimate, limitBytes: number) {
    super("scenario", sizeMessage(estimate, limitBytes));
    this.name = "SizeLimitError";
    this.estimate = estimate;
    this.limitBytes = limitBytes;
  }
}

/**
 * Formats a byte count with binary units: 2147483648 → "2 GiB", 1536 → "1.5 KiB".
 *
 * @example formatBytes(6.5 * 2 ** 30) // "6.5 GiB"
 */
export function formatBytes(bytes: number): string {
  const units = ["B", "KiB", "MiB", "GiB", "TiB", "PiB"];
  let v = bytes;
  let u = 0;
  while (v >= 1024 && u < units.length - 1) {
    v /= 1024;
    u++;
  }
  return `${+v.toPrecision(3)} ${units[u]}`;
}

function sizeMessage(e: SolveEstimate, limit: number): string {
  const d = e.details;
  const parts: [string, number][] = [
    ["block S-parameters", d.blockDataBytes],
    ["part data", d.partDataBytes],
    ["wave maps", d.waveMapBytes],
    ["join buffers", d.workingBytes],
    ["composite", d.compositeBytes],
    ["model scratch", d.modelScratchBytes],
  ];
  const share = parts
    .filter(([, b]) => b >= 0.05 * e.bytes)
    .map(([what, b]) => `${what} ${formatBytes(b)}`)
    .join(", ");
  const reduce = [`the frequency points (${d.points})`];
  if (d.largestBlock) reduce.push(`the ports of the largest block (${d.largestBlock.id}: ${d.largestBlock.ports}; memory grows with their square)`);
  reduce.push(`the number of blocks (${d.blocks})`);
  if (d.waveMapBytes >= 0.25 * e.bytes) reduce.push("the system ports whose internal waves are kept");
  return `a solve needs about ${formatBytes(e.bytes)} (${share}), over the limit of ${formatBytes(limit)}: reduce ${reduce.join(", ")}, or raise the limit (--max-memory)`;
}

/**
 * Port counts of a scenario's blocks without evaluating any model: the catalogue's for built-in kinds, the
 * part file's for touchstone blocks (parsed once and cached, as prepareSystem reads them).
 *
 * @returns per block, in scenario order: port count and, for parts, the bytes of their data as read
 * @throws EngineInputError as prepareSystem would for an unreadable part or invalid parameters
 */
export function blockSizes(scenario: Scenario, source: PartSource): { ports: number; partBytes: number }[] {
  return scenario.blocks.map((spec, i) => {
    const where = `blocks[${i}]`;
    if (spec.kind !== "touchstone") {
      try {
        return { ports: blockPortCount(spec), partBytes: 0 };
      } catch (err) {
        throw placeBlockError(where, spec.id, err);
      }
    }
    const part = loadPart(spec, where, source);
    if (!part) throw new EngineInputError(`${where}.file`, `part file "${spec.file}" cannot be read here: no file reader and no inline parts given`);
    // as read, plus a renormalised copy when its references are not the system Z0
    return { ports: part.ports, partBytes: 2 * part.s.data.byteLength };
  });
}

/**
 * The memory and work of solving a scenario (or an already prepared system), from the frequency plan, the
 * block port counts and the join order, before anything large is allocated. For a scenario nothing is
 * evaluated: block models are not run and part files are only parsed. Check the result with
 * {@link checkSolveSize} or pass `maxBytes` to prepareSystem / solveScenario.
 *
 * @param input - a scenario (validated here) or a PreparedSystem
 * @param opts - where part files come from; `waves: false` when internal waves will not be asked for
 * @returns `{ bytes, work, details }`: details give points, blocks, ports, the largest block and frontier
 *   and the bytes of each kind of data
 * @throws EngineInputError for a scenario that prepareSystem would refuse
 * @example
 * const e = estimateSolve(scenario, { readFile });
 * if (e.bytes > 2 ** 31) console.log(`too large: ${formatBytes(e.bytes)}`);
 */
export function estimateSolve(input: Scenario | PreparedSystem, opts: EstimateOptions = {}): SolveEstimate {
  if ("blockPorts" in input) {
    return estimateFromSystem(input, input.frequencies.length, input.blocks.map(() => 0), opts.waves !== false);
  }
  parseScenario(input, opts);
  return estimateValidScenario(input, frequencyPlan(input.frequency).length, opts);
}

/**
 * estimateSolve for a scenario already validated (parseScenario) whose plan has `nf` points: what
 * prepareSystem calls before it evaluates any block.
 *
 * @example estimateValidScenario(scenario, frequencies.length, { readFile }).bytes
 */
export function estimateValidScenario(input: Scenario, nf: number, opts: EstimateOptions = {}): SolveEstimate {
  const sizes = blockSizes(input, opts);
  return estimateFromSystem(skeletonSystem(input, nf, sizes.map((s) => s.ports)), nf, sizes.map((s) => s.partBytes), opts.waves !== false);
}

/**
 * Throws SizeLimitError when an estimate is over a limit.
 *
 * @param estimate - from estimateSolve
 * @param limitBytes - the limit (Infinity for none)
 * @throws SizeLimitError carrying the estimate and the limit, its message saying what to reduce
 * @example checkSolveSize(estimateSolve(scenario), DEFAULT_MAX_SOLVE_BYTES);
 */
export function checkSolveSize(estimate: SolveEstimate, limitBytes: number): void {
  if (estimate.bytes > limitBytes) throw new SizeLimitError(estimate, limitBytes);
}

/**
 * A PreparedSystem with the topology of the scenario and empty block data: enough for the join plan
 * (which reads port counts, links and system ports only).
 */
export function skeletonSystem(scenario: Scenario, nf: number, ports: number[]): PreparedSystem {
  const empty = new Float64Array(0);
  const blocks = scenario.blocks.map((spec, i) => ({
    id: spec.id,
    kind: spec.kind,
    s: { n: ports[i], nf, data: empty },
    traits: { passive: false, reciprocal: false, radiates: false },
    warnings: [],
  }));
  const topology = resolveTopology(scenario, ports);
  // the frequencies are not needed for sizes; a zero-length array keeps this skeleton small
  return { scenario, frequencies: new Float64Array(0), z0: scenario.z0, blocks, ...topology, warnings: topology.warnings };
}

function estimateFromSystem(sys: PreparedSystem, nf: number, partBytes: number[], waves: boolean): SolveEstimate {
  const E = sys.systemPorts.length;
  let blockDataBytes = 0;
  let work = 0;
  let largestBlock: { id: string; ports: number } | null = null;
  for (const b of sys.blocks) {
    const n = b.s.n;
    blockDataBytes += 16 * nf * n * n;
    work += 8 * nf * n * n; // evaluating a model: a few operations per entry
    if (!largestBlock || n > largestBlock.ports) largestBlock = { id: b.id, ports: n };
  }
  const plan = planFor(sys);
  let maxN = 1;
  for (const leaf of plan.leaves) maxN = Math.max(maxN, leaf.keep.length);
  let mapDoubles = 0;
  for (const step of plan.steps) {
    const nc = step.ports.length;
    const ni = step.inner.length;
    maxN = Math.max(maxN, nc);
    mapDoubles += 2 * nf * ni * nc;
    // per frequency: factor the closed ports' system, then the products forming the open ports
    work += 8 * nf * (ni * ni * ni / 3 + ni * ni * nc + ni * nc * nc + nc * nc);
  }
  // runGrowth's chunk of frequencies and its live sub-networks (two operands, a result, one leaf copy)
  const chunk = Math.max(1, Math.min(nf, Math.floor(16384 / (maxN * maxN))));
  const workingBytes = 4 * 16 * chunk * maxN * maxN;
  const waveMapBytes = waves ? 8 * mapDoubles : 0;
  const compositeBytes = 16 * nf * E * E;
  const partDataBytes = partBytes.reduce((a, b) => a + b, 0);
  // a built-in model may hold one scratch copy of its S while it builds it
  const modelScratch = largestBlock ? 16 * nf * largestBlock.ports * largestBlock.ports : 0;
  const bytes = 8 * nf + blockDataBytes + modelScratch + partDataBytes + waveMapBytes + workingBytes + compositeBytes;
  return {
    bytes,
    work,
    details: {
      points: nf,
      blocks: sys.blocks.length,
      blockPorts: sys.blockPorts.length,
      systemPorts: E,
      largestBlock,
      largestFrontier: maxN,
      joinSteps: plan.steps.length,
      blockDataBytes,
      partDataBytes,
      waveMapBytes,
      workingBytes,
      compositeBytes,
      modelScratchBytes: modelScratch,
    },
  };
}
