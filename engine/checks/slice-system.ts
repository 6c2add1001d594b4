// A prepared system cut down to some plan points, so that one-frequency what-ifs cost one frequency.
import type { PreparedSystem, SData } from "../types";

/**
 * Copies the S of n-port stack `s` at plan indices `ks` into a new stack.
 * @param s S stack (n ports, nf points)
 * @param ks plan indices to keep, in the order wanted
 * @returns SData with nf = ks.length
 * @example sliceS(block.s, [3]).nf // 1
 */
export function sliceS(s: SData, ks: readonly number[]): SData {
  const nn = 2 * s.n * s.n;
  const data = new Float64Array(nn * ks.length);
  ks.forEach((k, q) => data.set(s.data.subarray(k * nn, (k + 1) * nn), q * nn));
  return { n: s.n, nf: ks.length, data };
}

/**
 * The same system (blocks, links, ports) evaluated only at plan indices `ks`.
 * @param sys prepared system
 * @param ks plan indices to keep
 * @returns a PreparedSystem sharing the scenario and index maps, with sliced block S and frequencies
 * @example solveSystem(sliceSystem(sys, [k])) // composite at one frequency
 */
export function sliceSystem(sys: PreparedSystem, ks: readonly number[]): PreparedSystem {
  return {
    ...sys,
    frequencies: Float64Array.from(ks, (k) => sys.frequencies[k]),
    blocks: sys.blocks.map((b) => ({ ...b, s: sliceS(b.s, ks) })),
  };
}
