// Touchstone writer, 1.1 or 2.0 layout, after the Touchstone File Format Specification, Version 2.0 (IBIS Open Forum, 2009).
import type { SData, Z0Vector } from "../types";
import { TouchstoneError } from "./errors";
import { formatFixed, formatSignificant } from "./numbers";
import type { DataFormat, FrequencyUnit } from "./read";

export type WriteInput = {
  /** Hz, strictly increasing, one per S frequency */
  frequencies: Float64Array;
  s: SData;
  /** reference impedance(s), Ω: one real value, or a Z0Vector (real parts only; Touchstone cannot store complex references) */
  z0: number | Z0Vector;
  /** written as "!" lines at the top */
  comments?: string[];
};

export type WriteOptions = {
  /** default "1.1" when every port has the same reference, else "2.0" (1.1 cannot store per-port references) */
  version?: "1.1" | "2.0";
  /** default "RI" */
  format?: DataFormat;
  /** default "GHz" */
  unit?: FrequencyUnit;
  /** significant digits of magnitudes and real/imaginary parts (default 12); dB values and angles get digits − 2 decimals */
  digits?: number;
};

const SCALE: Record<FrequencyUnit, number> = { Hz: 1, kHz: 1e3, MHz: 1e6, GHz: 1e9 };

/**
 * Writes S-parameters as Touchstone text.
 *
 * 1.1: option line with a single R; 2-port records as N11 N21 N12 N22 on one line; 3 or more ports one matrix
 * row per line, at most four pairs per line. 2.0: [Version] 2.0, [Number of Ports], [Two-Port Data Order] 21_12
 * for 2-ports (the same element order as 1.1, so that readers that ignore the keyword still read it right),
 * [Number of Frequencies], [Reference] when the ports' references differ, [Network Data], the same data layout,
 * [End]. Frequencies are printed with the shortest text that reads back to the same double in the chosen
 * unit; RI values and MA magnitudes with `digits` significant digits; dB values and angles (degrees) with
 * digits − 2 decimals, so that parse(write(x)) equals x within 10^(1 − digits) relative to each value's
 * magnitude. An exact zero magnitude in DB format is written as −1000 dB.
 *
 * Throws TouchstoneError (name "touchstone output") for mismatched shapes, non-finite values, non-increasing
 * frequencies, complex references, or per-port references asked for in version 1.1.
 *
 * @example
 * writeTouchstone({ frequencies: new Float64Array([1e9]), s: { n: 1, nf: 1, data: new Float64Array([0.5, 0]) }, z0: 50 });
 * // "# GHz S RI R 50\n1 0.5 0\n"
 */
