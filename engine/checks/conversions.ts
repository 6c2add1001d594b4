// Reflection-coefficient conversions (common practice): VSWR = (1+|Γ|)/(1−|Γ|), RL = −20·log10|Γ|,
// mismatch loss ML = −10·log10(1−|Γ|²); dB of magnitudes and dBm of watts.
import { DB_FLOOR } from "./types";

/**
 * 20·log10 of a magnitude, floored at DB_FLOOR (−400 dB) so that zero stays finite.
 * @param mag magnitude, ≥ 0 (linear)
 * @returns dB
 * @example db20(0.1) // −20
 */
export function db20(mag: number): number {
  if (!(mag > 1e-20)) return DB_FLOOR;
  return 20 * Math.log10(mag);
}

/**
 * Magnitude of the complex number re + j·im, overflow-safe (Math.hypot).
 * @example magnitude(3, 4) // 5
 */
export function magnitude(re: number, im: number): number {
  return Math.hypot(re, im);
}

/**
 * VSWR of a reflection magnitude: (1+|Γ|)/(1−|Γ|). |Γ| ≥ 1 gives Infinity.
 * @param gammaMag |Γ|, linear
 * @example vswrFromGamma(1 / 3) // 2
 */
export function vswrFromGamma(gammaMag: number): number {
  if (gammaMag >= 1) return Infinity;
  return (1 + gammaMag) / (1 - gammaMag);
}

/**
 * Reflection magnitude of a VSWR: (VSWR−1)/(VSWR+1).
 * @param vswr ≥ 1
 * @example gammaFromVswr(2) // 1/3
 */
export function gammaFromVswr(vswr: number): number {
  if (!(vswr >= 1)) throw new RangeError(`VSWR must be at least 1, got ${vswr}`);
  if (vswr === Infinity) return 1;
  return (vswr - 1) / (vswr + 1);
}

/**
 * Return loss in dB of a reflection magnitude: −20·log10|Γ| (a perfect match gives 400 dB, see DB_FLOOR).
 * @example returnLossDb(0.1) // 20
 */
export function returnLossDb(gammaMag: number): number {
  return -db20(gammaMag);
}

/**
 * Reflection magnitude of a return loss in dB: 10^(−RL/20).
 * @example gammaFromReturnLoss(20) // 0.1
 */
export function gammaFromReturnLoss(returnLossDb: number): number {
  return Math.pow(10, -returnLossDb / 20);
}

/**
 * Mismatch loss in dB: −10·log10(1 − |Γ|²), the share of available power reflected by a mismatch.
 * @example mismatchLossDb(1 / 3) // 0.5115
 */
export function mismatchLossDb(gammaMag: number): number {
  if (gammaMag >= 1) return Infinity;
  return -10 * Math.log10(1 - gammaMag * gammaMag);
}

/**
 * Watts of a power in dBm: 10^((dBm − 30)/10).
 * @example wattsFromDbm(30) // 1
 */
export function wattsFromDbm(dbm: number): number {
  return Math.pow(10, (dbm - 30) / 10);
}

/**
 * dBm of a power in watts, floored at DB_FLOOR + 30 for zero.
 * @example dbmFromWatts(1) // 30
 */
export function dbmFromWatts(watts: number): number {
  if (!(watts > 1e-40)) return DB_FLOOR + 30;
  return 10 * Math.log10(watts) + 30;
}
