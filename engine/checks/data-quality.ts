// Passivity (largest singular value of S ≤ 1), losslessness ‖SᴴS − I‖ and reciprocity max|S_ij − S_ji| of
// every block and of the composite (Pozar, Microwave Engineering 4th ed., §4.3, unitary and symmetric S).
import type { EvaluatedBlock, SData, Solution } from "../types";
import { maxSingularValue, reciprocityError, unitarityError } from "../linalg";
import { isActiveBlock } from "../system/activity";
import { bandIndices, formatHz } from "./band";
import type { Verdict } from "./types";

/** A built-in model or the composite may exceed σ = 1 or S = Sᵀ by this much (rounding) before failing. */
export const MODEL_TOLERANCE = 1e-9;
/** Measured data (touchstone parts) may exceed by this much before a warning. */
export const MEASURED_TOLERANCE = 1e-6;

export type QualityFigures = {
  /** block id, or "composite" */
  subject: string;
  kind: string;
  measured: boolean;
  /** why the block counts as active (model, scenario flag or gain in its data); null when it does not */
  activeReason: string | null;
  expectPassive: boolean;
  expectReciprocal: boolean;
  /** largest singular value of S over the band and where */
  maxSingular: number;
  maxSingularHz: number;
  /** max over the band of max_ij |(SᴴS − I)_ij| (0 = lossless) and where */
  unitarityError: number;
  unitarityHz: number;
  /** max over the band of max |S_ij − S_ji| and where */
  reciprocityError: number;
  reciprocityHz: number;
  /** frequencies where σ_max exceeds 1 beyond the tolerance (first 20) and how many */
  activeHz: number[];
  activeCount: number;
  /** frequencies where S ≠ Sᵀ beyond the tolerance although reciprocity is expected (first 20) and how many */
  nonReciprocalHz: number[];
  nonReciprocalCount: number;
  passivity: Verdict | null;
  reciprocity: Verdict | null;
  messages: string[];
};

export type DataQualityResult = {
  passivity: Verdict;
  reciprocity: Verdict;
  blocks: QualityFigures[];
  composite: QualityFigures;
  messages: string[];
};

function figures(subject: string, kind: string, s: SData, ks: number[], freqs: Float64Array, measured: boolean, activeReason: string | null, expectPassive: boolean, expectReciprocal: boolean, tol: number, failVerdict: Verdict): QualityFigures {
  let maxS = 0, maxSHz = freqs[ks[0]], uni = 0, uniHz = freqs[ks[0]], rec = 0, recHz = freqs[ks[0]];
  const activeHz: number[] = [], nonReciprocalHz: number[] = [];
  let activeCount = 0, nonReciprocalCount = 0;
  for (const k of ks) {
    const sv = maxSingularValue(s, k);
    const u = unitarityError(s, k);
    const r = reciprocityError(s, k);
    if (!(sv <= maxS)) { maxS = sv; maxSHz = freqs[k]; }
    if (!(u <= uni)) { uni = u; uniHz = freqs[k]; }
    if (!(r <= rec)) { rec = r; recHz = freqs[k]; }
    if (!(sv <= 1 + tol)) { activeCount++; if (activeHz.length < 20) activeHz.push(freqs[k]); }
    if (!(r <= tol)) { nonReciprocalCount++; if (nonReciprocalHz.length < 20) nonReciprocalHz.push(freqs[k]); }
  }
  const messages: string[] = [];
  let passivity: Verdict | null = null, reciprocity: Verdict | null = null;
  if (expectPassive) {
    passivity = activeCount === 0 ? "pass" : failVerdict;
    if (activeCount > 0) messages.push(`${subject}: S is active (largest singular value ${maxS.toPrecision(10)} at ${formatHz(maxSHz)}) at ${activeCount} point${activeCount === 1 ? "" : "s"} although it should be passive`);
  }
  if (expectReciprocal) {
    reciprocity = nonReciprocalCount === 0 ? "pass" : failVerdict;
    if (nonReciprocalCount > 0) messages.push(`${subject}: S is not reciprocal (max |Sij − Sji| ${rec.toExponential(2)} at ${formatHz(recHz)}) at ${nonReciprocalCount} point${nonReciprocalCount === 1 ? "" : "s"} although it should be`);
  }
  return {
    subject, kind, measured, activeReason, expectPassive, expectReciprocal,
    maxSingular: maxS, maxSingularHz: maxSHz, unitarityError: uni, unitarityHz: uniHz, reciprocityError: rec, reciprocityHz: recHz,
    activeHz, activeCount, nonReciprocalHz, nonReciprocalCount, passivity, reciprocity, messages,
  };
}