export function writeTouchstone(input: WriteInput, opts: WriteOptions = {}): string {
  const fail = (message: string): never => {
    throw new TouchstoneError("touchstone output", null, message);
  };
  const { frequencies, s } = input;
  const n = s.n;
  const nf = s.nf;
  if (!Number.isInteger(n) || n < 1) fail(`port count must be at least 1, got ${n}`);
  if (frequencies.length !== nf) fail(`${frequencies.length} frequencies given for S data with ${nf}`);
  if (s.data.length !== 2 * nf * n * n) fail(`S data has length ${s.data.length}, expected 2·${nf}·${n}·${n}`);
  if (nf === 0) fail(`no frequencies to write`);
  for (let k = 0; k < nf; k++) {
    const f = frequencies[k];
    if (!Number.isFinite(f) || f < 0) fail(`frequency ${k + 1} is not a finite, non-negative number (${f})`);
    if (k > 0 && !(f > frequencies[k - 1])) fail(`frequencies must increase (point ${k + 1}: ${f} Hz after ${frequencies[k - 1]} Hz)`);
  }
  for (let p = 0; p < s.data.length; p++) {
    if (!Number.isFinite(s.data[p])) fail(`S data holds a non-finite value at frequency ${Math.floor(p / (2 * n * n)) + 1}`);
  }

  const refs: number[] = [];
  if (typeof input.z0 === "number") {
    for (let i = 0; i < n; i++) refs.push(input.z0);
  } else {
    if (input.z0.length !== 2 * n) fail(`z0 has ${input.z0.length / 2} ports, expected ${n}`);
    for (let i = 0; i < n; i++) {
      if (input.z0[2 * i + 1] !== 0) fail(`port ${i + 1} has a complex reference impedance; Touchstone stores real references only (renormalise first)`);
      refs.push(input.z0[2 * i]);
    }
  }
  for (const r of refs) if (!(r > 0) || !Number.isFinite(r)) fail(`reference impedances must be positive and finite, got ${r}`);
  const uniform = refs.every((r) => r === refs[0]);
  const version = opts.version ?? (uniform ? "1.1" : "2.0");
  if (version === "1.1" && !uniform) fail(`Touchstone 1.1 has a single reference resistance; these ports differ (${refs.join(", ")} Ω): write version 2.0`);
  const format = opts.format ?? "RI";
  const unit = opts.unit ?? "GHz";
  const digits = opts.digits ?? 12;
  if (!(format in { RI: 1, MA: 1, DB: 1 })) fail(`unknown format "${String(format)}"`);
  if (!(unit in SCALE)) fail(`unknown frequency unit "${String(unit)}"`);
  if (!Number.isInteger(digits) || digits < 3 || digits > 17) fail(`digits must be a whole number from 3 to 17, got ${digits}`);
  const scale = SCALE[unit];
  const decimals = digits - 2;

  const lines: string[] = [];
  for (const c of input.comments ?? []) {
    for (const part of c.split(/\r\n|\r|\n/)) lines.push(part ? `! ${part}` : "!");
  }
  const num = (x: number): string => formatSignificant(x, digits);
  if (version === "2.0") lines.push("[Version] 2.0");
  lines.push(`# ${unit} S ${format} R ${num(refs[0])}`);
  if (version === "2.0") {
    lines.push(`[Number of Ports] ${n}`);
    if (n === 2) lines.push("[Two-Port Data Order] 21_12");
    lines.push(`[Number of Frequencies] ${nf}`);
    if (!uniform) lines.push(`[Reference] ${refs.map(num).join(" ")}`);
    lines.push("[Network Data]");
  }

  const pair = (re: number, im: number): string => {
    if (format === "RI") return `${num(re)} ${num(im)}`;
    const mag = Math.hypot(re, im);
    const ang = (Math.atan2(im, re) * 180) / Math.PI;
    const a = formatFixed(ang, decimals);
    if (format === "MA") return `${num(mag)} ${a}`;
    return `${mag === 0 ? "-1000" : formatFixed(20 * Math.log10(mag), decimals)} ${a}`;
  };
  const d = s.data;
  for (let k = 0; k < nf; k++) {
    const freq = String(frequencies[k] / scale);
    const o = k * 2 * n * n;
    const at = (i: number, j: number): string => pair(d[o + 2 * (i * n + j)], d[o + 2 * (i * n + j) + 1]);
    if (n === 1) {
      lines.push(`${freq} ${at(0, 0)}`);
    } else if (n === 2) {
      lines.push(`${freq} ${at(0, 0)} ${at(1, 0)} ${at(0, 1)} ${at(1, 1)}`);
    } else {
      for (let i = 0; i < n; i++) {
        for (let j0 = 0; j0 < n; j0 += 4) {
          const cells: string[] = [];
          for (let j = j0; j < Math.min(n, j0 + 4); j++) cells.push(at(i, j));
          const lead = i === 0 && j0 === 0 ? freq : " ".repeat(Math.min(freq.length, 12));
          lines.push(`${lead} ${cells.join(" ")}`);
        }
      }
    }
  }
  if (version === "2.0") lines.push("[End]");
  return lines.join("\n") + "\n";
}
