/**
 * Attenuator and phase shifter: matched reciprocal two-ports, S21 = S12 = 10^(−L/20)·e^(−jφ)
 * (docs/blocks.md, "Conventions"; e^(+jωt), so a delay is a negative phase). Passive for L ≥ 0;
 * lossless when L = 0.
 */
import type { ParamReader } from "./params";
import { dbToAmplitude } from "./params";
import { broadcastMatrix, setPair, zeroMatrix } from "./cmatrix";
import type { ModelOutput } from "./model";

/**
 * The matched two-port S = [[0, t],[t, 0]] with t = 10^(−lossDb/20)·e^(−j·phaseDeg·π/180), over `nf` frequencies.
 *
 * @example
 * matchedTwoPort(6, 0, 1).data; // S21 = S12 ≈ 0.501, real
 */
export function matchedTwoPort(lossDb: number, phaseDeg: number, nf: number) {
  const t = dbToAmplitude(lossDb);
  const phi = (phaseDeg * Math.PI) / 180;
  const m = setPair(zeroMatrix(2), 2, 0, 1, t * Math.cos(phi), -t * Math.sin(phi));
  return broadcastMatrix(m, 2, nf);
}

/**
 * Attenuator: S21 = S12 = 10^(−loss_db/20), real (phase 0).
 *
 * @example
 * evaluateAttenuator(reader, 201); // loss_db 6 → S21 ≈ 0.501
 */
export function evaluateAttenuator(r: ParamReader, nf: number): ModelOutput {
  return { s: matchedTwoPort(r.number("loss_db"), 0, nf), warnings: [] };
}

/**
 * Phase shifter: S21 = S12 = 10^(−loss_db/20)·e^(−j·phase_deg), constant over frequency.
 *
 * @example
 * evaluatePhaseShifter(reader, 201); // phase_deg 90 → S21 = −j
 */
export function evaluatePhaseShifter(r: ParamReader, nf: number): ModelOutput {
  return { s: matchedTwoPort(r.number("loss_db"), r.number("phase_deg"), nf), warnings: [] };
}
