// A small SVG line plotter for report.html: axes with rounded ticks, one polyline per trace, a legend.
// Pure string output, no scripts and no external references, so the report prints and opens offline.

export type PlotTrace = { label: string; x: number[]; y: number[] };

export type PlotOptions = {
  title: string;
  xLabel: string;
  yLabel: string;
  width?: number;
  height?: number;
  /** lowest y shown, so that −400 dB floors do not squash the plot */
  yFloor?: number;
  /** shaded x ranges, e.g. rule bands */
  bands?: { from: number; to: number; label: string }[];
};

/** Ink-friendly colours that stay apart in greyscale print too (dash patterns differ as well). */
const COLOURS = ["#1D2936", "#B8432B", "#2F7A68", "#B5852A", "#3D5A80", "#7A4E8C", "#5B6B3A", "#8C5A3C"];
const DASHES = ["", "6 3", "2 2", "8 3 2 3", "4 4", "1 3", "10 4", "3 6"];

export function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (ch) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[ch] ?? ch);
}

/** Rounded tick values covering [lo, hi] (1-2-5 steps), about `count` of them. */
export function niceTicks(lo: number, hi: number, count = 6): number[] {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / Math.max(1, count);
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const ticks: number[] = [];
  for (let t = Math.ceil(lo / step) * step; t <= hi + step * 1e-9; t += step) ticks.push(Math.abs(t) < step * 1e-9 ? 0 : t);
  return ticks;
}

function fmt(x: number): string {
  return Number.isInteger(x) ? String(x) : x.toPrecision(4).replace(/\.?0+$/, "");
}

/** An inline SVG plot of the traces. */
export function svgPlot(traces: PlotTrace[], opts: PlotOptions): string {
  const width = opts.width ?? 720;
  const height = opts.height ?? 280;
  const m = { left: 58, right: 16, top: 28, bottom: 40 };
  const legendRows = Math.ceil(traces.length / 4);
  const plotH = height - m.top - m.bottom - legendRows * 16;
  const plotW = width - m.left - m.right;
  const xs = traces.flatMap((t) => t.x);
  const ys = traces.flatMap((t) => t.y).filter((v) => Number.isFinite(v));
  if (xs.length === 0 || ys.length === 0) return `<p class="muted">${escapeHtml(opts.title)}: no data.</p>`;
  let x0 = Math.min(...xs);
  let x1 = Math.max(...xs);
  if (x1 === x0) {
    x0 -= 0.5;
    x1 += 0.5;
  }
  let y1 = Math.max(...ys);
  let y0 = Math.min(...ys);
  if (opts.yFloor !== undefined) y0 = Math.max(y0, opts.yFloor);
  if (y1 - y0 < 1) {
    y0 -= 0.5;
    y1 += 0.5;
  }
  const yTicks = niceTicks(y0, y1, 6);
  y0 = Math.min(y0, yTicks[0]);
  y1 = Math.max(y1, yTicks[yTicks.length - 1]);
  const px = (x: number) => m.left + ((x - x0) / (x1 - x0)) * plotW;
  const py = (y: number) => m.top + (1 - (Math.max(y0, Math.min(y1, y)) - y0) / (y1 - y0)) * plotH;
  const parts: string[] = [];
  parts.push(`<svg xmlns="http://www.w3.org/2000/svg" role="img" aria-label="${escapeHtml(opts.title)}" viewBox="0 0 ${width} ${height}" width="100%" style="max-width:${width}px">`);
  parts.push(`<text x="${m.left}" y="16" font-size="13" font-weight="600" fill="#1D2936">${escapeHtml(opts.title)}</text>`);
  for (const band of opts.bands ?? []) {
    const a = px(Math.max(x0, band.from));
    const b = px(Math.min(x1, band.to));
    if (b > a) parts.push(`<rect x="${a.toFixed(1)}" y="${m.top}" width="${(b - a).toFixed(1)}" height="${plotH}" fill="#CDBF9F" fill-opacity="0.25"><title>${escapeHtml(band.label)}</title></rect>`);
  }
  for (const t of yTicks) {
    const y = py(t).toFixed(1);
    parts.push(`<line x1="${m.left}" x2="${m.left + plotW}" y1="${y}" y2="${y}" stroke="#CDBF9F" stroke-width="0.6"/>`);
    parts.push(`<text x="${m.left - 6}" y="${y}" font-size="10" text-anchor="end" dominant-baseline="middle" fill="#1D2936">${fmt(t)}</text>`);
  }
  for (const t of niceTicks(x0, x1, 6)) {
    const x = px(t).toFixed(1);
    parts.push(`<line x1="${x}" x2="${x}" y1="${m.top}" y2="${m.top + plotH}" stroke="#CDBF9F" stroke-width="0.6"/>`);
    parts.push(`<text x="${x}" y="${m.top + plotH + 14}" font-size="10" text-anchor="middle" fill="#1D2936">${fmt(t)}</text>`);
  }
  parts.push(`<rect x="${m.left}" y="${m.top}" width="${plotW}" height="${plotH}" fill="none" stroke="#1D2936" stroke-width="0.8"/>`);
  parts.push(`<text x="${m.left + plotW / 2}" y="${m.top + plotH + 30}" font-size="11" text-anchor="middle" fill="#1D2936">${escapeHtml(opts.xLabel)}</text>`);
  parts.push(`<text transform="translate(14 ${m.top + plotH / 2}) rotate(-90)" font-size="11" text-anchor="middle" fill="#1D2936">${escapeHtml(opts.yLabel)}</text>`);
  traces.forEach((trace, i) => {
    const pts = trace.x.map((x, k) => `${px(x).toFixed(1)},${py(trace.y[k]).toFixed(1)}`).join(" ");
    const colour = COLOURS[i % COLOURS.length];
    const dash = DASHES[i % DASHES.length];
    parts.push(`<polyline points="${pts}" fill="none" stroke="${colour}" stroke-width="1.4"${dash ? ` stroke-dasharray="${dash}"` : ""}><title>${escapeHtml(trace.label)}</title></polyline>`);
    const lx = m.left + (i % 4) * (plotW / 4);
    const ly = m.top + plotH + 44 + Math.floor(i / 4) * 16;
    parts.push(`<line x1="${lx}" x2="${lx + 22}" y1="${ly - 4}" y2="${ly - 4}" stroke="${colour}" stroke-width="2"${dash ? ` stroke-dasharray="${dash}"` : ""}/>`);
    parts.push(`<text x="${lx + 27}" y="${ly}" font-size="10" fill="#1D2936">${escapeHtml(trace.label)}</text>`);
  });
  parts.push("</svg>");
  return parts.join("");
}
