/**
 * Built-in block models: S(f) of every kind in docs/blocks.md
 * except `touchstone` (measured parts are read by engine/touchstone). Phase conventions: e^(+jωt),
 * ideal matrices as in Pozar, Microwave Engineering, 4th ed., ch. 4 and 7.
 *
 * Passive kinds (all but the amplifier) satisfy σ_max(S) ≤ 1 for every legal parameter value: finite
 * isolation, directivity and return loss are kept exactly as entered and the transmission is reduced
 * just enough where they could not coexist in a passive part (with a warning); an array whose coupling
 * is too strong is refused. Lossless (SᴴS = I) when ideal: attenuator and phase shifter at 0 dB loss,
 * lossless line, filter (always), tee (always), circulator, coupler, hybrid90, hybrid180, the reflective
 * switch at 0 dB loss and ∞ isolation (and a 1-throw switch), a load with |Γ| = 1. Not lossless even
 * when ideal: splitter (Wilkinson), isolator, absorptive switch with 2 or more throws, matched loads,
 * antennas and arrays (they radiate).
 */
import { EngineInputError, type BlockKind, type BlockSpec, type BlockTraits, type SData } from "../types";
import { BLOCK_CATALOGUE, type BuiltInBlockKind } from "./catalogue";
import { ParamReader } from "./params";
import type { ModelOutput } from "./model";
import { evaluateOneport } from "./oneport";
import { evaluateAttenuator, evaluatePhaseShifter } from "./attenuator";
import { evaluateLine } from "./line";
import { evaluateAmplifier, evaluateIsolator } from "./oneway";
import { evaluateFilter } from "./filter";
import { evaluateCirculator, evaluateSplitter, evaluateTee } from "./junctions";
import { evaluateCoupler, evaluateHybrid180, evaluateHybrid90 } from "./fourports";
import { evaluateSwitch, switchState } from "./switch";
import { evaluateArray } from "./array";

export { BLOCK_CATALOGUE } from "./catalogue";
export type { BlockCatalogueEntry, BuiltInBlockKind } from "./catalogue";
export type { ParamInfo, ParamKind, ParamUnit } from "./params";
export { lowpassPrototype } from "./filter-prototype";
export type { FilterFamily } from "./filter-prototype";
export { filterSParameters, prototypeFrequency } from "./filter";
export type { FilterDesign, FilterResponse } from "./filter";
export { lineSParameters, C0 } from "./line";
export type { LineSection } from "./line";
export { largestSingularValue, powerGainBelow } from "./passivity";

const PASSIVE_RECIPROCAL: BlockTraits = { passive: true, reciprocal: true, radiates: false };
const PASSIVE_ONE_WAY: BlockTraits = { passive: true, reciprocal: false, radiates: false };
const RADIATING: BlockTraits = { passive: true, reciprocal: true, radiates: true };

/**
 * Traits of each built-in kind (see BlockTraits).
 *
 * @example
 * BLOCK_TRAITS.amplifier.passive; // false
 */
export const BLOCK_TRAITS: Record<BuiltInBlockKind, BlockTraits> = {
  load: PASSIVE_RECIPROCAL,
  antenna: RADIATING,
  attenuator: PASSIVE_RECIPROCAL,
  line: PASSIVE_RECIPROCAL,
  phase_shifter: PASSIVE_RECIPROCAL,
  isolator: PASSIVE_ONE_WAY,
  amplifier: { passive: false, reciprocal: false, radiates: false },
  filter: PASSIVE_RECIPROCAL,
  splitter: PASSIVE_RECIPROCAL,
  tee: PASSIVE_RECIPROCAL,
  circulator: PASSIVE_ONE_WAY,
  coupler: PASSIVE_RECIPROCAL,
  hybrid90: PASSIVE_RECIPROCAL,
  hybrid180: PASSIVE_RECIPROCAL,
  switch: PASSIVE_RECIPROCAL,
  array: RADIATING,
};

