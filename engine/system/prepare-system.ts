/**
 * From a scenario to a system ready to solve: every block evaluated on the frequency plan and
 * referenced to the system Z0, links and system ports resolved to global block-port indices.
 */
import { evaluateBlock } from "../blocks";
import { formatHz } from "../format";
import { interpolateS } from "../interp";
import { partNoiseOnPlan } from "../noise/part-noise";
import { renormalize, z0Vector } from "../renorm";
import { placeBlockError } from "../scenario/block-errors";
import { frequencyPlan } from "../scenario/frequency-plan";
import { parseScenario } from "../scenario/parse-scenario";
import { sameFrequency } from "../scenario/frequency-tolerance";
import {
  EngineInputError,
  type BlockSpec,
  type EvaluatedBlock,
  type PreparedSystem,
  type Scenario,
} from "../types";
import { checkSolveSize, estimateValidScenario } from "./estimate";
import { partActivity } from "./activity";
import { loadPart, type PartSource } from "./parts";
import { resolveTopology } from "./topology";

/** Options of prepareSystem: where part files come from (see PartSource) and an optional size limit. */
export type PrepareOptions = PartSource & {
  /** refuse with SizeLimitError, before any block is evaluated, when estimateSolve's bytes exceed this */
  maxBytes?: number;
  /** for the size estimate: whether the solve will keep wave maps for internal waves (default true) */
  waves?: boolean;
};

function sameReferences(z0: Float64Array, target: number): boolean {
  for (let p = 0; p < z0.length; p += 2) if (z0[p] !== target || z0[p + 1] !== 0) return false;
  return true;
}

/**
 * The note beside a part whose data is interpolated: the method (linear in real and imaginary parts, the default
 * of the reference library scikit-rf 0.15.4) and that it applies to the data already renormalised to the system Z0.
 */
function interpolationNote(id: string, count: number, planPoints: number, fileZ0: Float64Array, z0: number): string {
  const refs = [...new Set(Array.from({ length: fileZ0.length / 2 }, (_, p) => fileZ0[2 * p]))];
  const renorm = sameReferences(fileZ0, z0)
    ? `its data is already referenced to the system Z0 (${z0} Ω)`
    : `after renormalising its data from ${refs.join(", ")} Ω to the system Z0 (${z0} Ω)`;
  return `block ${id}: part data interpolated onto ${count} of ${planPoints} plan points, linearly in real and imaginary parts, ${renorm}`;
}

/** Evaluates a touchstone block: parse (cached), renormalise to the system Z0, interpolate onto the plan. */
function evaluatePart(
  block: BlockSpec,
  where: string,
  frequencies: Float64Array,
  z0: number,
  scenario: Scenario,
  source: PartSource,
): EvaluatedBlock {
  const part = loadPart(block, where, source);
  if (!part) throw new EngineInputError(`${where}.file`, `part file "${block.file}" cannot be read here: no file reader and no inline parts given`);
  const n = part.ports;
  const target = z0Vector(z0, n);
  const referenced = sameReferences(part.z0, z0) ? part.s : renormalize(null, part.s, part.z0, target, "power");
  const warnings: string[] = [];
  const notes: string[] = [];
  let s = referenced;
  let identical = part.frequencies.length === frequencies.length;
  for (let k = 0; identical && k < frequencies.length; k++) identical = sameFrequency(part.frequencies[k], frequencies[k]);
  if (!identical) {
    const mode = scenario.extrapolate ?? "error";
    let result;
    try {
      result = interpolateS(referenced, part.frequencies, frequencies, { name: block.id, extrapolate: mode });
    } catch (err) {
      if (err instanceof EngineInputError) {
        const inner = err.message.startsWith(`${err.where}: `) ? err.message.slice(err.where.length + 2) : err.message;
        throw new EngineInputError(block.data !== undefined ? `${where}.data` : `${where}.file`, inner);
      }
      throw err;
    }
    s = result.s;
    const fLo = part.frequencies[0];
    const fHi = part.frequencies[part.frequencies.length - 1];
    const { below, above } = result.extrapolated;
    if (result.interpolated > 0) notes.push(interpolationNote(block.id, result.interpolated, frequencies.length, part.z0, z0));
    if (below > 0 || above > 0) {
      const counts = [below > 0 ? `${below} below` : "", above > 0 ? `${above} above` : ""].filter(Boolean).join(" and ");
      warnings.push(
        `block ${block.id}: part data covers ${formatHz(fLo)} to ${formatHz(fHi)}; ${counts} that range held at the nearest end value (extrapolation)`,
      );
    }
  }
  const active = partActivity(block, part);
  let noiseChain: Float64Array | undefined;
  if (part.noise && n === 2) {
    const noise = partNoiseOnPlan(part.noise, frequencies, block.id);
    noiseChain = noise.chain;
    warnings.push(...noise.warnings);
  }
  return {
    id: block.id,
    kind: "touchstone",
    s,
    ...(noiseChain ? { noiseChain } : {}),
    // measured data is checked by the checks, not assumed passive or reciprocal
    traits: { passive: false, reciprocal: false, radiates: false },
    rating_dbm: block.rating_dbm,
    ...(active ? { active } : {}),
    warnings,
    notes,
  };
}

