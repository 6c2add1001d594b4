"use client";

import { useEffect, useRef, useState } from "react";
import uPlot from "uplot";
import "uplot/dist/uPlot.min.css";
import { formatSi } from "@/lib/browser/format";
import { useLatest } from "@/lib/browser/use-latest";

export type TracePlotProps = {
  /** Hz */
  frequencies: Float64Array;
  /** one or more traces over the same frequencies; the first is the main one */
  series: { label: string; values: Float64Array }[];
  /** y unit: "dB", "deg", "ns" */
  unit: string;
  /** marker frequency indices */
  markers: number[];
  /** hovered index, or null when the cursor leaves */
  onHover: (index: number | null) => void;
  /** a click on the plot: add a marker at this index */
  onPick: (index: number) => void;
  height?: number;
};

/**
 * A palette colour as the canvas needs it (rgb…): the variable holds light-dark(…), which only a colour
 * property resolves, so it is read through a probe element's computed colour.
 */
function cssColour(name: string, fallback: string): string {
  if (typeof window === "undefined") return fallback;
  const probe = document.createElement("span");
  probe.style.color = `var(${name}, ${fallback})`;
  probe.hidden = true;
  document.body.appendChild(probe);
  const v = getComputedStyle(probe).color;
  probe.remove();
  return v || fallback;
}

function finiteOrNull(values: Float64Array): (number | null)[] {
  return Array.from(values, (v) => (Number.isFinite(v) ? v : null));
}

/** Changes when the page switches between light and dark, so that canvas colours can be read again. */
function useThemeKey(): number {
  const [key, setKey] = useState(0);
  useEffect(() => {
    const bump = () => setKey((k) => k + 1);
    const media = window.matchMedia("(prefers-color-scheme: dark)");
    media.addEventListener("change", bump);
    const observer = new MutationObserver(bump);
    observer.observe(document.documentElement, { attributes: true, attributeFilter: ["class", "data-theme", "style"] });
    return () => {
      media.removeEventListener("change", bump);
      observer.disconnect();
    };
  }, []);
  return key;
}

/** One trace over frequency (uPlot): hover read-out through onHover, click to place a marker. */
/** Canvas colours of the traces, in order (CSS variable, fallback). */
const TRACE_COLOURS: [string, string][] = [
  ["--pt-sea", "#2d5d8a"],
  ["--pt-warn", "#b5852a"],
  ["--pt-pass", "#2f7a68"],
  ["--pt-muted", "#56606e"],
];

function plotData(frequencies: Float64Array, series: TracePlotProps["series"]): uPlot.AlignedData {
  return [Array.from(frequencies), ...series.map((s) => finiteOrNull(s.values))] as uPlot.AlignedData;
}

