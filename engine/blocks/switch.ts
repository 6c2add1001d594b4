/**
 * Single-pole n-throw switch: port 1 common, ports 2…n+1 the throws, `state` s ∈ 1…n selects port s+1.
 *
 * With t = 10^(−IL/20) and ι = 10^(−ISO/20), all real (phases: this model's documented choice):
 * - common ↔ selected throw: S = t (docs/blocks.md: real); common and selected throw matched;
 * - common ↔ each unselected throw: +ι (isolation = isolation_db);
 * - selected throw ↔ each unselected throw: −ι (isolation = isolation_db: the leak crosses one open
 *   switching element, like the common-to-throw leak);
 * - unselected ↔ unselected throw: ±ι² (isolation = 2 × isolation_db, two open elements in the path);
 *   sign + when absorptive, − when reflective;
 * - off_state absorptive: unselected throws matched (S = 0 on the diagonal);
 *   off_state reflective: unselected throws reflect Γ = +t (real), what the closed switching element
 *   passes when the selected path is lossless; Γ → 1 as IL → 0.
 * The opposite signs of the common and selected-throw leakage are chosen so that the columns of the
 * reflective switch without off↔off terms (exactly the SPDT) are orthogonal and σ_max² = t² + 2(n−1)ι²;
 * these choices keep the most transmission once passivity is enforced. Passive for every legal value: when
 * t and the leakage together exceed the energy balance (for example IL = 0 with finite isolation),
 * the selected path (and the reflective Γ with it) is reduced by passivate and a warning says by how
 * much; the leakage stays as entered. Isolation is never reported better than entered: when the leakage
 * alone would be active (many throws with very little isolation, e.g. 8 throws at 3 dB), no passive switch
 * has it and the block is refused, naming isolation_db and the least isolation that works for that many
 * throws, rather than scaled down. Lossless: the reflective switch with ISO = ∞ and IL = 0.
 * Reciprocal.
 */
import type { ParamReader } from "./params";
import { dbToAmplitude } from "./params";
import { broadcastMatrix, setEntry, setPair, zeroMatrix } from "./cmatrix";
import { largestSingularValue, passivate, powerGainBelow } from "./passivity";
import { passivityWarnings, type ModelOutput } from "./model";
import { EngineInputError } from "../types";

/**
 * The selected throw (1…n) of a switch block: `state` on the block, default 1.
 *
 * @example
 * switchState("SW1", 3, 2); // out of range → EngineInputError "block SW1, parameter state: …"
 */
export function switchState(blockId: string, state: unknown, throws: number): number {
  if (state === undefined || state === null) return 1;
  if (typeof state !== "number" || !Number.isInteger(state) || state < 1 || state > throws) {
    throw new EngineInputError(
      `block ${blockId}, parameter state`,
      `expected the selected throw as an integer from 1 to ${throws} (state 1 connects the common port 1 to port 2), got ${JSON.stringify(state)}`,
    );
  }
  return state;
}

/**
 * Switch S over `nf` frequencies, (throws + 1) ports.
 *
 * @example
 * evaluateSwitch(reader, 2, 201); // throws 2, state 2 → S31 = 10^(−IL/20), S21 = 10^(−ISO/20)
 */
export function evaluateSwitch(r: ParamReader, state: unknown, nf: number): ModelOutput {
  const throws = r.number("throws");
  const sel = switchState(r.blockId, state, throws);
  const t = dbToAmplitude(r.number("insertion_loss_db"));
  const iota = dbToAmplitude(r.number("isolation_db"));
  const reflective = r.choice<"absorptive" | "reflective">("off_state") === "reflective";
  const n = throws + 1;
  const tm = zeroMatrix(n);
  const pm = leakage(throws, sel, reflective, iota);
  setPair(tm, n, 0, sel, t, 0);
  for (let k = 1; k <= throws; k++) {
    if (k !== sel && reflective) setEntry(tm, n, k, k, t, 0);
  }
  if (!powerGainBelow(pm, n, 1)) {
    const sigma = largestSingularValue(pm, n, 1e-8);
    throw r.error(
      "isolation_db",
      `${r.number("isolation_db")} dB isolation on a ${throws}-throw switch leaks more power than enters it (largest singular value ` +
        `of the leakage alone ${sigma.toFixed(6)} > 1), so no passive switch has it; expected at least ` +
        `${leastIsolationDb(throws, sel, reflective).toFixed(2)} dB for ${throws} throws`,
    );
  }
  const res = passivate(tm, pm, n);
  return { s: broadcastMatrix(res.s, n, nf), warnings: passivityWarnings(r.blockId, res, "isolation_db") };
}

/** The leakage matrix of a switch (every term but the selected path and the reflective Γ) for leakage ι. */
function leakage(throws: number, sel: number, reflective: boolean, iota: number): Float64Array {
  const n = throws + 1;
  const pm = zeroMatrix(n);
  for (let k = 1; k <= throws; k++) {
    if (k === sel) continue;
    setPair(pm, n, 0, k, iota, 0);
    setPair(pm, n, sel, k, -iota, 0);
    for (let j = k + 1; j <= throws; j++) {
      if (j === sel) continue;
      setPair(pm, n, j, k, reflective ? -iota * iota : iota * iota, 0);
    }
  }
  return pm;
}

/**
 * Least isolation (dB, rounded up to 0.01 dB) whose leakage alone is passive, by bisection: every entry of the
 * leakage grows with ι, and so does its largest singular value.
 */
function leastIsolationDb(throws: number, sel: number, reflective: boolean): number {
  let lo = 0; // active
  let hi = 100; // passive
  for (let it = 0; it < 40; it++) {
    const mid = 0.5 * (lo + hi);
    if (powerGainBelow(leakage(throws, sel, reflective, dbToAmplitude(mid)), throws + 1, 1)) hi = mid;
    else lo = mid;
  }
  return Math.ceil(hi * 100) / 100;
}
