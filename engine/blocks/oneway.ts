/**
 * Isolator and amplifier: one-way two-ports, port 1 in, port 2 out.
 *
 * Isolator: S21 = 10^(−IL/20), S12 = 10^(−ISO/20), S11 = S22 = −10^(−RL/20) (real; the reflection
 * phase 180° and leakage phase 0° are this model's documented choice, the pair that keeps the most
 * transmission once passivity is enforced). Passive: when the entered figures would give σ_max(S) > 1
 * (for example 0 dB insertion loss with finite return loss), the forward transmission is reduced
 * (see passivate) and a warning says by how much. Never lossless: even the ideal isolator absorbs
 * everything that enters port 2.
 *
 * Amplifier: S21 = 10^(G/20), S12 = 10^(−REV/20), S11 = −10^(−RLin/20), S22 = −10^(−RLout/20);
 * active, not reciprocal, never scaled.
 */
import type { ParamReader } from "./params";
import { dbToAmplitude } from "./params";
import { broadcastMatrix, setEntry, zeroMatrix } from "./cmatrix";
import { passivate } from "./passivity";
import { passivityWarnings, type ModelOutput } from "./model";

/**
 * Isolator S over `nf` frequencies (frequency-independent).
 *
 * @example
 * evaluateIsolator(reader, 201); // insertion_loss_db 0.5, isolation_db 20 → S21 ≈ 0.944, S12 = 0.1
 */
export function evaluateIsolator(r: ParamReader, nf: number): ModelOutput {
  const t = zeroMatrix(2);
  const p = zeroMatrix(2);
  setEntry(t, 2, 1, 0, dbToAmplitude(r.number("insertion_loss_db")), 0);
  setEntry(p, 2, 0, 1, dbToAmplitude(r.number("isolation_db")), 0);
  const rho = dbToAmplitude(r.number("return_loss_db"));
  setEntry(p, 2, 0, 0, -rho, 0);
  setEntry(p, 2, 1, 1, -rho, 0);
  const res = passivate(t, p, 2);
  return { s: broadcastMatrix(res.s, 2, nf), warnings: passivityWarnings(r.blockId, res, "isolation_db and return_loss_db") };
}

/**
 * Amplifier S over `nf` frequencies (frequency-independent, active).
 *
 * @example
 * evaluateAmplifier(reader, 201); // gain_db 20 → S21 = 10
 */
export function evaluateAmplifier(r: ParamReader, nf: number): ModelOutput {
  const m = zeroMatrix(2);
  setEntry(m, 2, 1, 0, Math.pow(10, r.number("gain_db") / 20), 0);
  setEntry(m, 2, 0, 1, dbToAmplitude(r.number("reverse_isolation_db")), 0);
  setEntry(m, 2, 0, 0, -dbToAmplitude(r.number("input_return_loss_db")), 0);
  setEntry(m, 2, 1, 1, -dbToAmplitude(r.number("output_return_loss_db")), 0);
  return { s: broadcastMatrix(m, 2, nf), warnings: [] };
}
