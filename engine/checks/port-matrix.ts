// Port-to-port matrix of the composite: |S_ij| in dB and arg S_ij in degrees at one plan point, and the
// extremes of |S_ij| over a band.
import type { Solution } from "../types";
import { bandIndices, nearestIndex } from "./band";
import { db20 } from "./conversions";

export type PortMatrix = {
  ports: string[];
  requestedHz: number;
  /** the plan point used (nearest to the request) */
  frequencyHz: number;
  index: number;
  /** [i][j] = |S_ij| dB (row = to port i, column = from port j) */
  magDb: number[][];
  /** [i][j] = arg S_ij, degrees in (−180, 180] */
  phaseDeg: number[][];
  messages: string[];
};

/**
 * The composite matrix at the plan point nearest to `hz`.
 * @param solution solved composite
 * @param hz requested frequency, Hz
 * @returns dB and phase for every pair, with the plan point used
 * @example portMatrix(sol, 2.45e9).magDb[1][0] // S21 in dB
 */
export function portMatrix(solution: Solution, hz: number): PortMatrix {
  const k = nearestIndex(solution.frequencies, hz);
  const n = solution.s.n;
  const d = solution.s.data;
  const magDb: number[][] = [];
  const phaseDeg: number[][] = [];
  for (let i = 0; i < n; i++) {
    magDb.push([]);
    phaseDeg.push([]);
    for (let j = 0; j < n; j++) {
      const o = 2 * ((k * n + i) * n + j);
      magDb[i].push(db20(Math.hypot(d[o], d[o + 1])));
      phaseDeg[i].push((Math.atan2(d[o + 1], d[o]) * 180) / Math.PI);
    }
  }
  const used = solution.frequencies[k];
  const messages = used === hz ? [] : [`nearest plan point ${used} Hz used for the requested ${hz} Hz`];
  return { ports: [...solution.ports], requestedHz: hz, frequencyHz: used, index: k, magDb, phaseDeg, messages };
}

export type PortMatrixExtremes = {
  ports: string[];
  band: [number, number];
  points: number;
  /** [i][j] highest |S_ij| dB over the band and where: the worst match (i = j) or worst isolation (i ≠ j) */
  maxDb: number[][];
  maxHz: number[][];
  /** [i][j] lowest |S_ij| dB over the band and where: the worst transmission (i ≠ j) */
  minDb: number[][];
  minHz: number[][];
};

/**
 * Extremes of every |S_ij| over a band: the highest value is the worst case for reflections and
 * isolation, the lowest the worst case for wanted transmission.
 * @param solution solved composite
 * @param band [lo, hi] Hz, inclusive
 * @throws EngineInputError when the band holds no plan point
 * @example portMatrixExtremes(sol, [2.4e9, 2.48e9]).maxDb[1][0] // worst TX→RX leak, dB
 */
export function portMatrixExtremes(solution: Solution, band: [number, number]): PortMatrixExtremes {
  const ks = bandIndices(solution.frequencies, band, "band");
  const n = solution.s.n;
  const d = solution.s.data;
  const grid = () => Array.from({ length: n }, () => new Array<number>(n).fill(0));
  const maxDb = grid(), maxHz = grid(), minDb = grid(), minHz = grid();
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      let hi = -Infinity, lo = Infinity, kh = ks[0], kl = ks[0];
      for (const k of ks) {
        const o = 2 * ((k * n + i) * n + j);
        const m = Math.hypot(d[o], d[o + 1]);
        if (m > hi) { hi = m; kh = k; }
        if (m < lo) { lo = m; kl = k; }
      }
      maxDb[i][j] = db20(hi);
      maxHz[i][j] = solution.frequencies[kh];
      minDb[i][j] = db20(lo);
      minHz[i][j] = solution.frequencies[kl];
    }
  }
  return { ports: [...solution.ports], band: [band[0], band[1]], points: ks.length, maxDb, maxHz, minDb, minHz };
}
