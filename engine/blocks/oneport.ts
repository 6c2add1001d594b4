/**
 * Load and antenna: a one-port reflection Γ, from return loss and phase or from an impedance
 * (Γ = (Z − Z0)/(Z + Z0), Pozar, Microwave Engineering, 4th ed., sec. 2.3). Passive for every legal
 * value (RL ≥ 0 dB, Re Z ≥ 0); lossless only when |Γ| = 1.
 */
import type { ParamReader } from "./params";
import { dbToAmplitude } from "./params";
import { broadcastMatrix } from "./cmatrix";
import type { ModelOutput } from "./model";

/**
 * Γ of a load or antenna (interleaved [re, im]) referenced to the real system Z0 (Ω).
 * Exactly one of `return_loss_db` (with optional `phase_deg`) or `impedance` must be given.
 *
 * @example
 * oneportReflection(reader, 50); // impedance [100, 0] → [1/3, 0]
 */
export function oneportReflection(r: ParamReader, z0: number): [number, number] {
  const z = r.complexOrUndefined("impedance");
  const hasRl = r.has("return_loss_db");
  if (z && hasRl) throw r.error("impedance", "give either return_loss_db (with phase_deg) or impedance, not both");
  if (z) {
    if (r.has("phase_deg")) throw r.error("phase_deg", "applies only with return_loss_db; the impedance already fixes the phase");
    // Γ = (Z − Z0)/(Z + Z0); |Z + Z0| ≥ Z0 > 0 because Re Z ≥ 0.
    const nr = z[0] - z0;
    const dr = z[0] + z0;
    const di = z[1];
    const den = dr * dr + di * di;
    return [(nr * dr + z[1] * di) / den, (z[1] * dr - nr * di) / den];
  }
  if (!hasRl) {
    throw r.error("return_loss_db", "required: expected return_loss_db in dB ≥ 0 (or null for matched), or impedance as [re, im] Ω");
  }
  const mag = dbToAmplitude(r.number("return_loss_db"));
  const phi = (r.number("phase_deg") * Math.PI) / 180;
  return [mag * Math.cos(phi), mag * Math.sin(phi)];
}

/**
 * S (1×1) of a load or antenna over `nf` frequencies; frequency-independent.
 *
 * @example
 * evaluateOneport(reader, 201, 50).s.data; // Γ repeated 201 times
 */
export function evaluateOneport(r: ParamReader, nf: number, z0: number): ModelOutput {
  const g = oneportReflection(r, z0);
  return { s: broadcastMatrix(new Float64Array(g), 1, nf), warnings: [] };
}
