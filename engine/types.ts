/**
 * Shared shapes of the engine. Every module of engine/ speaks in these types, so that block models,
 * Touchstone, renormalisation, the interconnection and the checks can be written and tested apart.
 *
 * Complex numbers live in Float64Array, interleaved [re, im]. A stack of n×n matrices over nf
 * frequencies is stored frequency-major, row-major: element (k, i, j) has its real part at
 * `2 * ((k * n + i) * n + j)` and its imaginary part right after it.
 */
import type { z } from "zod";
import type { RuleOptOutSchema, RuleOverrideSchema, RuleSchema } from "./scenario/schema";

/** S-parameters of an n-port at nf frequencies (see the layout above). Ports are 0-based here. */
export type SData = {
  /** port count */
  n: number;
  /** frequency count */
  nf: number;
  /** length 2 · nf · n · n, interleaved re/im, [k][i][j] */
  data: Float64Array;
};

/** Reference impedances of an n-port, one complex value per port (Ω), interleaved re/im, length 2n. */
export type Z0Vector = Float64Array;

/** Wave convention used by renormalisation: power waves (Kurokawa 1965, default) or pseudo-waves (Marks and Williams 1992). */
export type WaveKind = "power" | "pseudo";

// ---------------------------------------------------------------------------------------------------
// Scenario file (docs/scenario-format.md); the zod schema that validates it is engine/scenario/.

export type FrequencyPlanSpec =
  | { start: number; stop: number; points: number }
  | { list: number[] };

export type BlockKind =
  | "load"
  | "antenna"
  | "attenuator"
  | "line"
  | "phase_shifter"
  | "isolator"
  | "amplifier"
  | "filter"
  | "splitter"
  | "tee"
  | "circulator"
  | "coupler"
  | "hybrid90"
  | "hybrid180"
  | "switch"
  | "array"
  | "touchstone";

export type BlockSpec = {
  /** unique within the scenario, e.g. "SW1" */
  id: string;
  kind: BlockKind;
  /** model parameters, numbers in SI/dB units as named in docs/blocks.md (strings allowed where documented) */
  params?: Record<string, unknown>;
  /** switch: selected throw, 1-based (1 = common to port 2) */
  state?: number;
  /** touchstone: path relative to the scenario file */
  file?: string;
  /** touchstone: inline Touchstone text (wins over `file`) */
  data?: string;
  /**
   * touchstone: the version of the library part `file` names that this block uses (absent = 1); a
   * supplied text is looked up under `pinnedPartPath(file, part_version)`, a file on disk is read as `file`
   */
  part_version?: number;
  /** touchstone: format hint when `data` is inline and the port count is not in the text (v1.1) */
  ports?: number;
  /** the most power any port of the block may take, dBm */
  rating_dbm?: number;
  /**
   * touchstone: true marks a measured part as active (an amplifier: not expected passive or reciprocal, checked
   * for stability); false keeps it expected passive; absent lets its data decide (gain above 1 dB). Built-in
   * kinds may only repeat what their model is (true for the amplifier, false for the others).
   */
  active?: boolean;
  /** physical temperature for the block's thermal noise, K (default: the scenario's `temperature_k`) */
  temperature_k?: number;
  /** output power at 1 dB gain compression, dBm (line-up, drive check) */
  p1db_out_dbm?: number;
  /** output third-order intercept point, dBm (line-up) */
  oip3_dbm?: number;
  /** chart position; ignored by the engine */
  position?: { x: number; y: number };
  /** free text label; ignored by the engine */
  label?: string;
  /** expressions typed for params (e.g. { loss_db: "0.12 dB/m * L_feed" }); evaluated by the web app, ignored by the engine */
  expr?: Record<string, string>;
  /**
   * spreads for the spread analysis, by parameter name (touchstone parts: "mag_db" and "phase_deg"), in the
   * parameter's own unit; ignored by solve and check (docs/scenario-format.md "Spreads")
   */
  spread?: Record<string, SpreadSpec>;
};

/** One parameter's spread: uniform in nominal ± plus_minus, or normal with standard deviation sigma. */
export type SpreadSpec = { plus_minus: number } | { sigma: number };

/** "BLOCK:PORT", PORT 1-based */
export type PortRef = string;

export type SystemPortSpec = { name: string; at: PortRef; z0?: number };

/** A rule of a scenario file, as its zod schema (engine/scenario/schema.ts `RuleSchema`) reads it. */
export type RuleSpec = z.infer<typeof RuleSchema>;
/** A scenario's replacement of a project rule of the same `id` (engine/scenario/schema.ts `RuleOverrideSchema`). */
export type RuleOverride = z.infer<typeof RuleOverrideSchema>;
/** A scenario's visible opt-out of a project rule, with its reason. */
export type RuleOptOut = z.infer<typeof RuleOptOutSchema>;