function builtInKind(spec: BlockSpec): BuiltInBlockKind {
  const id = typeof spec?.id === "string" ? spec.id : "?";
  if (spec.kind === "touchstone") {
    throw new EngineInputError(`block ${id}, kind`, "touchstone blocks are evaluated from their part data (engine/touchstone), not by the built-in models");
  }
  if (!Object.prototype.hasOwnProperty.call(BLOCK_CATALOGUE, spec.kind)) {
    throw new EngineInputError(
      `block ${id}, kind`,
      `unknown block kind ${JSON.stringify(spec.kind)}; expected one of ${[...Object.keys(BLOCK_CATALOGUE), "touchstone"].join(", ")}`,
    );
  }
  return spec.kind as BuiltInBlockKind;
}

function readerFor(spec: BlockSpec, kind: BuiltInBlockKind): ParamReader {
  return new ParamReader(spec.id, kind, spec.params, BLOCK_CATALOGUE[kind].params);
}

function checkFrequencies(freqs: Float64Array): void {
  for (let k = 0; k < freqs.length; k++) {
    const f = freqs[k];
    if (!(f >= 0) || !Number.isFinite(f)) {
      throw new EngineInputError(`frequency ${k}`, `expected a finite frequency in Hz ≥ 0, got ${f}`);
    }
  }
}

/**
 * Port count of a built-in block, validating the parameters that decide it (switch: throws and the
 * state; array: elements). Touchstone blocks throw: their port count comes from the part data.
 *
 * @example
 * blockPortCount({ id: "SW1", kind: "switch", params: { throws: 4, insertion_loss_db: 0.5, isolation_db: 30 } }); // 5
 */
export function blockPortCount(spec: BlockSpec): number {
  const kind = builtInKind(spec);
  const entry = BLOCK_CATALOGUE[kind];
  if (typeof entry.ports === "number") return entry.ports;
  const r = readerFor(spec, kind);
  if (kind === "switch") {
    const throws = r.number("throws");
    switchState(spec.id, spec.state, throws);
    return throws + 1;
  }
  return r.number("elements");
}

/**
 * Evaluates a built-in block over the frequency plan.
 *
 * @param spec the block (id, kind, params; `state` for a switch)
 * @param freqs plan frequencies, Hz (finite, ≥ 0)
 * @param z0 real system reference impedance, Ω (> 0); every port of the result is referenced to it
 * @returns `s` (n × n at each of freqs.length frequencies, SData layout), the kind's traits and
 *   warnings (passivity corrections, parameters ignored for the chosen filter response)
 * @throws EngineInputError `block ID, parameter NAME: …` for missing, unknown or out-of-range parameters
 * @example
 * const { s } = evaluateBlock({ id: "PAD", kind: "attenuator", params: { loss_db: 6 } }, new Float64Array([1e9]), 50);
 * s.data[4]; // Re S21 ≈ 0.501
 */
export function evaluateBlock(spec: BlockSpec, freqs: Float64Array, z0: number): { s: SData; traits: BlockTraits; warnings: string[] } {
  const kind = builtInKind(spec);
  if (!(z0 > 0) || !Number.isFinite(z0)) throw new EngineInputError("z0", `expected a real reference impedance in Ω > 0, got ${z0}`);
  checkFrequencies(freqs);
  const r = readerFor(spec, kind);
  if (kind !== "switch" && spec.state !== undefined) {
    throw new EngineInputError(`block ${spec.id}, state`, `only switch blocks have a state; this is a ${kind} block`);
  }
  const nf = freqs.length;
  let out: ModelOutput;
  switch (kind) {
    case "load":
    case "antenna":
      out = evaluateOneport(r, nf, z0);
      break;
    case "attenuator":
      out = evaluateAttenuator(r, nf);
      break;
    case "phase_shifter":
      out = evaluatePhaseShifter(r, nf);
      break;
    case "line":
      out = evaluateLine(r, freqs, z0);
      break;
    case "isolator":
      out = evaluateIsolator(r, nf);
      break;
    case "amplifier":
      out = evaluateAmplifier(r, nf);
      break;
    case "filter":
      out = evaluateFilter(r, freqs);
      break;
    case "splitter":
      out = evaluateSplitter(r, nf);
      break;
    case "tee":
      out = evaluateTee(nf);
      break;
    case "circulator":
      out = evaluateCirculator(r, nf);
      break;
    case "coupler":
      out = evaluateCoupler(r, nf);
      break;
    case "hybrid90":
      out = evaluateHybrid90(r, nf);
      break;
    case "hybrid180":
      out = evaluateHybrid180(r, nf);
      break;
    case "switch":
      out = evaluateSwitch(r, spec.state, nf);
      break;
    case "array":
      out = evaluateArray(r, nf);
      break;
  }
  return { s: out.s, traits: { ...BLOCK_TRAITS[kind] }, warnings: out.warnings };
}

