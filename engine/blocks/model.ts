/**
 * What every block model returns, and the warning written when passivity had to be enforced.
 */
import type { SData } from "../types";
import type { Passivated } from "./passivity";

/** S over the plan (referenced to the real system Z0 at every port) and messages for the user. */
export type ModelOutput = { s: SData; warnings: string[] };

/**
 * Warnings that describe what {@link passivate} changed, empty when nothing changed.
 *
 * @example
 * passivityWarnings("SPL", res, "isolation_db"); // ["block SPL: transmission reduced by 0.46 dB …"]
 */
export function passivityWarnings(blockId: string, res: Passivated, parasitic: string): string[] {
  const out: string[] = [];
  if (res.parasiticScale < 1) {
    const db = -20 * Math.log10(res.parasiticScale);
    out.push(
      `block ${blockId}: the entered ${parasitic} describe an active part; every term reduced by ${db.toFixed(3)} dB to keep it passive`,
    );
    return out;
  }
  if (res.transmissionScale < 1 - 1e-12) {
    const db = res.transmissionScale > 0 ? (-20 * Math.log10(res.transmissionScale)).toFixed(3) : "∞";
    out.push(
      `block ${blockId}: transmission reduced by ${db} dB to keep the part passive with the entered ${parasitic}`,
    );
  }
  return out;
}