export function TracePlot({ frequencies, series, unit, markers, onHover, onPick, height = 220 }: TracePlotProps) {
  const labels = series.map((s) => s.label).join("\u0000");
  const latestSeries = useLatest(series);
  const box = useRef<HTMLDivElement>(null);
  const plot = useRef<uPlot | null>(null);
  const markersRef = useRef(markers);
  const callbacks = useLatest({ onHover, onPick });
  const themeKey = useThemeKey();

  useEffect(() => {
    const el = box.current;
    if (!el) return;
    const minSpan = unit === "dB" ? 1 : unit === "deg" ? 10 : 0.1;
    const ink = cssColour("--pt-ink", "#1D2936");
    const rule = cssColour("--pt-rule", "#CDBF9F");
    const sea = cssColour("--pt-sea", "#2A5D7C");
    const colours = TRACE_COLOURS.map(([name, fallback]) => cssColour(name, fallback));
    const current = latestSeries.current;
    const fail = cssColour("--pt-fail", "#B8432B");
    const axis = { stroke: ink, grid: { stroke: rule, width: 1 }, ticks: { stroke: rule, width: 1 }, font: "11px var(--font-mono, monospace)" };
    const opts: uPlot.Options = {
      width: Math.max(200, el.clientWidth),
      height,
      legend: { show: false },
      cursor: { drag: { x: false, y: false }, points: { size: 7, fill: sea } },
      scales: {
        x: { time: false },
        // a flat trace (a pad, an isolation floor) keeps a readable span instead of one repeated tick label
        y: {
          range: (_u, min, max) => {
            if (min === null || max === null || !Number.isFinite(min) || !Number.isFinite(max)) return [0, 1];
            const span = Math.max(max - min, minSpan);
            const mid = (min + max) / 2;
            const pad = span * 0.08;
            return [mid - span / 2 - pad, mid + span / 2 + pad];
          },
        },
      },
      axes: [
        { ...axis, values: (_u, splits) => splits.map((v) => formatSi(v, "Hz", 4)), size: 34 },
        { ...axis, label: unit, labelSize: 14, labelFont: "11px var(--font-sans, sans-serif)", size: 56 },
      ],
      series: [{}, ...current.map((s, k) => ({ label: s.label, stroke: colours[k % colours.length], width: k === 0 ? 1.75 : 1.25, spanGaps: false }))],
      hooks: {
        setCursor: [
          (u) => {
            const idx = u.cursor.idx;
            callbacks.current.onHover(idx === null || idx === undefined ? null : idx);
          },
        ],
        draw: [
          (u) => {
            const ctx = u.ctx;
            const { top, height: h } = u.bbox;
            ctx.save();
            ctx.strokeStyle = fail;
            ctx.fillStyle = fail;
            ctx.lineWidth = Math.max(1, devicePixelRatio);
            ctx.font = `${Math.round(10 * devicePixelRatio)}px monospace`;
            markersRef.current.forEach((k, n) => {
              const f = u.data[0][k];
              if (f === undefined) return;
              const x = u.valToPos(f, "x", true);
              ctx.setLineDash([4 * devicePixelRatio, 3 * devicePixelRatio]);
              ctx.beginPath();
              ctx.moveTo(x, top);
              ctx.lineTo(x, top + h);
              ctx.stroke();
              ctx.setLineDash([]);
              ctx.fillText(`M${n + 1}`, x + 3 * devicePixelRatio, top + 12 * devicePixelRatio);
            });
            ctx.restore();
          },
        ],
      },
    };
    const u = new uPlot(opts, plotData(frequencies, current), el);
    plot.current = u;
    const click = () => {
      const idx = u.cursor.idx;
      if (idx !== null && idx !== undefined) callbacks.current.onPick(idx);
    };
    u.over.addEventListener("click", click);
    const leave = () => callbacks.current.onHover(null);
    u.over.addEventListener("mouseleave", leave);
    const resize = new ResizeObserver(() => u.setSize({ width: Math.max(200, el.clientWidth), height }));
    resize.observe(el);
    return () => {
      resize.disconnect();
      u.over.removeEventListener("click", click);
      u.over.removeEventListener("mouseleave", leave);
      u.destroy();
      plot.current = null;
    };
    // re-created when what the axes say changes; data updates go through setData below
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [labels, unit, height, themeKey]);

  useEffect(() => {
    plot.current?.setData(plotData(frequencies, series));
  }, [frequencies, series]);

  useEffect(() => {
    markersRef.current = markers;
    plot.current?.redraw(false);
  }, [markers]);

  return (
    <div className="flex flex-col gap-1">
      <div ref={box} className="w-full" role="img" aria-label={`Trace plot of ${series.map((s) => s.label).join(", ")} in ${unit}`} />
      {series.length > 1 ? (
        <ul className="flex flex-wrap gap-x-3 gap-y-1 text-xs text-ink" aria-label="Legend">
          {series.map((s, k) => (
            <li key={s.label} className="flex items-center gap-1.5">
              <span aria-hidden="true" className="inline-block h-0.5 w-4" style={{ background: `var(${TRACE_COLOURS[k % TRACE_COLOURS.length][0]})` }} />
              {s.label}
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
