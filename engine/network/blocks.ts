// Resolution of the S used for each block (scenario data or a caller's replacement) with input checks.

import { EngineInputError, type PreparedSystem, type SData } from "../types";

// Block S already scanned for non-finite values, with the data array that was scanned: a PreparedSystem's
// blocks (and a caller's replacement states) are solved many times over, and the scan reads every number.
// Block data is not modified in place once handed to the engine (the PreparedSystem contract); a new data
// array on the same SData object is scanned again.
const scanned = new WeakMap<SData, Float64Array>();

/**
 * The S of every block, with `replace` substituted by block id and shapes checked against the plan. Each
 * block's data is scanned for non-finite values the first time it is seen (remembered per SData object and
 * data array), so repeated solves of the same data do not read it again.
 *
 * @param sys prepared system
 * @param replace block id → S to use instead (same port count, same frequency count)
 * @returns one SData per block, in sys.blocks order
 * @throws EngineInputError on an unknown id, a shape mismatch or non-finite values
 * @example resolveBlockS(sys, { SW1: otherState }) // [s0, otherState, ...]
 */
export function resolveBlockS(sys: PreparedSystem, replace?: Record<string, SData>): SData[] {
  const nf = sys.frequencies.length;
  const out = sys.blocks.map((b) => b.s);
  if (replace) {
    for (const [id, s] of Object.entries(replace)) {
      const i = sys.blocks.findIndex((b) => b.id === id);
      if (i < 0) throw new EngineInputError(`replace.${id}`, `no block with id ${id}`);
      out[i] = s;
    }
  }
  out.forEach((s, i) => {
    const blk = sys.blocks[i];
    const expectedN = (i + 1 < sys.blockOffset.length ? sys.blockOffset[i + 1] : sys.blockPorts.length) - sys.blockOffset[i];
    if (s.n !== expectedN || s.nf !== nf || s.data.length !== 2 * nf * s.n * s.n) {
      throw new EngineInputError(`blocks.${blk.id}`, `S has shape ${s.n} ports × ${s.nf} frequencies (data length ${s.data.length}); expected ${expectedN} × ${nf}`);
    }
    const d = s.data;
    if (scanned.get(s) === d) return;
    // x·0 is NaN as soon as x is ±Infinity or NaN; four independent sums keep the loop from waiting on
    // the latency of one long chain of additions
    let p0 = 0;
    let p1 = 0;
    let p2 = 0;
    let p3 = 0;
    const whole = d.length - (d.length % 4);
    let j = 0;
    for (; j < whole; j += 4) {
      p0 += d[j] * 0;
      p1 += d[j + 1] * 0;
      p2 += d[j + 2] * 0;
      p3 += d[j + 3] * 0;
    }
    for (; j < d.length; j++) p0 += d[j] * 0;
    if (p0 + p1 + p2 + p3 !== 0) {
      const j = d.findIndex((v) => !Number.isFinite(v));
      throw new EngineInputError(`blocks.${blk.id}`, `S holds a non-finite value at frequency index ${Math.floor(j / (2 * s.n * s.n))}`);
    }
    scanned.set(s, d);
  });
  return out;
}
