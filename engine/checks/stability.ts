// Two-port stability: Rollett's K and |Δ| (Rollett 1962; Pozar, Microwave Engineering 4th ed., eq. 12.12-12.13)
// and the μ factor (Edwards and Sinsky, IEEE T-MTT 40(12), 1992), per plan frequency.
import { EngineInputError } from "../types";
import { isActiveBlock } from "../system/activity";
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
  /** largest |Δ| over the plan and where (|Δ| ≥ 1 alone makes a 2-port potentially unstable, whatever K says) */
  maxDelta: number;
  maxDeltaHz: number;
  /** frequencies where the 2-port is only conditionally stable (first 20) and their count */
  conditionalHz: number[];
  conditionalCount: number;
  messages: string[];
};

/**
 * Stability of a 2-port stack over frequency. Verdict "pass" when unconditionally stable at every point
 * (K > 1 and |Δ| < 1, equivalently μ > 1), else "fail": a potentially unstable two-port oscillates with some
 * passive terminations, and the check cannot know which ones the hardware will present. An engineer who has
 * checked the actual terminations records a waiver for the failing check.
 * @param subject name in messages
 * @param s 2-port S (n = 2)
 * @param frequencies plan, Hz
 * @param opts keepPoints: false leaves `points` and `frequenciesHz` empty (the summary figures stay), for the
 *   many port pairs of a large composite whose per-point figures nobody reads and a stored run would carry
 * @throws EngineInputError when s is not a 2-port
 * @example stabilityOfStack("AMP1", block.s, plan).verdict
 */
export function stabilityOfStack(subject: string, s: SData, frequencies: ArrayLike<number>, opts: { keepPoints?: boolean } = {}): StabilityResult {
  const keep = opts.keepPoints !== false;
  if (s.n !== 2) throw new EngineInputError(subject, `stability needs a 2-port, got ${s.n} ports`);
  const points: StabilityPoint[] = [];
  const freqs: number[] = [];
  const conditionalHz: number[] = [];
  let conditionalCount = 0;
  let minK: number | null = null, minKHz = frequencies[0], minMu: number | null = null, minMuHz = frequencies[0];
  let maxDelta = 0, maxDeltaHz = frequencies[0];
  for (let k = 0; k < s.nf; k++) {
    const p = stabilityOf(s.data.subarray(8 * k, 8 * k + 8));
    if (keep) {
      points.push(p);
      freqs.push(frequencies[k]);
    }
    if (p.k !== null && (minK === null || p.k < minK)) { minK = p.k; minKHz = frequencies[k]; }
    if (p.mu !== null && (minMu === null || p.mu < minMu)) { minMu = p.mu; minMuHz = frequencies[k]; }
    if (p.deltaMag > maxDelta) { maxDelta = p.deltaMag; maxDeltaHz = frequencies[k]; }
    if (!p.unconditional) {
      conditionalCount++;
      if (conditionalHz.length < 20) conditionalHz.push(frequencies[k]);
    }
  }
  const messages: string[] = [];
  const verdict: Verdict = conditionalCount === 0 ? "pass" : "fail";
  const kText = minK === null ? "K unbounded (unilateral)" : `min K ${minK.toFixed(4)} at ${formatHz(minKHz)}`;
  const muText = minMu === null ? "μ unbounded" : `min μ ${minMu.toFixed(4)} at ${formatHz(minMuHz)}`;
  const deltaText = `max |Δ| ${maxDelta.toFixed(4)} at ${formatHz(maxDeltaHz)}`;
  if (verdict === "pass") messages.push(`${subject}: unconditionally stable at all ${s.nf} points (${kText}, ${deltaText}, ${muText})`);
  else {
    messages.push(
      `${subject}: potentially unstable (K ≤ 1 or |Δ| ≥ 1, μ ≤ 1) at ${conditionalCount} of ${s.nf} points, first at ${formatHz(conditionalHz[0])} ` +
        `(${kText}, ${deltaText}, ${muText}); it can oscillate with some passive terminations`,
    );
  }
  return { subject, verdict, frequenciesHz: freqs, points, minK, minKHz, minMu, minMuHz, maxDelta, maxDeltaHz, conditionalHz, conditionalCount, messages };
}

/**
 * Above this many system ports the composite's port pairs (n(n − 1)/2 of them) report their summary figures
 * only, without per-point figures, so that a stored check run stays small (8 ports: 28 pairs).
 */
export const PAIR_POINTS_PORT_LIMIT = 8;

/**
 * Stability of every active 2-port block (built-in amplifiers, and measured parts marked active or whose data
 * shows gain) and of the composite: between its two ports when the system has two, or between every pair of
 * system ports (the others terminated in their own Z0) when it has more and holds an active block.
 * @param solution solved composite
 * @param opts composite: "always" (default) includes a two-port composite even when every block is passive;
 *   "active" only when the system holds an active block (a passive composite is stable with any passive
 *   terminations, and a lossless one sits at K = 1, which would read as a false alarm)
 * @returns one StabilityResult per active 2-port block (subject = block id), then "composite" (two system ports)
 *   or "composite A–B" per pair of system ports, in scenario order (summaries only above PAIR_POINTS_PORT_LIMIT
 *   system ports)
 * @example stabilityCheck(sol).map((r) => r.verdict)
 */
export function stabilityCheck(solution: Solution, opts: { composite?: "always" | "active" } = {}): StabilityResult[] {
  const out: StabilityResult[] = [];
  for (const b of solution.system.blocks) {
    if (isActiveBlock(b) && b.s.n === 2) out.push(stabilityOfStack(b.id, b.s, solution.frequencies));
  }
  const active = solution.system.blocks.some((b) => isActiveBlock(b));
  const n = solution.s.n;
  if (n === 2 && (opts.composite !== "active" || active)) out.push(stabilityOfStack("composite", solution.s, solution.frequencies));
  if (n > 2 && active) {
    const keepPoints = n <= PAIR_POINTS_PORT_LIMIT;
    for (let i = 0; i < n; i++) {
      for (let j = i + 1; j < n; j++) {
        out.push(stabilityOfStack(`composite ${solution.ports[i]}–${solution.ports[j]}`, portPair(solution.s, i, j), solution.frequencies, { keepPoints }));
      }
    }
  }
  return out;
}

/** The 2-port [[Sii, Sij], [Sji, Sjj]] of an n-port over frequency (the other ports stay matched). */
function portPair(s: SData, i: number, j: number): SData {
  const { n, nf } = s;
  const data = new Float64Array(8 * nf);
  const at = [i * n + i, i * n + j, j * n + i, j * n + j];
  for (let k = 0; k < nf; k++) {
    const o = k * n * n;
    for (let e = 0; e < 4; e++) {
      data[8 * k + 2 * e] = s.data[2 * (o + at[e])];
      data[8 * k + 2 * e + 1] = s.data[2 * (o + at[e]) + 1];
    }
  }
  return { n: 2, nf, data };
}
