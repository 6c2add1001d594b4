/**
 * Whether a block is active (may add energy): built-in models say so themselves (the amplifier); a measured part
 * is active when its scenario block says `active: true`, or, when the block says nothing, when its data shows
 * gain. Active blocks are not expected to be passive or reciprocal and get the stability check.
 */
import { formatHz } from "../format";
import { maxSingularValue } from "../linalg";
import type { BlockActivity, BlockSpec, EvaluatedBlock, SData } from "../types";

/**
 * Gain, in dB of the largest singular value of S, above which measured data counts as active on its own.
 * Calibration error makes passive data exceed σmax = 1 by hundredths of a dB (a thru's transmission
 * uncertainty on a vector network analyser is typically ±0.05–0.1 dB; common practice, from memory): those
 * excesses stay passivity warnings. A whole decibel of gain is a device that amplifies.
 */
export const ACTIVE_GAIN_DB = 1;

/** Largest singular value of S over frequency and where. */
export function largestGain(s: SData, frequencies: ArrayLike<number>): { maxSingular: number; atHz: number } {
  let maxSingular = 0;
  let atHz = frequencies[0];
  for (let k = 0; k < s.nf; k++) {
    const sv = maxSingularValue(s, k);
    if (sv > maxSingular) {
      maxSingular = sv;
      atHz = frequencies[k];
    }
  }
  return { maxSingular, atHz };
}

/**
 * The activity that a part's largest singular value shows, or null below ACTIVE_GAIN_DB. Shared by the scenario
 * engine and the parts library, so that both give the same reason.
 * @param maxSingular largest singular value of S over the data
 * @param atHz where it occurs, Hz
 * @example gainActivity(3.162, 2e9)?.reason // "its data shows gain: largest singular value 3.162 (10.00 dB) at 2 GHz"
 */
export function gainActivity(maxSingular: number, atHz: number): BlockActivity | null {
  if (!(maxSingular > Math.pow(10, ACTIVE_GAIN_DB / 20))) return null;
  const db = 20 * Math.log10(maxSingular);
  return { source: "data", reason: `its data shows gain: largest singular value ${maxSingular.toFixed(3)} (${db.toFixed(2)} dB) at ${formatHz(atHz)}` };
}

// The largest gain of each parsed part, computed once: parts are parsed once per text (engine/system/parts.ts)
// and prepared again for every state of a sweep.
const gainOfPart = new WeakMap<object, { maxSingular: number; atHz: number }>();

/**
 * Activity of a touchstone block: `active: true` marks it (reason: the scenario says so), `active: false` keeps it
 * passive whatever its data shows (passivity is then checked and warned about), and no flag lets its data decide:
 * all of its data, as the file gives it, so that the block and the parts library agree whatever the plan covers.
 * @param block the block spec
 * @param part the parsed part data (S as in the file, frequencies in Hz)
 * @example partActivity({ id: "LNA", kind: "touchstone", file: "lna.s2p" }, part)?.source // "data"
 */
export function partActivity(block: BlockSpec, part: { s: SData; frequencies: Float64Array }): BlockActivity | null {
  if (block.active === true) return { source: "scenario", reason: "marked active in the scenario (active: true)" };
  if (block.active === false) return null;
  let gain = gainOfPart.get(part);
  if (!gain) {
    gain = largestGain(part.s, part.frequencies);
    gainOfPart.set(part, gain);
  }
  return gainActivity(gain.maxSingular, gain.atHz);
}

/**
 * Whether an evaluated block is active: it carries an activity, or it is a built-in model that is not passive
 * (blocks evaluated before `active` existed, or built by hand in tests, still say so through their traits).
 * @example isActiveBlock(sys.blocks[0]) // true for an amplifier
 */
export function isActiveBlock(b: Pick<EvaluatedBlock, "active" | "kind" | "traits">): boolean {
  return b.active !== undefined || (b.kind !== "touchstone" && !b.traits.passive);
}
