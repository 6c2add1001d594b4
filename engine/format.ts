/**
 * The one frequency formatter of Portolan: engine messages, check headlines and the web app's tables
 * all write frequencies through it, so that a figure reads the same everywhere.
 */

/**
 * A frequency in engineering form with at most `digits` significant digits (trailing zeros dropped),
 * e.g. "2.45 GHz"; non-finite values are written as they are ("Infinity Hz").
 * @example formatHz(2.45e9) // "2.45 GHz"
 * @example formatHz(2_412_345_678, 10) // "2.412345678 GHz"
 */
export function formatHz(hz: number, digits = 6): string {
  if (!Number.isFinite(hz)) return `${hz} Hz`;
  const a = Math.abs(hz);
  const [scale, unit] = a >= 1e9 ? [1e9, "GHz"] : a >= 1e6 ? [1e6, "MHz"] : a >= 1e3 ? [1e3, "kHz"] : [1, "Hz"];
  return `${Number((hz / scale).toPrecision(digits))} ${unit}`;
}
