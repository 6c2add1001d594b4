/**
 * Three-port junctions: equal-split Wilkinson splitter, tee of three equal lines, circulator
 * (Pozar, Microwave Engineering, 4th ed., sec. 7.1–7.3 for the ideal matrices, section numbers from
 * memory; matrices as written in DESIGN.md).
 *
 * - splitter: S = (−j/√2)·l·[[0,1,1],[1,0,0],[1,0,0]], l = 10^(−excess/20); finite isolation adds
 *   S23 = S32 = −j·10^(−ISO/20) (same phase as the transmissions). A matched reciprocal three-port with
 *   isolation ε needs 2|S21|² ≤ 1 − ε (even/odd-mode analysis of this matrix: σ_max = ε/2 + √(ε²/4 + 2|S21|²)),
 *   so finite isolation costs transmission; passivate finds exactly that. Lossless ideal: no (the
 *   Wilkinson absorbs the odd mode in its resistor, so SᴴS ≠ I even when ideal).
 * - tee: S = (1/3)[[−1,2,2],[2,−1,2],[2,2,−1]], lossless (SᴴS = I), reciprocal.
 * - circulator: S21 = S32 = S13 = 10^(−IL/20) (real), reverse S12 = S23 = S31 = +10^(−ISO/20),
 *   diagonal −10^(−RL/20) (phases 0° and 180°: this model's documented choice, the pair that keeps the
 *   most transmission once passivity is enforced). Lossless when IL = 0 and ISO = RL = ∞.
 */
import type { ParamReader } from "./params";
import { dbToAmplitude } from "./params";
import { broadcastMatrix, setEntry, setPair, zeroMatrix } from "./cmatrix";
import { passivate } from "./passivity";
import { passivityWarnings, type ModelOutput } from "./model";

/**
 * Splitter S over `nf` frequencies.
 *
 * @example
 * evaluateSplitter(reader, 201); // ideal: S21 = S31 = −j/√2
 */
export function evaluateSplitter(r: ParamReader, nf: number): ModelOutput {
  const a = dbToAmplitude(r.number("excess_loss_db")) * Math.SQRT1_2;
  const iso = dbToAmplitude(r.number("isolation_db"));
  const t = zeroMatrix(3);
  const p = zeroMatrix(3);
  setPair(t, 3, 0, 1, 0, -a);
  setPair(t, 3, 0, 2, 0, -a);
  setPair(p, 3, 1, 2, 0, -iso);
  const res = passivate(t, p, 3);
  return { s: broadcastMatrix(res.s, 3, nf), warnings: passivityWarnings(r.blockId, res, "isolation_db") };
}

/**
 * Tee S over `nf` frequencies (no parameters).
 *
 * @example
 * evaluateTee(201).data[0]; // −1/3
 */
export function evaluateTee(nf: number): ModelOutput {
  const m = zeroMatrix(3);
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) setEntry(m, 3, i, j, i === j ? -1 / 3 : 2 / 3, 0);
  return { s: broadcastMatrix(m, 3, nf), warnings: [] };
}

/**
 * Circulator S over `nf` frequencies; ports 1→2→3→1.
 *
 * @example
 * evaluateCirculator(reader, 201); // insertion_loss_db 0.3 → S21 = S32 = S13 ≈ 0.966
 */
export function evaluateCirculator(r: ParamReader, nf: number): ModelOutput {
  const a = dbToAmplitude(r.number("insertion_loss_db"));
  const iso = dbToAmplitude(r.number("isolation_db"));
  const rho = dbToAmplitude(r.number("return_loss_db"));
  const t = zeroMatrix(3);
  const p = zeroMatrix(3);
  for (let k = 0; k < 3; k++) {
    const next = (k + 1) % 3;
    setEntry(t, 3, next, k, a, 0); // forward k → k+1
    setEntry(p, 3, k, next, iso, 0); // reverse k+1 → k
    setEntry(p, 3, k, k, -rho, 0);
  }
  const res = passivate(t, p, 3);
  return { s: broadcastMatrix(res.s, 3, nf), warnings: passivityWarnings(r.blockId, res, "isolation_db and return_loss_db") };
}
