// Selection of plan points inside a band (inclusive edges with a relative tolerance) and port lookup.
import { formatHz } from "../format";
import { FREQUENCY_TOLERANCE, withinRange } from "../scenario/frequency-tolerance";
import { EngineInputError } from "../types";
import type { Solution } from "../types";

/**
 * Relative tolerance on band edges, so that 2.4e9 from a plan step still counts as inside [2.4e9, …]: the engine's
 * one frequency tolerance (FREQUENCY_TOLERANCE, engine/scenario/frequency-tolerance.ts), also used for part coverage.
 */
export const BAND_EDGE_TOLERANCE = FREQUENCY_TOLERANCE;

/**
 * Indices of the plan frequencies inside [lo, hi], edges inclusive within BAND_EDGE_TOLERANCE.
 * @param frequencies plan, Hz, increasing
 * @param band [lo, hi] Hz
 * @param where JSON path or rule name used in the error
 * @returns plan indices, increasing
 * @throws EngineInputError when the band is reversed, not finite, or holds no plan point
 * @example bandIndices(Float64Array.of(1e9, 2e9, 3e9), [1e9, 2e9], "rules[0]") // [0, 1]
 */
export function bandIndices(frequencies: ArrayLike<number>, band: readonly [number, number], where: string): number[] {
  const [lo, hi] = band;
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) throw new EngineInputError(where, `band [${lo}, ${hi}] Hz is not finite`);
  if (lo > hi) throw new EngineInputError(where, `band [${lo}, ${hi}] Hz starts above its stop`);
  const out: number[] = [];
  for (let k = 0; k < frequencies.length; k++) {
    if (withinRange(frequencies[k], lo, hi)) out.push(k);
  }
  if (out.length === 0) {
    throw new EngineInputError(where, `band ${formatHz(lo)}–${formatHz(hi)} holds no point of the frequency plan (${formatHz(frequencies[0])}–${formatHz(frequencies[frequencies.length - 1])})`);
  }
  return out;
}

/**
 * Plan index nearest to a frequency.
 * @param frequencies plan, Hz, increasing, non-empty
 * @param hz requested frequency, Hz
 * @example nearestIndex(Float64Array.of(1e9, 2e9), 1.6e9) // 1
 */
export function nearestIndex(frequencies: ArrayLike<number>, hz: number): number {
  if (!Number.isFinite(hz)) throw new EngineInputError("frequency", `frequency ${hz} Hz is not finite`);
  let best = 0;
  let bestD = Infinity;
  for (let k = 0; k < frequencies.length; k++) {
    const d = Math.abs(frequencies[k] - hz);
    if (d < bestD) {
      bestD = d;
      best = k;
    }
  }
  return best;
}

/**
 * Index of a system port by name.
 * @throws EngineInputError naming `where` and the known ports when the name is unknown
 * @example portIndex(solution, "TX", "rules[0].from") // 0
 */
export function portIndex(solution: Pick<Solution, "ports">, name: string, where: string): number {
  const i = solution.ports.indexOf(name);
  if (i < 0) throw new EngineInputError(where, `unknown system port "${name}" (system ports: ${solution.ports.join(", ") || "none"})`);
  return i;
}

/** Check messages write frequencies with the engine's one formatter (engine/format.ts). */
export { formatHz };
