/**
 * Prepare and solve in one call, for the CLI and the checks.
 */
import { solveSystem } from "../network";
import type { Scenario, SData, Solution } from "../types";
import { prepareSystem, type PrepareOptions } from "./prepare-system";

/** Options of solveScenario: part files (PrepareOptions) and block S overrides passed to solveSystem. */
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
 * @throws EngineInputError for unusable input; SingularSystemError for a singular interconnection
 * @example
 * const sol = solveScenario(parseScenario(json), { readFile });
 * sol.s.n === sol.ports.length; // true
 */
export function solveScenario(scenario: Scenario, opts: SolveScenarioOptions = {}): Solution {
  const { replace, ...source } = opts;
  const system = prepareSystem(scenario, source);
  return solveSystem(system, replace ? { replace } : undefined);
}