/**
 * Prepares a scenario for solving.
 *
 * Validates it (parseScenario), computes the frequency plan, evaluates every block on the plan with its
 * S referenced to the system Z0 at every port (built-in kinds by their models; touchstone parts parsed
 * once per text and cached, renormalised from the file's own references with power waves (Kurokawa
 * 1965), interpolated onto the plan honouring `scenario.extrapolate`), and resolves links and system
 * ports to global block-port indices (blocks in scenario order, ports 1…n within each block).
 * Block ports that are neither linked nor system ports are matched terminations; each gets a warning.
 * With `maxBytes`, the size of the solve is estimated first (estimateSolve: plan, port counts, join order)
 * and a scenario over the limit is refused before any block data is allocated.
 *
 * @param scenario - a scenario (typically from parseScenario)
 * @param opts - where part files come from: `readFile(relPath)` and/or `parts` (texts by file name); `maxBytes`
 * @returns the PreparedSystem (frequencies in Hz, blocks' S over nf points, index maps, warnings)
 * @throws EngineInputError with a JSON path (or file:line for part data) for unusable input
 * @throws SizeLimitError (an EngineInputError) when `maxBytes` is given and the estimate exceeds it
 * @example
 * const sys = prepareSystem(scenario, { readFile: (p) => readFileSync(join(dir, p), "utf8") });
 * sys.blockPorts.length; // total block ports
 */
export function prepareSystem(scenario: Scenario, opts: PrepareOptions = {}): PreparedSystem {
  parseScenario(scenario, opts);
  const frequencies = frequencyPlan(scenario.frequency);
  const z0 = scenario.z0;
  if (opts.maxBytes !== undefined && opts.maxBytes !== Infinity) checkSolveSize(estimateValidScenario(scenario, frequencies.length, opts), opts.maxBytes);
  const warnings: string[] = [];
  const notes: string[] = [];
  const blocks: EvaluatedBlock[] = [];

  scenario.blocks.forEach((spec, i) => {
    const where = `blocks[${i}]`;
    let evaluated: EvaluatedBlock;
    if (spec.kind === "touchstone") {
      evaluated = evaluatePart(spec, where, frequencies, z0, scenario, opts);
    } else {
      let result;
      try {
        result = evaluateBlock(spec, frequencies, z0);
      } catch (err) {
        throw placeBlockError(where, spec.id, err);
      }
      evaluated = {
        id: spec.id,
        kind: spec.kind,
        s: result.s,
        traits: result.traits,
        rating_dbm: spec.rating_dbm,
        ...(result.traits.passive ? {} : { active: { source: "model" as const, reason: `the ${spec.kind} model has gain` } }),
        warnings: result.warnings.map((w) => (w.startsWith(`block ${spec.id}`) ? w : `block ${spec.id}: ${w}`)),
      };
    }
    if (evaluated.s.nf !== frequencies.length) {
      throw new Error(`block ${spec.id}: model returned ${evaluated.s.nf} frequencies for a plan of ${frequencies.length}`);
    }
    blocks.push(evaluated);
    warnings.push(...evaluated.warnings);
    if (evaluated.notes) notes.push(...evaluated.notes);
  });
  const topology = resolveTopology(scenario, blocks.map((b) => b.s.n));
  warnings.push(...topology.warnings);
  return { scenario, frequencies, z0, blocks, ...topology, warnings, notes };
}
