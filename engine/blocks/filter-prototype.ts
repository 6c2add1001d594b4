/**
 * Element values g0…g_{N+1} of the maximally flat and equal-ripple low-pass prototypes
 * (Matthaei, Young and Jones, Microwave Filters, Impedance-Matching Networks, and Coupling Structures,
 * 1964, sec. 4.05; Pozar, Microwave Engineering, 4th ed., sec. 8.3 — equation numbers from memory).
 */
import { EngineInputError } from "../types";

/** Prototype family. */
export type FilterFamily = "butterworth" | "chebyshev";

/**
 * Prototype element values [g0, g1, …, gN, g_{N+1}] for a source of 1 Ω and cutoff 1 rad/s.
 *
 * Butterworth: g_k = 2 sin((2k − 1)π/(2N)), g0 = g_{N+1} = 1.
 * Chebyshev (ripple L_r dB): β = ln coth(L_r/17.37), γ = sinh(β/(2N)), a_k = sin((2k − 1)π/(2N)),
 * b_k = γ² + sin²(kπ/N), g1 = 2a1/γ, g_k = 4a_{k−1}a_k/(b_{k−1}g_{k−1}),
 * g_{N+1} = 1 (N odd) or coth²(β/4) (N even); 17.37 is 40/ln 10, used exactly here.
 *
 * @param family butterworth | chebyshev
 * @param order N, integer 1…15
 * @param rippleDb Chebyshev passband ripple in dB (> 0); ignored for Butterworth
 * @example
 * lowpassPrototype("butterworth", 3); // [1, 1, 2, 1, 1]
 * lowpassPrototype("chebyshev", 3, 0.5); // [1, 1.5963, 1.0967, 1.5963, 1]
 */
export function lowpassPrototype(family: FilterFamily, order: number, rippleDb = 0.5): number[] {
  if (!Number.isInteger(order) || order < 1 || order > 15) {
    throw new EngineInputError("filter prototype, order", `expected an integer from 1 to 15, got ${order}`);
  }
  const n = order;
  const g = new Array<number>(n + 2);
  g[0] = 1;
  if (family === "butterworth") {
    for (let k = 1; k <= n; k++) g[k] = 2 * Math.sin(((2 * k - 1) * Math.PI) / (2 * n));
    g[n + 1] = 1;
    return g;
  }
  if (family !== "chebyshev") {
    throw new EngineInputError("filter prototype, family", `expected "butterworth" or "chebyshev", got ${JSON.stringify(family)}`);
  }
  if (!(rippleDb > 0) || !Number.isFinite(rippleDb)) {
    throw new EngineInputError("filter prototype, ripple_db", `expected a ripple in dB > 0, got ${rippleDb}`);
  }
  const x = (rippleDb * Math.LN10) / 40; // L_r / 17.37
  const beta = Math.log(1 / Math.tanh(x));
  const gamma = Math.sinh(beta / (2 * n));
  const a = (k: number) => Math.sin(((2 * k - 1) * Math.PI) / (2 * n));
  const b = (k: number) => gamma * gamma + Math.sin((k * Math.PI) / n) ** 2;
  g[1] = (2 * a(1)) / gamma;
  for (let k = 2; k <= n; k++) g[k] = (4 * a(k - 1) * a(k)) / (b(k - 1) * g[k - 1]);
  g[n + 1] = n % 2 === 1 ? 1 : 1 / Math.tanh(beta / 4) ** 2;
  return g;
}
