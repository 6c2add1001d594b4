// Two-port stability: Rollett's K and |Δ| (Rollett 1962; Pozar, Microwave Engineering 4th ed., eq. 12.12-12.13)
// and the μ factor (Edwards and Sinsky, IEEE T-MTT 40(12), 1992), per plan frequency.
import { EngineInputError } from "../types";
import type { SData, Solution } from "../types";
import { formatHz } from "./band";
import type { Verdict } from "./types";

/** Stability figures of one 2-port at one frequency. Infinite figures (S12·S21 = 0) are null. */
export type StabilityPoint = {
  /** Rollett K = (1 − |S11|² − |S22|² + |Δ|²) / (2|S12·S21|); null when S12·S21 = 0 */
  k: number | null;
  /** |Δ| = |S11·S22 − S12·S21| */
  deltaMag: number;
  /** μ = (1 − |S11|²) / (|S22 − Δ·S11*| + |S12·S21|) (load side); null when the denominator is 0 */
  mu: number | null;
  /** μ' = (1 − |S22|²) / (|S11 − Δ·S22*| + |S12·S21|) (source side) */
  muPrime: number | null;
  /** K > 1 and |Δ| < 1 (or, when unilateral, |S11| < 1 and |S22| < 1) */
  unconditional: boolean;
};

/**
 * Stability figures of a 2-port from its four S-parameters (complex, re/im).
 * @param s [S11re, S11im, S12re, S12im, S21re, S21im, S22re, S22im] (row-major 2×2, interleaved)
 * @example stabilityOf([0.72*Math.cos(-116*Math.PI/180), …]) // { k: 1.195, … } (Pozar ex. 12.2)
 */
export function stabilityOf(s: ArrayLike<number>): StabilityPoint {
  const [a, b, c, d, e, f, g, h] = [s[0], s[1], s[2], s[3], s[4], s[5], s[6], s[7]];
  // Δ = S11·S22 − S12·S21
  const p12r = c * e - d * f, p12i = c * f + d * e; // S12·S21
  const dr = a * g - b * h - p12r, di = a * h + b * g - p12i;
  const deltaMag = Math.hypot(dr, di);
  const s11m2 = a * a + b * b, s22m2 = g * g + h * h;
  const p12m = Math.hypot(p12r, p12i);
  const kNum = 1 - s11m2 - s22m2 + deltaMag * deltaMag;
  const k = p12m === 0 ? null : kNum / (2 * p12m);
  // S22 − Δ·S11*:  Δ·conj(S11) = (dr + j di)(a − j b)
  const l1 = Math.hypot(g - (dr * a + di * b), h - (di * a - dr * b));
  const l2 = Math.hypot(a - (dr * g + di * h), b - (di * g - dr * h));
  const den1 = l1 + p12m, den2 = l2 + p12m;
  const mu = den1 === 0 ? null : (1 - s11m2) / den1;
  const muPrime = den2 === 0 ? null : (1 - s22m2) / den2;
  const unconditional = k === null ? s11m2 < 1 && s22m2 < 1 : k > 1 && deltaMag < 1;
  return { k, deltaMag, mu, muPrime, unconditional };
}

export type StabilityResult = {
  /** block id, or "composite" */
  subject: string;
  verdict: Verdict;
  frequenciesHz: number[];
  points: StabilityPoint[];
  /** smallest K and μ over the plan (null when all infinite) and where */
  minK: number | null;
  minKHz: number;
  minMu: number | null;
  minMuHz: number;
  /** frequencies where the 2-port is only conditionally stable (first 20) and their count */
  conditionalHz: number[];
  conditionalCount: number;
  messages: string[];
};

/**
 * Stability of a 2-port stack over frequency. Verdict "pass" when unconditionally stable at every point
 * (K > 1 and |Δ| < 1, equivalently μ > 1), else "warn": a conditionally stable two-port can still be used
 * with the right terminations, which the engineer must check.
 * @param subject name in messages
 * @param s 2-port S (n = 2)
 * @param frequencies plan, Hz
 * @throws EngineInputError when s is not a 2-port
 * @example stabilityOfStack("AMP1", block.s, plan).verdict
 */
export function stabilityOfStack(subject: string, s: SData, frequencies: ArrayLike<number>): StabilityResult {
  if (s.n !== 2) throw new EngineInputError(subject, `stability needs a 2-port, got ${s.n} ports`);
  const points: StabilityPoint[] = [];
  const freqs: number[] = [];
  const conditionalHz: number[] = [];
  let conditionalCount = 0;
  let minK: number | null = null, minKHz = frequencies[0], minMu: number | null = null, minMuHz = frequencies[0];
  for (let k = 0; k < s.nf; k++) {
    const p = stabilityOf(s.data.subarray(8 * k, 8 * k + 8));
    points.push(p);
    freqs.push(frequencies[k]);
    if (p.k !== null && (minK === null || p.k < minK)) { minK = p.k; minKHz = frequencies[k]; }
    if (p.mu !== null && (minMu === null || p.mu < minMu)) { minMu = p.mu; minMuHz = frequencies[k]; }
    if (!p.unconditional) {
      conditionalCount++;
      if (conditionalHz.length < 20) conditionalHz.push(frequencies[k]);
    }
  }
  const messages: string[] = [];
  const verdict: Verdict = conditionalCount === 0 ? "pass" : "warn";
  const kText = minK === null ? "K unbounded (unilateral)" : `min K ${minK.toFixed(4)} at ${formatHz(minKHz)}`;
  const muText = minMu === null ? "μ unbounded" : `min μ ${minMu.toFixed(4)} at ${formatHz(minMuHz)}`;
  if (verdict === "pass") messages.push(`${subject}: unconditionally stable at all ${s.nf} points (${kText}, ${muText})`);
  else messages.push(`${subject}: only conditionally stable at ${conditionalCount} of ${s.nf} points, first at ${formatHz(conditionalHz[0])} (${kText}, ${muText})`);
  return { subject, verdict, frequenciesHz: freqs, points, minK, minKHz, minMu, minMuHz, conditionalHz, conditionalCount, messages };
}

/**
 * Stability of every amplifier block and, when the system has exactly two ports, of the composite.
 * @param solution solved composite
 * @param opts composite: "always" (default) includes a two-port composite; "active" only when the system
 *   holds a block that is not passive (a passive composite is stable with any passive terminations, and a
 *   lossless one sits at K = 1, which would read as a false alarm)
 * @returns one StabilityResult per amplifier block (subject = block id), then "composite" if included
 * @example stabilityCheck(sol).map((r) => r.verdict)
 */
export function stabilityCheck(solution: Solution, opts: { composite?: "always" | "active" } = {}): StabilityResult[] {
  const out: StabilityResult[] = [];
  for (const b of solution.system.blocks) {
    if (b.kind === "amplifier" && b.s.n === 2) out.push(stabilityOfStack(b.id, b.s, solution.frequencies));
  }
  const active = solution.system.blocks.some((b) => !b.traits.passive && b.kind !== "touchstone");
  if (solution.s.n === 2 && (opts.composite !== "active" || active)) out.push(stabilityOfStack("composite", solution.s, solution.frequencies));
  return out;
}
