/**
 * Four-port couplers: directional coupler, 90° hybrid, 180° hybrid (Pozar, Microwave Engineering,
 * 4th ed., sec. 7.1 for the directional-coupler matrix, sec. 7.5 and 7.8 for the quadrature and
 * rat-race hybrids, section numbers from memory; matrices exactly as in docs/blocks.md).
 *
 * - coupler: S = l·[[0,α,jβ,0],[α,0,0,jβ],[jβ,0,0,α],[0,jβ,α,0]], β = 10^(−C/20), α = √(1−β²),
 *   l = 10^(−excess/20). Finite directivity D adds the isolated-port leakage
 *   S41 = S14 = S23 = S32 = jβ·10^(−D/20) (isolation = C + D, common practice), in phase with the
 *   coupled wave: of the phases tried (0°…315° in 45° steps) this one keeps the most transmission.
 * - hybrid90: S = −(l/√2)[[0,j,1,0],[j,0,0,1],[1,0,0,j],[0,1,j,0]]; finite isolation adds
 *   S41 = S14 = S23 = S32 = −10^(−ISO/20).
 * - hybrid180: S = −(j·l/√2)[[0,1,1,0],[1,0,0,−1],[1,0,0,1],[0,−1,1,0]]; finite isolation adds
 *   S41 = S14 = S23 = S32 = −j·10^(−ISO/20).
 * The leakage phases are this model's documented choice (real/imaginary multiples of the ideal
 * prefactor keep the most transmission). A matched reciprocal lossless four-port cannot leak to its
 * isolated port (Pozar sec. 7.1), so finite directivity or isolation costs transmission: passivate
 * reduces α, β (or the hybrid's transmissions) just enough and a warning says by how much; the
 * leakage stays exactly as entered. For the coupler that reduction lowers the coupled wave while the
 * isolated-port leakage stays, so its directivity (isolation − coupling) falls by the same amount: the
 * warning then gives the coupling and directivity the model now has next to the entered ones. All three are lossless (SᴴS = I) when ideal with no excess loss.
 */
import type { ParamReader } from "./params";
import { dbToAmplitude } from "./params";
import { broadcastMatrix, setPair, zeroMatrix } from "./cmatrix";
import { passivate } from "./passivity";
import { passivityWarnings, type ModelOutput } from "./model";

/**
 * Directional coupler S over `nf` frequencies.
 *
 * @example
 * evaluateCoupler(reader, 201); // coupling_db 10 → S31 = j·0.316, S21 ≈ 0.949
 */
export function evaluateCoupler(r: ParamReader, nf: number): ModelOutput {
  const beta = dbToAmplitude(r.number("coupling_db"));
  const alpha = Math.sqrt(1 - beta * beta);
  const l = dbToAmplitude(r.number("excess_loss_db"));
  const leak = beta * dbToAmplitude(r.number("directivity_db"));
  const t = zeroMatrix(4);
  const p = zeroMatrix(4);
  setPair(t, 4, 0, 1, l * alpha, 0);
  setPair(t, 4, 2, 3, l * alpha, 0);
  setPair(t, 4, 0, 2, 0, l * beta);
  setPair(t, 4, 1, 3, 0, l * beta);
  setPair(p, 4, 0, 3, 0, leak);
  setPair(p, 4, 1, 2, 0, leak);
  const res = passivate(t, p, 4);
  const warnings = passivityWarnings(r.blockId, res, "directivity_db");
  if (res.parasiticScale === 1 && res.transmissionScale < 1 - 1e-12 && leak > 0) {
    // coupling |S31| = κ·l·β while |S41| stays β·10^(−D/20): both coupling and directivity move by −20·log10 κ
    const shift = -20 * Math.log10(res.transmissionScale);
    const c = r.number("coupling_db") + r.number("excess_loss_db");
    const d = r.number("directivity_db");
    warnings.push(
      `block ${r.blockId}: coupling is now ${(c + shift).toFixed(3)} dB and directivity ${(d - shift).toFixed(3)} dB ` +
        `(as entered, with excess loss: ${c.toFixed(3)} dB and ${d.toFixed(3)} dB); the isolated-port leakage stays as entered`,
    );
  }
  return { s: broadcastMatrix(res.s, 4, nf), warnings };
}

/**
 * 90° hybrid S over `nf` frequencies.
 *
 * @example
 * evaluateHybrid90(reader, 201); // ideal: S21 = −j/√2, S31 = −1/√2
 */
export function evaluateHybrid90(r: ParamReader, nf: number): ModelOutput {
  const a = dbToAmplitude(r.number("excess_loss_db")) * Math.SQRT1_2;
  const iso = dbToAmplitude(r.number("isolation_db"));
  const t = zeroMatrix(4);
  const p = zeroMatrix(4);
  setPair(t, 4, 0, 1, 0, -a);
  setPair(t, 4, 0, 2, -a, 0);
  setPair(t, 4, 1, 3, -a, 0);
  setPair(t, 4, 2, 3, 0, -a);
  setPair(p, 4, 0, 3, -iso, 0);
  setPair(p, 4, 1, 2, -iso, 0);
  const res = passivate(t, p, 4);
  return { s: broadcastMatrix(res.s, 4, nf), warnings: passivityWarnings(r.blockId, res, "isolation_db") };
}

/**
 * 180° hybrid S over `nf` frequencies.
 *
 * @example
 * evaluateHybrid180(reader, 201); // ideal: S21 = S31 = −j/√2, S24 = +j/√2, S34 = −j/√2
 */
export function evaluateHybrid180(r: ParamReader, nf: number): ModelOutput {
  const a = dbToAmplitude(r.number("excess_loss_db")) * Math.SQRT1_2;
  const iso = dbToAmplitude(r.number("isolation_db"));
  const t = zeroMatrix(4);
  const p = zeroMatrix(4);
  setPair(t, 4, 0, 1, 0, -a);
  setPair(t, 4, 0, 2, 0, -a);
  setPair(t, 4, 1, 3, 0, a);
  setPair(t, 4, 2, 3, 0, -a);
  setPair(p, 4, 0, 3, 0, -iso);
  setPair(p, 4, 1, 2, 0, -iso);
  const res = passivate(t, p, 4);
  return { s: broadcastMatrix(res.s, 4, nf), warnings: passivityWarnings(r.blockId, res, "isolation_db") };
}
