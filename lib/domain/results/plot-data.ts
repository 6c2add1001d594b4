/**
 * What a plot's export writes as data, and the Smith chart's read-out: pure functions, shared by the
 * results panel and any page that shows a plot (a part's traces).
 */
import { nearestFrequencyIndex, reflectionToImpedance } from "./results-math";

function csvField(text: string): string {
  return /[",\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** A value as the CSV writes it: 8 significant digits, "-inf"/"inf"/"" for what is not a number. */
function csvNumber(v: number): string {
  if (Number.isNaN(v)) return "";
  if (!Number.isFinite(v)) return v > 0 ? "inf" : "-inf";
  return String(Number(v.toPrecision(8)));
}

/**
 * The data of a plot as CSV: a header row "frequency (Hz)" then one column per trace named
 * "<label> (<unit>)", then one row per frequency with the frequency in Hz (exact) and each trace's value.
 * @example plotToCsv(Float64Array.of(1e9), [{ label: "S21 (A → B)", unit: "dB", values: Float64Array.of(-0.5) }])
 *   // "frequency (Hz),S21 (A → B) (dB)\n1000000000,-0.5\n"
 */
export function plotToCsv(frequencies: ArrayLike<number>, series: readonly { label: string; unit: string; values: ArrayLike<number> }[]): string {
  for (const s of series) {
    if (s.values.length !== frequencies.length) throw new RangeError(`trace "${s.label}" has ${s.values.length} values for ${frequencies.length} frequencies`);
  }
  const rows = [["frequency (Hz)", ...series.map((s) => csvField(`${s.label} (${s.unit})`))].join(",")];
  for (let k = 0; k < frequencies.length; k++) rows.push([String(frequencies[k]), ...series.map((s) => csvNumber(s.values[k]))].join(","));
  return `${rows.join("\n")}\n`;
}

/** What the Smith chart reads out at a reflection coefficient Γ. */
export type SmithReadout = {
  /** |Γ| */
  magnitude: number;
  /** arg Γ, degrees in (−180, 180] */
  angleDeg: number;
  /** normalised impedance z = r + jx = (1 + Γ)/(1 − Γ); r = Infinity at Γ = 1 */
  r: number;
  x: number;
  /** Z = z·Z0, Ω */
  resistance: number;
  reactance: number;
};

/**
 * The read-out at Γ = re + j·im for a port of reference impedance `z0` (real, Ω): z = (1 + Γ)/(1 − Γ)
 * (Pozar, Microwave Engineering, 4th ed., §2.4, from memory: the inverse of Γ = (Z − Z0)/(Z + Z0)) and Z = z·Z0.
 * @example smithReadout(1 / 3, 0, 50) // { magnitude: 1/3, angleDeg: 0, r: 2, x: 0, resistance: 100, reactance: 0 }
 */
export function smithReadout(re: number, im: number, z0: number): SmithReadout {
  const [r, x] = reflectionToImpedance(re, im, 1);
  return {
    magnitude: Math.hypot(re, im),
    angleDeg: (Math.atan2(im, re) * 180) / Math.PI,
    r,
    x,
    resistance: r * z0,
    reactance: Number.isFinite(r) ? x * z0 : 0,
  };
}

/** The Smith chart's view: zoom factor ≥ 1 about a centre (Γ plane, Im Γ upwards). */
export type SmithView = { zoom: number; cx: number; cy: number };

export const SMITH_HOME: SmithView = { zoom: 1, cx: 0, cy: 0 };
export const SMITH_MAX_ZOOM = 64;
/** Half the width of the unzoomed view in Γ units: the unit circle and its labels. */
export const SMITH_HALF_SPAN = 1.16;

/**
 * The view after zooming by `factor` about the Γ-plane point (px, py), which stays under the pointer;
 * the zoom stays within [1, SMITH_MAX_ZOOM] and the centre keeps the unit circle's box in sight.
 */
export function zoomSmith(view: SmithView, factor: number, px = view.cx, py = view.cy): SmithView {
  const zoom = Math.min(SMITH_MAX_ZOOM, Math.max(1, view.zoom * factor));
  const k = view.zoom / zoom;
  return clampSmith({ zoom, cx: px + (view.cx - px) * k, cy: py + (view.cy - py) * k });
}

/** The view moved by (dx, dy) in Γ units, kept in sight. */
export function panSmith(view: SmithView, dx: number, dy: number): SmithView {
  return clampSmith({ ...view, cx: view.cx + dx, cy: view.cy + dy });
}

function clampSmith(view: SmithView): SmithView {
  // the view's centre stays where the unzoomed view still shows it (no panning into empty paper)
  const room = SMITH_HALF_SPAN - SMITH_HALF_SPAN / view.zoom;
  const clamp = (v: number) => Math.min(room, Math.max(-room, v));
  return { zoom: view.zoom, cx: clamp(view.cx), cy: clamp(view.cy) };
}

/**
 * The plan index a marker at `hz` reads, or null when `hz` lies outside the plan [first, last]: a marker
 * is refused there rather than moved to the nearest edge, which would read a frequency nobody asked for.
 * @example markerIndexInPlan(Float64Array.of(1e9, 1.5e9, 2e9), 1.6e9) // 1
 * @example markerIndexInPlan(Float64Array.of(1e9, 1.5e9, 2e9), 3e9) // null
 */
export function markerIndexInPlan(frequencies: Float64Array, hz: number): number | null {
  const n = frequencies.length;
  if (n === 0 || !Number.isFinite(hz) || hz < frequencies[0] || hz > frequencies[n - 1]) return null;
  return nearestFrequencyIndex(frequencies, hz);
}
