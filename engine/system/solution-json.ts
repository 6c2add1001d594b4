// The composite of a solution as plain JSON: what `portolan solve --json` prints and the solve route answers.
import type { Solution } from "../types";

/** The JSON shape of a solved composite. */
export type SolutionJson = {
  /** Hz */
  frequencies: number[];
  ports: string[];
  /** each system port's Z0, Ω */
  port_z0: number[];
  /** S[f][i][j] as [re, im] */
  s: [number, number][][][];
  warnings: string[];
  solve_ms: number;
};

/**
 * The composite of a solution as the CLI's (and the solve route's) JSON shape.
 *
 * @param solution - the solved scenario
 * @returns `{ frequencies (Hz), ports, port_z0 (Ω), s: [f][i][j] as [re, im], warnings, solve_ms }`
 * @example
 * JSON.stringify(solutionToJson(solveScenario(scenario))).length > 0; // true
 */
export function solutionToJson(solution: Solution): SolutionJson {
  const { n, nf, data } = solution.s;
  const s: [number, number][][][] = [];
  for (let k = 0; k < nf; k++) {
    const rows: [number, number][][] = [];
    for (let i = 0; i < n; i++) {
      const row: [number, number][] = [];
      for (let j = 0; j < n; j++) {
        const at = 2 * ((k * n + i) * n + j);
        row.push([data[at], data[at + 1]]);
      }
      rows.push(row);
    }
    s.push(rows);
  }
  return {
    frequencies: Array.from(solution.frequencies),
    ports: solution.ports.slice(),
    port_z0: solution.portZ0.slice(),
    s,
    warnings: solution.warnings.slice(),
    solve_ms: solution.solveMs,
  };
}
