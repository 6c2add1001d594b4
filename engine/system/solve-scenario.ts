/**
 * Prepare and solve in one call, for the CLI and the checks.
 */
import { solveSystem } from "../network";
import type { Scenario, SData, Solution } from "../types";
import { DEFAULT_MAX_SOLVE_BYTES } from "./estimate";
import { prepareSystem, type PrepareOptions } from "./prepare-system";

/**
 * Options of solveScenario: part files, the size limit (`maxBytes`, default DEFAULT_MAX_SOLVE_BYTES = 2 GiB;
 * Infinity for none) and `waves` (keep what internalWaves needs, default true) as in PrepareOptions, and
 * block S overrides passed to solveSystem.
 */
export type SolveScenarioOptions = PrepareOptions & {
  /** S of some blocks by id, replacing their evaluated S (same n and nf, system Z0) */
  replace?: Record<string, SData>;
};

/**
 * Prepares (prepareSystem) and solves (solveSystem) a scenario.
 *
 * @param scenario - a scenario (typically from parseScenario)
 * @param opts - part files and optional block S replacements
 * @returns the Solution: composite S over the plan, each system port referenced to its own Z0
 * @throws EngineInputError for unusable input; SizeLimitError (an EngineInputError) when the estimated size
 *   is over `maxBytes`, before anything large is allocated; SingularSystemError for a singular interconnection
 * @example
 * const sol = solveScenario(parseScenario(json), { readFile });
 * sol.s.n === sol.ports.length; // true
 */
export function solveScenario(scenario: Scenario, opts: SolveScenarioOptions = {}): Solution {
  const { replace, ...source } = opts;
  const system = prepareSystem(scenario, { ...source, maxBytes: source.maxBytes ?? DEFAULT_MAX_SOLVE_BYTES });
  return solveSystem(system, { ...(replace ? { replace } : {}), ...(source.waves === false ? { waves: false } : {}) });
}
