/**
 * Figures the results panel draws from a composite S (engine/types.ts layout): magnitude in dB, phase,
 * unwrapped phase, group delay, reflection to impedance, and the CSV export.
 */
import type { SData } from "@/engine/types";

/** The parts of a Solution the panel needs (what the worker sends back). */
export type SolvedView = {
  /** Hz, increasing */
  frequencies: Float64Array;
  /** system port names */
  ports: string[];
  /** each system port's Z0, Ω */
  portZ0: number[];
  s: SData;
};

/** Real and imaginary parts of S_ij (0-based) at frequency index k. */
export function elementAt(s: SData, k: number, i: number, j: number): [number, number] {
  const at = 2 * ((k * s.n + i) * s.n + j);
  return [s.data[at], s.data[at + 1]];
}

/** 20·log10|S_ij| over frequency, dB; |S| = 0 gives −Infinity. */
export function magnitudeDb(s: SData, i: number, j: number): Float64Array {
  const out = new Float64Array(s.nf);
  for (let k = 0; k < s.nf; k++) {
    const [re, im] = elementAt(s, k, i, j);
    out[k] = 20 * Math.log10(Math.hypot(re, im));
  }
  return out;
}

/** arg S_ij over frequency, degrees in (−180, 180]. */
export function phaseDeg(s: SData, i: number, j: number): Float64Array {
  const out = new Float64Array(s.nf);
  for (let k = 0; k < s.nf; k++) {
    const [re, im] = elementAt(s, k, i, j);
    out[k] = (Math.atan2(im, re) * 180) / Math.PI;
  }
  return out;
}

/** Removes 2π jumps between neighbouring samples (radians in, radians out), as numpy.unwrap does. */
export function unwrapRadians(phase: Float64Array): Float64Array {
  const out = new Float64Array(phase.length);
  let offset = 0;
  for (let k = 0; k < phase.length; k++) {
    if (k > 0) {
      const step = phase[k] + offset - out[k - 1];
      if (step > Math.PI) offset -= 2 * Math.PI * Math.round(step / (2 * Math.PI));
      else if (step < -Math.PI) offset += 2 * Math.PI * Math.round(-step / (2 * Math.PI));
    }
    out[k] = phase[k] + offset;
  }
  return out;
}

/**
 * Group delay τ(f) = −dφ/dω = −(1/2π)·dφ/df of S_ij, seconds, from the unwrapped phase: central
 * differences inside the plan, one-sided at its ends (common practice). NaN with fewer than 2 points.
 */
export function groupDelay(frequencies: Float64Array, s: SData, i: number, j: number): Float64Array {
  const nf = s.nf;
  const out = new Float64Array(nf);
  if (nf < 2) return out.fill(Number.NaN);
  const raw = new Float64Array(nf);
  for (let k = 0; k < nf; k++) {
    const [re, im] = elementAt(s, k, i, j);
    raw[k] = Math.atan2(im, re);
  }
  const phi = unwrapRadians(raw);
  for (let k = 0; k < nf; k++) {
    const lo = Math.max(0, k - 1);
    const hi = Math.min(nf - 1, k + 1);
    const df = frequencies[hi] - frequencies[lo];
    out[k] = df === 0 ? Number.NaN : -(phi[hi] - phi[lo]) / (2 * Math.PI * df);
  }
  return out;
}

/** Z = Z0·(1 + Γ)/(1 − Γ), Ω; Γ = 1 gives an infinite real part. */
export function reflectionToImpedance(re: number, im: number, z0: number): [number, number] {
  const dr = 1 - re;
  const di = -im;
  const den = dr * dr + di * di;
  if (den === 0) return [Number.POSITIVE_INFINITY, 0];
  const nr = 1 + re;
  const ni = im;
  return [(z0 * (nr * dr + ni * di)) / den, (z0 * (ni * dr - nr * di)) / den];
}

/** "S21" for 0-based (i, j) = (1, 0); ports past 9 are separated by commas ("S10,2"). */
export function sName(i: number, j: number): string {
  return i >= 9 || j >= 9 ? `S${i + 1},${j + 1}` : `S${i + 1}${j + 1}`;
}

function csvField(text: string): string {
  return /[",\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/**
 * CSV of the composite: a header row, then one row per frequency with the frequency in Hz and, for
 * every pair (i, j) in row-major order, |S_ij| in dB and arg S_ij in degrees.
 * Header names carry the port names, e.g. "S21 dB (ANT->TX)".
 */
export function solutionToCsv(view: SolvedView): string {
  const { s, frequencies, ports } = view;
  const header = ["frequency_hz"];
  for (let i = 0; i < s.n; i++) {
    for (let j = 0; j < s.n; j++) {
      const label = `${ports[j]}->${ports[i]}`;
      header.push(csvField(`${sName(i, j)} dB (${label})`), csvField(`${sName(i, j)} deg (${label})`));
    }
  }
  const rows = [header.join(",")];
  for (let k = 0; k < s.nf; k++) {
    const row = [String(frequencies[k])];
    for (let i = 0; i < s.n; i++) {
      for (let j = 0; j < s.n; j++) {
        const [re, im] = elementAt(s, k, i, j);
        const db = 20 * Math.log10(Math.hypot(re, im));
        row.push(Number.isFinite(db) ? db.toPrecision(8) : "-inf", ((Math.atan2(im, re) * 180) / Math.PI).toPrecision(8));
      }
    }
    rows.push(row.join(","));
  }
  return `${rows.join("\n")}\n`;
}

/** Index of the plan frequency closest to `hz`. */
export function nearestFrequencyIndex(frequencies: Float64Array, hz: number): number {
  let best = 0;
  for (let k = 1; k < frequencies.length; k++) {
    if (Math.abs(frequencies[k] - hz) < Math.abs(frequencies[best] - hz)) best = k;
  }
  return best;
}

/** What a trace shows of S_ij. */
export type TraceQuantity = "db" | "phase" | "delay";

export const TRACE_UNITS: Record<TraceQuantity, string> = { db: "dB", phase: "deg", delay: "ns" };

/** Values of one trace: |S_ij| dB, arg S_ij in degrees, or group delay in ns. */
export function traceValues(view: SolvedView, i: number, j: number, quantity: TraceQuantity): Float64Array {
  if (quantity === "db") return magnitudeDb(view.s, i, j);
  if (quantity === "phase") return phaseDeg(view.s, i, j);
  const tau = groupDelay(view.frequencies, view.s, i, j);
  for (let k = 0; k < tau.length; k++) tau[k] *= 1e9;
  return tau;
}

/** "S21 (TX → ANT)": the wave leaves port j and arrives at port i. */
export function traceLabel(ports: readonly string[], i: number, j: number): string {
  return `${sName(i, j)} (${ports[j]} → ${ports[i]})`;
}
