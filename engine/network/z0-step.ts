// Junction of two real reference impedances as a lossless two-port in power waves (Kurokawa, "Power
// waves and the scattering matrix", IEEE Trans. MTT 13(2), 1965; for real Z0 the step from Z1 to Z2 has
// S11 = (Z2 − Z1)/(Z2 + Z1), S22 = −S11, S21 = S12 = 2√(Z1·Z2)/(Z1 + Z2) — Pozar, Microwave Engineering,
// 4th ed., §2.3 and §4.3, "from memory").

/**
 * Reflection ρ seen from a port's own Z0 (outer side) looking into the system Z0, and the transmission
 * t = √(1 − ρ²) of the step.
 *
 * @param outerZ0 the system port's own Z0, Ω (real, > 0)
 * @param systemZ0 the system reference Z0, Ω (real, > 0)
 * @returns { rho, t } (dimensionless, real)
 * @example z0Step(75, 50) // { rho: −0.2, t: 0.9798 }
 */
export function z0Step(outerZ0: number, systemZ0: number): { rho: number; t: number } {
  const rho = (systemZ0 - outerZ0) / (systemZ0 + outerZ0);
  const t = (2 * Math.sqrt(outerZ0 * systemZ0)) / (outerZ0 + systemZ0);
  return { rho, t };
}