/** Parameters set to their ideal value by idealizeBlock, per kind (null = ∞ dB; undefined = removed). */
const IDEAL_PARAMS: Record<BuiltInBlockKind, Record<string, null | number | undefined>> = {
  // a termination's function is to absorb: matched
  load: { return_loss_db: null, phase_deg: undefined, impedance: undefined },
  antenna: { return_loss_db: null, phase_deg: undefined, impedance: undefined },
  // the loss is the attenuator's function
  attenuator: {},
  // the delay is the line's function; its loss and its impedance step are not
  line: { loss_db_per_m: 0, impedance: undefined },
  phase_shifter: { loss_db: 0 },
  isolator: { insertion_loss_db: 0, isolation_db: null, return_loss_db: null },
  // keeps its gain
  amplifier: { reverse_isolation_db: null, input_return_loss_db: null, output_return_loss_db: null },
  // already a lossless synthesis: its selectivity (and the reflection that comes with it) is its function
  filter: {},
  splitter: { excess_loss_db: 0, isolation_db: null },
  // an ideal lossless junction already; its mismatch is inherent
  tee: {},
  circulator: { insertion_loss_db: 0, isolation_db: null, return_loss_db: null },
  // keeps its coupling
  coupler: { directivity_db: null, excess_loss_db: 0 },
  hybrid90: { excess_loss_db: 0, isolation_db: null },
  hybrid180: { excess_loss_db: 0, isolation_db: null },
  // keeps throws, state and off state
  switch: { insertion_loss_db: 0, isolation_db: null },
  // matched, uncoupled elements
  array: { return_loss_db: null, coupling_db: null, coupling_falloff_db: undefined },
};

/**
 * The block's idealised self for the leak trace: the same function with every non-ideal figure at its
 * ideal value — infinite isolation and directivity, perfect match, no excess or insertion loss beyond
 * what the function needs. Attenuator keeps its loss, coupler its coupling, amplifier its gain (with
 * infinite reverse isolation and perfect match), phase shifter and line their phase (lossless, at the
 * system Z0), switch its throws and state; the filter and the tee are returned unchanged (already
 * lossless syntheses whose reflections are part of their function); loads and antennas become matched,
 * an array matched and uncoupled. Touchstone parts are returned unchanged (measured data declares no
 * ideal). Returns a new spec; the input is not modified. Parameters are not validated here.
 *
 * @example
 * idealizeBlock({ id: "C1", kind: "coupler", params: { coupling_db: 20, directivity_db: 25, excess_loss_db: 0.2 } });
 * // { id: "C1", kind: "coupler", params: { coupling_db: 20, directivity_db: null, excess_loss_db: 0 } }
 */
export function idealizeBlock(spec: BlockSpec): BlockSpec {
  if (spec.kind === "touchstone") return { ...spec, params: spec.params ? { ...spec.params } : undefined };
  const kind = builtInKind(spec);
  const params: Record<string, unknown> = { ...(spec.params ?? {}) };
  for (const [name, value] of Object.entries(IDEAL_PARAMS[kind])) {
    if (value === undefined) delete params[name];
    else params[name] = value;
  }
  return { ...spec, params };
}

/**
 * Every kind handled here (all but touchstone), in catalogue order.
 *
 * @example
 * BUILT_IN_KINDS.includes("coupler"); // true
 */
export const BUILT_IN_KINDS = Object.keys(BLOCK_CATALOGUE) as BuiltInBlockKind[];

/**
 * Whether `kind` is handled by the built-in models.
 *
 * @example
 * isBuiltInKind("touchstone"); // false
 */
export function isBuiltInKind(kind: BlockKind | string): kind is BuiltInBlockKind {
  return Object.prototype.hasOwnProperty.call(BLOCK_CATALOGUE, kind);
}