export type Scenario = {
  format: "portolan.scenario/1";
  name: string;
  /** system reference impedance, Ω (real) */
  z0: number;
  frequency: FrequencyPlanSpec;
  blocks: BlockSpec[];
  links: [PortRef, PortRef][];
  ports: SystemPortSpec[];
  /** scenario-only rules */
  rules?: RuleSpec[];
  /** replacements of project rules, by the project rule's id (the app's effective rule set reads them) */
  rule_overrides?: RuleOverride[];
  /** project rules this scenario does not answer to, each with a reason */
  rule_opt_outs?: RuleOptOut[];
  /** physical temperature of the passive blocks for their thermal noise, K (default 290) */
  temperature_k?: number;
  /** allow hold-last extrapolation of part data outside its range (reported as a warning) */
  extrapolate?: "error" | "hold";
  /** project variables usable in parameter expressions (the web app resolves them before the engine) */
  variables?: Record<string, string | number>;
};

// ---------------------------------------------------------------------------------------------------
// Block models (engine/blocks/)

/** What a block model knows about itself. */
export type BlockTraits = {
  /** true for every kind except the amplifier (and measured data, which is checked, not assumed) */
  passive: boolean;
  /** true when S = Sᵀ is expected (isolator, circulator and amplifier are not reciprocal) */
  reciprocal: boolean;
  /** absorbed power counts as radiated (antenna, array) */
  radiates: boolean;
};

/** Why a block counts as active: its model (amplifier), the scenario's `active: true`, or gain in its data. */
export type BlockActivity = { source: "model" | "scenario" | "data"; reason: string };

/**
 * An evaluated block: its S over the plan, referenced at every port to the system Z0 (real),
 * ready for the interconnection.
 */
export type EvaluatedBlock = {
  id: string;
  kind: BlockKind;
  s: SData;
  traits: BlockTraits;
  rating_dbm?: number;
  /** set when the block is active (it may add energy), with the reason; absent for passive blocks */
  active?: BlockActivity;
  /**
   * touchstone parts with a noise section: its chain correlation matrix on the plan ([k][2][2] interleaved,
   * W/Hz; engine/noise/noise-parameters.ts), interpolated linearly between noise frequencies
   */
  noiseChain?: Float64Array;
  /** messages such as extrapolation used, passivity clipped */
  warnings: string[];
  /** information that is not a warning, such as how part data was interpolated onto the plan */
  notes?: string[];
};

// ---------------------------------------------------------------------------------------------------
// Errors

/** Bad input: a scenario, a block parameter or a file that cannot be used. `where` is a JSON path or file:line. */
export class EngineInputError extends Error {
  readonly where: string;
  constructor(where: string, message: string) {
    super(`${where}: ${message}`);
    this.name = "EngineInputError";
    this.where = where;
  }
}

/** A singular or ill-conditioned interconnection (for example a loop of lossless reflections). */
export class SingularSystemError extends Error {
  /** links (as "A:1–B:2") that take part in the singular system, when known */
  readonly links: string[];
  readonly frequencyHz?: number;
  constructor(message: string, links: string[] = [], frequencyHz?: number) {
    super(message);
    this.name = "SingularSystemError";
    this.links = links;
    this.frequencyHz = frequencyHz;
  }
}

// ---------------------------------------------------------------------------------------------------
// Interconnection (engine/network/)

/** One block port in the solved system; `index` is its position in Solution.blockPorts. */
export type BlockPortInfo = { index: number; block: string; port: number /* 1-based */ };

/** A scenario made ready to solve: plan, evaluated blocks, links and system ports resolved to indices. */
export type PreparedSystem = {
  scenario: Scenario;
  /** plan frequencies, Hz, increasing */
  frequencies: Float64Array;
  /** system reference impedance, Ω */
  z0: number;
  blocks: EvaluatedBlock[];
  /** every block port, blocks in scenario order, ports 1…n within each */
  blockPorts: BlockPortInfo[];
  /** first global block-port index of each block (same order as `blocks`) */
  blockOffset: number[];
  /** links as pairs of global block-port indices */
  links: [number, number][];
  /** system ports in scenario order: global block-port index and own Z0 */
  systemPorts: { name: string; at: number; z0: number }[];
  /** block ports neither linked nor system ports (matched terminations) */
  unterminated: number[];
  warnings: string[];
  /** the blocks' notes (for example how part data was interpolated), in block order */
  notes?: string[];
};

/** The composite response. */
export type Solution = {
  system: PreparedSystem;
  frequencies: Float64Array;
  /** system port names, scenario order */
  ports: string[];
  /** each system port's own Z0, Ω */
  portZ0: number[];
  /** composite S, n = ports.length, each port referenced to its own Z0 */
  s: SData;
  warnings: string[];
  solveMs: number;
};

/**
 * Waves at every block port for a given excitation: `a` incident on the block port (travelling into
 * the block), `b` outgoing from it, both referenced to the system Z0 and scaled so that |a|² is power
 * in watts for incident source waves given in √W. Layout [k][p] interleaved re/im, p a global block-port
 * index; length 2 · nf · blockPorts.length.
 */
export type InternalWaves = { a: Float64Array; b: Float64Array };