function worse(a: Verdict, b: Verdict | null): Verdict {
  if (b === "fail" || a === "fail") return "fail";
  if (b === "warn" || a === "warn") return "warn";
  return "pass";
}

/**
 * Passivity, losslessness and reciprocity of every block and of the composite over a band.
 *
 * Expectations: a built-in model is expected passive/reciprocal as its traits say and fails beyond
 * MODEL_TOLERANCE; measured data (touchstone) is expected passive and reciprocal and only warns beyond
 * MEASURED_TOLERANCE (a measured active or non-reciprocal device is possible, but usually a sign of
 * calibration error) — unless the part is active (`active: true` on its block, or gain of more than
 * ACTIVE_GAIN_DB in its data with no `active: false`): an active part is expected neither passive nor
 * reciprocal, and gets the stability check instead. The composite is expected passive (reciprocal) when every
 * block is; it fails beyond MODEL_TOLERANCE, or warns when measured blocks are involved.
 *
 * @param solution solved composite
 * @param band optional [lo, hi] Hz, default the whole plan
 * @example dataQuality(sol).blocks.filter((b) => b.passivity === "warn").map((b) => b.subject)
 */
export function dataQuality(solution: Solution, band?: [number, number]): DataQualityResult {
  const freqs = solution.frequencies;
  const ks = band ? bandIndices(freqs, band, "band") : Array.from({ length: freqs.length }, (_, k) => k);
  const blocks = solution.system.blocks.map((b: EvaluatedBlock) => {
    const measured = b.kind === "touchstone";
    const activeReason = isActiveBlock(b) ? (b.active?.reason ?? `the ${b.kind} model has gain`) : null;
    if (measured) {
      const passive = activeReason === null;
      return figures(b.id, b.kind, b.s, ks, freqs, true, activeReason, passive, passive, MEASURED_TOLERANCE, "warn");
    }
    return figures(b.id, b.kind, b.s, ks, freqs, false, activeReason, b.traits.passive, b.traits.reciprocal, MODEL_TOLERANCE, "fail");
  });
  const anyMeasured = blocks.some((b) => b.measured);
  const compositePassive = blocks.every((b) => b.expectPassive && (!b.measured || b.activeCount === 0));
  const compositeReciprocal = blocks.every((b) => b.expectReciprocal && (!b.measured || b.nonReciprocalCount === 0));
  const activeBlocks = blocks.filter((b) => b.activeReason !== null).map((b) => b.subject);
  const composite = figures(
    "composite", "composite", solution.s, ks, freqs, anyMeasured,
    activeBlocks.length > 0 ? `it holds active block${activeBlocks.length === 1 ? "" : "s"} ${activeBlocks.join(", ")}` : null,
    compositePassive, compositeReciprocal,
    anyMeasured ? MEASURED_TOLERANCE : MODEL_TOLERANCE, anyMeasured ? "warn" : "fail",
  );
  let passivity: Verdict = composite.passivity ?? "pass";
  let reciprocity: Verdict = composite.reciprocity ?? "pass";
  for (const b of blocks) {
    passivity = worse(passivity, b.passivity);
    reciprocity = worse(reciprocity, b.reciprocity);
  }
  const messages = [
    ...blocks.filter((b) => b.measured && b.activeReason !== null).map((b) => `${b.subject}: active part (${b.activeReason}); not expected to be passive or reciprocal, checked for stability instead`),
    ...blocks.flatMap((b) => b.messages),
    ...composite.messages,
  ];
  if (!compositePassive) messages.push("composite: not expected to be passive (it holds an amplifier or active measured data); largest singular value reported only");
  if (!compositeReciprocal) messages.push("composite: not expected to be reciprocal (it holds a non-reciprocal block)");
  messages.unshift(`passivity ${passivity}, reciprocity ${reciprocity}; composite largest singular value ${composite.maxSingular.toPrecision(10)} at ${formatHz(composite.maxSingularHz)}, max |Sij − Sji| ${composite.reciprocityError.toExponential(2)}`);
  return { passivity, reciprocity, blocks, composite, messages };
}
