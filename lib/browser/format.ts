/**
 * Number formatting for the workspace: figures with SI prefixes, dB and degrees, with a real minus sign
 * so that columns of tabular figures line up. Frequencies are written by `formatHz` (engine/format.ts),
 * the same formatter as the engine's messages.
 */

const PREFIXES: [number, string][] = [
  [1e12, "T"],
  [1e9, "G"],
  [1e6, "M"],
  [1e3, "k"],
  [1, ""],
  [1e-3, "m"],
  [1e-6, "µ"],
  [1e-9, "n"],
  [1e-12, "p"],
];

/** Replaces ASCII hyphen-minus of a leading sign with U+2212 MINUS SIGN. */
function withMinus(text: string): string {
  return text.startsWith("-") ? `\u2212${text.slice(1)}` : text;
}

/** A number with `digits` significant digits, trailing zeros kept off, e.g. 2.45, 0.00123, 1.2e+15. */
export function formatNumber(value: number, digits = 4): string {
  if (Number.isNaN(value)) return "—";
  if (!Number.isFinite(value)) return value > 0 ? "∞" : "\u2212∞";
  if (value === 0) return "0";
  const text = Math.abs(value) >= 1e-4 && Math.abs(value) < 1e15 ? String(Number(value.toPrecision(digits))) : value.toExponential(digits - 1);
  return withMinus(text);
}

/** A value with an SI prefix, e.g. formatSi(2.45e9, "Hz") → "2.45 GHz". */
export function formatSi(value: number, unit: string, digits = 4): string {
  if (!Number.isFinite(value) || value === 0) return `${formatNumber(value, digits)} ${unit}`.trim();
  const abs = Math.abs(value);
  const [scale, prefix] = PREFIXES.find(([s]) => abs >= s * 0.9999999) ?? PREFIXES[PREFIXES.length - 1];
  return `${formatNumber(value / scale, digits)} ${prefix}${unit}`.trim();
}

/** A fixed-decimals figure with a real minus sign: formatFixed(-3.0103, 2) → "−3.01". */
export function formatFixed(value: number, decimals = 2): string {
  if (Number.isNaN(value)) return "—";
  if (!Number.isFinite(value)) return value > 0 ? "∞" : "\u2212∞";
  const text = value.toFixed(decimals);
  return withMinus(/^-0(\.0+)?$/.test(text) ? text.slice(1) : text);
}

export function formatDb(value: number, decimals = 2): string {
  return `${formatFixed(value, decimals)} dB`;
}

/** Complex impedance in Ω: "50 + j12.3 Ω". */
export function formatImpedance(re: number, im: number, digits = 4): string {
  const sign = im < 0 ? "\u2212" : "+";
  return `${formatNumber(re, digits)} ${sign} j${formatNumber(Math.abs(im), digits)} Ω`;
}
