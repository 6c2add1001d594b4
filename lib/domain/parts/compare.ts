import { formatHz } from "@/engine/format";
import type { TouchstoneData } from "@/engine/touchstone";

/** The stored figures of one part version, enough to say what changed against another (no text needed). */
export type VersionFigures = {
  partVersion: number;
  ports: number;
  points: number;
  startHz: number;
  stopHz: number;
  referenceOhms: [number, number][];
  maxSingular: number;
  reciprocityError: number;
};

function referenceText(ohms: [number, number][]): string {
  const texts = ohms.map(([re, im]) => (im === 0 ? `${re}` : `${re}${im < 0 ? "−" : "+"}j${Math.abs(im)}`));
  return new Set(texts).size === 1 ? `${texts[0]} Ω` : `${texts.join(", ")} Ω`;
}

/**
 * What changed from one version of a part to the next, in words, from the figures stored at upload: data
 * range, points, ports, reference impedance, passivity (σmax) and reciprocity (max |S_ij − S_ji|). Empty
 * when none of them changed.
 */
export function describeVersionChanges(before: VersionFigures, after: VersionFigures): string[] {
  const out: string[] = [];
  if (before.startHz !== after.startHz || before.stopHz !== after.stopHz) {
    out.push(`range ${formatHz(before.startHz)} – ${formatHz(before.stopHz)} → ${formatHz(after.startHz)} – ${formatHz(after.stopHz)}`);
  }
  if (before.points !== after.points) out.push(`points ${before.points} → ${after.points}`);
  if (before.ports !== after.ports) out.push(`ports ${before.ports} → ${after.ports}`);
  const refBefore = referenceText(before.referenceOhms);
  const refAfter = referenceText(after.referenceOhms);
  if (refBefore !== refAfter) out.push(`reference ${refBefore} → ${refAfter}`);
  if (before.maxSingular.toFixed(4) !== after.maxSingular.toFixed(4)) out.push(`σmax ${before.maxSingular.toFixed(4)} → ${after.maxSingular.toFixed(4)}`);
  if (before.reciprocityError.toExponential(1) !== after.reciprocityError.toExponential(1)) {
    out.push(`max|Sij−Sji| ${before.reciprocityError.toExponential(1)} → ${after.reciprocityError.toExponential(1)}`);
  }
  return out;
}

/** 20·log10|S_ij| at every data point (i, j 0-based; −∞ where |S| is 0, which a plot leaves out). */
export function magnitudeDb(data: TouchstoneData, i: number, j: number): Float64Array {
  const n = data.s.n;
  const out = new Float64Array(data.s.nf);
  for (let k = 0; k < data.s.nf; k++) {
    const at = 2 * ((k * n + i) * n + j);
    const mag = Math.hypot(data.s.data[at], data.s.data[at + 1]);
    out[k] = mag > 0 ? 20 * Math.log10(mag) : -Infinity;
  }
  return out;
}

/**
 * The largest change of |S_ij| in dB between two versions over their common frequency range: at each data
 * point of `after` inside the range of `before`, `before` is interpolated linearly in real and imaginary
 * parts (as the engine does onto a plan, docs/engine.md) and |20·log10|S_after| − 20·log10|S_before|| taken
 * over every (i, j). Null when the ranges do not overlap or the port counts differ.
 */
export function maxMagnitudeChangeDb(before: TouchstoneData, after: TouchstoneData): { db: number; hz: number; i: number; j: number } | null {
  const n = after.s.n;
  if (before.s.n !== n) return null;
  const fb = before.frequencies;
  const lo = fb[0];
  const hi = fb[fb.length - 1];
  let best: { db: number; hz: number; i: number; j: number } | null = null;
  let seg = 0;
  for (let k = 0; k < after.s.nf; k++) {
    const f = after.frequencies[k];
    if (f < lo || f > hi) continue;
    while (seg < fb.length - 2 && fb[seg + 1] < f) seg++;
    const f0 = fb[seg];
    const f1 = fb.length > 1 ? fb[seg + 1] : f0;
    const t = f1 > f0 ? (f - f0) / (f1 - f0) : 0;
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        const a0 = 2 * ((seg * n + i) * n + j);
        const a1 = 2 * ((Math.min(seg + 1, fb.length - 1) * n + i) * n + j);
        const re = before.s.data[a0] + t * (before.s.data[a1] - before.s.data[a0]);
        const im = before.s.data[a0 + 1] + t * (before.s.data[a1 + 1] - before.s.data[a0 + 1]);
        const at = 2 * ((k * n + i) * n + j);
        const magAfter = Math.hypot(after.s.data[at], after.s.data[at + 1]);
        const magBefore = Math.hypot(re, im);
        const dbAfter = magAfter > 0 ? 20 * Math.log10(magAfter) : -300;
        const dbBefore = magBefore > 0 ? 20 * Math.log10(magBefore) : -300;
        const change = Math.abs(dbAfter - dbBefore);
        if (best === null || change > best.db) best = { db: change, hz: f, i, j };
      }
    }
  }
  return best;
}
