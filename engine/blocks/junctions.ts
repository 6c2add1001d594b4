/**
 * Three-port junctions: equal-split Wilkinson splitter, tee of three equal lines, circulator
 * (Pozar, Microwave Engineering, 4th ed., sec. 7.1–7.3 for the ideal matrices, section numbers from
 * memory; matrices as written in docs/blocks.md).
 *
 * - splitter: S = (−j/√2)·l·[[0,1,1],[1,0,0],[1,0,0]], l = 10^(−excess/20); finite isolation adds
 *   S23 = S32 = −j·10^(−ISO/20) (same phase as the transmissions). A matched reciprocal three-port with
 *   isolation ε needs 2|S21|² ≤ 1 − ε (even/odd-mode analysis of this matrix: σ_max = ε/2 + √(ε²/4 + 2|S21|²)),
 *   so finite isolation costs transmission; passivate finds exactly that. Lossless ideal: no (the
 *   Wilkinson absorbs the odd mode in its resistor, so SᴴS ≠ I even when ideal).
 * - tee: S = (1/3)[[−1,2,2],[2,−1,2],[2,2,−1]], lossless (SᴴS = I), reciprocal.
 * - circulator: S21 = S32 = S13 = 10^(−IL/20) (real); reverse S12 = S23 = S31 = ±ι, ι = 10^(−ISO/20), and
 *   diagonal ∓ρ, ρ = 10^(−RL/20): the larger of the two parasitic terms takes the phase 180°, the other 0°
 *   (this model's documented choice). Why: S = ρ₁·I + κ·C + ι₁·Cᵀ with C the cyclic shift is circulant, hence
 *   normal, so its singular values are the moduli of its eigenvalues λ_k = ρ₁ + κ·w^k + ι₁·w^(−k), w = e^(j2π/3)
 *   (circulant matrices are diagonalised by the discrete Fourier transform; Davis, Circulant Matrices, 1979).
 *   With no return loss, |λ_k|² = κ² + ι² + 2κι·cos(φ − 4πk/3): three angles 120° apart, so the largest cosine
 *   is at least 1/2, reached with φ = 180° (κ² + ι² + κι ≤ 1), while φ = 0° gives κ + ι ≤ 1 — for IL 0 and
 *   isolation 20 dB, passivity then costs 0.480 dB instead of 0.915 dB; with return loss alone the same holds
 *   for ρ. With both terms, a search over both phases in 15° steps (numpy, done once for this choice) finds the
 *   rule within 0.01 dB of the best pair whenever isolation and return loss are both 20 dB or more, or either
 *   is ∞; for poorer entries (both below 20 dB) it may cost more than needed, at most 2.3 dB (isolation 6 dB,
 *   return loss 10 dB). Lossless when IL = 0 and ISO = RL = ∞.
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
  // the larger parasitic term in antiphase with the transmission (see the header): least transmission lost
  const leakSign = iso > rho ? -1 : 1;
  for (let k = 0; k < 3; k++) {
    const next = (k + 1) % 3;
    setEntry(t, 3, next, k, a, 0); // forward k → k+1
    setEntry(p, 3, k, next, leakSign * iso, 0); // reverse k+1 → k
    setEntry(p, 3, k, k, -leakSign * rho, 0);
  }
  const res = passivate(t, p, 3);
  return { s: broadcastMatrix(res.s, 3, nf), warnings: passivityWarnings(r.blockId, res, "isolation_db and return_loss_db") };
}
