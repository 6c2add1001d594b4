// Per-port reference impedances as one interleaved complex vector (the Z0Vector shape of engine/types.ts).
import { EngineInputError, type Z0Vector } from "../types";

/**
 * Builds a Z0Vector (length 2n, interleaved re/im, Ω) from the usual ways of writing reference impedances.
 *
 * - a number: every port has that real impedance;
 * - n numbers: one real impedance per port;
 * - n pairs [re, im]: one complex impedance per port.
 *
 * Throws EngineInputError when the count does not match `n`, a value is not finite, or a real part is
 * not positive (power waves and pseudo-waves both need Re Z0 > 0).
 *
 * @example
 * z0Vector(50, 2);                 // Float64Array [50, 0, 50, 0]
 * z0Vector([50, 75], 2);           // Float64Array [50, 0, 75, 0]
 * z0Vector([[50, 0], [30, -10]], 2); // Float64Array [50, 0, 30, -10]
 */
export function z0Vector(values: number | number[] | [number, number][], n: number): Z0Vector {
  if (!Number.isInteger(n) || n < 1) throw new EngineInputError("z0", `port count must be a positive integer, got ${n}`);
  const out = new Float64Array(2 * n);
  if (typeof values === "number") {
    for (let i = 0; i < n; i++) out[2 * i] = values;
  } else {
    if (values.length !== n) {
      throw new EngineInputError("z0", `expected ${n} reference impedances (one per port), got ${values.length}`);
    }
    for (let i = 0; i < n; i++) {
      const v = values[i];
      if (typeof v === "number") {
        out[2 * i] = v;
      } else {
        out[2 * i] = v[0];
        out[2 * i + 1] = v[1];
      }
    }
  }
  checkZ0(out, n, "z0");
  return out;
}

/** Throws EngineInputError unless `z0` has 2n finite entries with positive real parts. */
export function checkZ0(z0: Z0Vector, n: number, where: string): void {
  if (z0.length !== 2 * n) {
    throw new EngineInputError(where, `reference impedance vector has ${z0.length / 2} ports, expected ${n}`);
  }
  for (let i = 0; i < n; i++) {
    const re = z0[2 * i];
    const im = z0[2 * i + 1];
    if (!Number.isFinite(re) || !Number.isFinite(im)) {
      throw new EngineInputError(where, `reference impedance of port ${i + 1} is not finite (${re}, ${im})`);
    }
    if (!(re > 0)) {
      throw new EngineInputError(where, `reference impedance of port ${i + 1} must have a positive real part, got ${re}${im < 0 ? "-" : "+"}j${Math.abs(im)} Ω`);
    }
  }
}
