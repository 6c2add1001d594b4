/**
 * Antenna array: n elements on a line, element k = port k. Every element reflects
 * S_kk = 10^(−RL/20) (real, phase 0, like an antenna block's default phase); elements i ≠ j couple with
 * |S_ij| = 10^(−(C + (|i−j| − 1)·F)/20), C = coupling_db (adjacent), F = coupling_falloff_db (∞ by
 * default: only neighbours couple), and phase −90° per element step, e^(−jπ|i−j|/2), constant over
 * frequency. This model's choice: neighbours couple in quadrature with each element's own reflection,
 * the relation unitarity imposes on a lossless reciprocal symmetric two-port (Re(S11·conj S21) = 0,
 * Pozar, Microwave Engineering, 4th ed., sec. 4.3); a (−1)^|i−j| progression (half-wave spacing) would
 * add every coupling coherently into one excitation and refuse common entries such as RL 10 dB with
 * 15 dB coupling. Reciprocal; what is not reflected or coupled counts as radiated.
 * The entered figures are checked, not corrected: if σ_max(S) > 1 (coupling too strong for the return
 * loss) the block is refused with an error naming coupling_db, because under-stating coupling would
 * under-state the leakage this block exists to model. Never lossless unless RL = 0 with no coupling.
 */
import type { ParamReader } from "./params";
import { dbToAmplitude } from "./params";
import { broadcastMatrix, zeroMatrix } from "./cmatrix";
import { largestSingularValue, powerGainBelow } from "./passivity";
import type { ModelOutput } from "./model";

/**
 * Array S (elements × elements) over `nf` frequencies, frequency-independent.
 *
 * @example
 * evaluateArray(reader, 201); // elements 4, return_loss_db 15, coupling_db 20 → S21 = −0.1j, S31 = 0
 */
export function evaluateArray(r: ParamReader, nf: number): ModelOutput {
  const n = r.number("elements");
  const rl = r.number("return_loss_db");
  const c = r.number("coupling_db");
  const fall = r.number("coupling_falloff_db");
  const rho = dbToAmplitude(rl);
  // coupling by distance d = |i − j| ≥ 1 as [re, im]: magnitude times e^(−jπd/2) ∈ {−j, −1, +j, +1}
  const byDistance = new Float64Array(2 * n);
  const cycle = [
    [1, 0],
    [0, -1],
    [-1, 0],
    [0, 1],
  ];
  let rowBound = rho;
  for (let d = 1; d < n; d++) {
    // (d − 1)·F is 0·∞ for neighbours when F = ∞, hence the separate case
    const mag = d === 1 ? dbToAmplitude(c) : fall === Infinity ? 0 : dbToAmplitude(c + (d - 1) * fall);
    byDistance[2 * d] = mag * cycle[d % 4][0];
    byDistance[2 * d + 1] = mag * cycle[d % 4][1];
    rowBound += 2 * mag;
  }
  const m = zeroMatrix(n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const d = Math.abs(i - j);
      m[2 * (i * n + j)] = d === 0 ? rho : byDistance[2 * d];
      m[2 * (i * n + j) + 1] = d === 0 ? 0 : byDistance[2 * d + 1];
    }
  }
  // σ_max ≤ largest absolute row sum for a symmetric matrix; the Cholesky test only when that bound fails.
  if (rowBound > 1 && !powerGainBelow(m, n, 1 + 1e-12)) {
    const sigma = largestSingularValue(m, n, 1e-8);
    throw r.error(
      "coupling_db",
      `coupling ${c} dB (fall-off ${fall === Infinity ? "∞" : fall} dB per element) with return loss ${rl} dB describes an active array ` +
        `(largest singular value ${sigma.toFixed(6)} > 1); expected weaker coupling (larger coupling_db or coupling_falloff_db) or a larger return_loss_db`,
    );
  }
  return { s: broadcastMatrix(m, n, nf), warnings: [] };
}
