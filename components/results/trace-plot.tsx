"use client";

import { useEffect, useId, useMemo, useRef, useState } from "react";
import { formatHz } from "@/engine/format";
import { formatNumber } from "@/lib/browser/format";
import { clipLimitToPlan, type LimitLine } from "@/lib/domain/results/limit-lines";
import { plotToCsv } from "@/lib/domain/results/plot-data";
import { niceScale, stepDecimals, ticksWithin } from "@/lib/domain/results/ticks";
import { PlotExportMenu } from "./plot-export-menu";

export type TracePlotProps = {
  /** Hz, increasing */
  frequencies: Float64Array;
  /** one or more traces over the same frequencies; the first is the main one */
  series: { label: string; values: Float64Array }[];
  /** y unit: "dB", "deg", "ns" */
  unit: string;
  /** marker frequency indices */
  markers?: number[];
  /** hovered index, or null when the pointer leaves */
  onHover?: (index: number | null) => void;
  /** a click (or Enter) on the plot: add a marker at this index */
  onPick?: (index: number) => void;
  /** limit lines of the rules on the main trace (limitLinesForTrace) */
  limits?: LimitLine[];
  /** file name stem of the exports (fileStem); without it the plot has no export menu */
  exportStem?: string;
  height?: number;
};

/** Trace colours, in order, as CSS variables (the palette of STYLE.md; a limit line is always --pt-fail). */
const TRACE_COLOURS = ["var(--pt-sea)", "var(--pt-warn)", "var(--pt-pass)", "var(--pt-muted)"];

/** The smallest span the y axis shows, so a flat trace (a pad, an isolation floor) keeps readable ticks. */
const MIN_SPAN: Record<string, number> = { dB: 2, deg: 10, ns: 0.1 };
/** dB and degrees tick at whole units at least (round dB); delays may tick finer. */
const MIN_STEP: Record<string, number> = { dB: 1, deg: 1 };

const MARGIN = { left: 56, right: 14, top: 12, bottom: 30 };
const LEGEND_ROW = 16;
/** An estimate of a legend entry's width at 11 px (the SVG has no layout engine to ask before drawing). */
const legendWidth = (text: string) => 26 + text.length * 6.4;

/** Index of the frequency nearest `hz` in an increasing array (binary search). */
function nearestIndex(frequencies: Float64Array, hz: number): number {
  let lo = 0;
  let hi = frequencies.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (frequencies[mid] <= hz) lo = mid;
    else hi = mid;
  }
  return Math.abs(frequencies[hi] - hz) < Math.abs(frequencies[lo] - hz) ? hi : lo;
}

function useWidth(fallback: number): [React.RefObject<HTMLDivElement | null>, number] {
  const box = useRef<HTMLDivElement>(null);
  const [width, setWidth] = useState(fallback);
  useEffect(() => {
    const el = box.current;
    if (!el) return;
    const measure = () => setWidth(Math.max(240, Math.floor(el.clientWidth)));
    measure();
    const observer = new ResizeObserver(measure);
    observer.observe(el);
    return () => observer.disconnect();
  }, []);
  return [box, width];
}

type LegendItem = { key: string; text: string; colour: string; dashed: boolean; x: number; row: number };

/**
 * Traces over frequency as SVG: axes ticked at 1-2-5 values (frequencies written by formatHz), the
 * rules' limit lines over their bands with the failing side shaded, markers, a hover read-out through
 * onHover and a marker on click or Enter (arrow keys move the read-out). The same SVG is what the
 * export menu saves, so a report shows what the engineer saw.
 */
export function TracePlot({ frequencies, series, unit, markers = [], onHover, onPick, limits = [], exportStem, height = 240 }: TracePlotProps) {
  const [box, width] = useWidth(520);
  const svg = useRef<SVGSVGElement>(null);
  const [cursor, setCursor] = useState<number | null>(null);
  const nf = frequencies.length;
  const fMin = nf > 0 ? frequencies[0] : 0;
  const fMax = nf > 0 ? frequencies[nf - 1] : 1;

  const limitSpans = useMemo(
    () => limits.map((line) => ({ line, span: clipLimitToPlan(line, fMin, fMax) })).filter((l): l is { line: LimitLine; span: { x0: number; x1: number } } => l.span !== null),
    [limits, fMin, fMax],
  );

  const legend = useMemo(() => {
    const items: Omit<LegendItem, "x" | "row">[] = [];
    if (series.length > 1 || limitSpans.length > 0) {
      series.forEach((s, k) => items.push({ key: `s:${s.label}`, text: s.label, colour: TRACE_COLOURS[k % TRACE_COLOURS.length], dashed: false }));
    }
    const seen = new Set<string>();
    for (const { line } of limitSpans) {
      const text = `${line.rule} (fails ${line.fails} ${formatNumber(line.db, 4)} dB)`;
      if (seen.has(text)) continue;
      seen.add(text);
      items.push({ key: `l:${text}`, text, colour: "var(--pt-fail)", dashed: true });
    }
    const placed: LegendItem[] = [];
    let x = MARGIN.left;
    let row = 0;
    for (const item of items) {
      const w = legendWidth(item.text);
      if (x > MARGIN.left && x + w > width - MARGIN.right) {
        row += 1;
        x = MARGIN.left;
      }
      placed.push({ ...item, x, row });
      x += w + 12;
    }
    return { items: placed, rows: items.length === 0 ? 0 : row + 1 };
  }, [series, limitSpans, width]);

  const plotH = height - MARGIN.top - MARGIN.bottom;
  const plotW = width - MARGIN.left - MARGIN.right;
  const totalH = height + legend.rows * LEGEND_ROW + (legend.rows > 0 ? 4 : 0);

  const scales = useMemo(() => {
    let lo = Infinity;
    let hi = -Infinity;
    for (const s of series) {
      for (const v of s.values) {
        if (Number.isFinite(v)) {
          if (v < lo) lo = v;
          if (v > hi) hi = v;
        }
      }
    }
    // a limit line is shown even when the trace is far from it: that distance is the margin people read
    for (const { line } of limitSpans) {
      lo = Math.min(lo, line.db);
      hi = Math.max(hi, line.db);
    }
    if (!Number.isFinite(lo) || !Number.isFinite(hi)) [lo, hi] = [0, 1];
    const minSpan = MIN_SPAN[unit] ?? 0;
    if (hi - lo < minSpan) {
      const mid = (lo + hi) / 2;
      [lo, hi] = [mid - minSpan / 2, mid + minSpan / 2];
    }
    // a little room at both ends, so that a limit at the edge of the data still shows its shaded side
    const pad = (hi - lo) * 0.06;
    [lo, hi] = [lo - pad, hi + pad];
    const y = niceScale(lo, hi, Math.max(3, Math.min(9, Math.floor(plotH / 28))), MIN_STEP[unit] ?? 0);
    const x = ticksWithin(fMin, fMax === fMin ? fMin + 1 : fMax, Math.max(2, Math.min(9, Math.floor(plotW / 84))));
    return { x, y };
  }, [series, limitSpans, unit, plotH, plotW, fMin, fMax]);

  const xSpan = scales.x.max - scales.x.min || 1;
  const xOf = (hz: number) => MARGIN.left + ((hz - scales.x.min) / xSpan) * plotW;
  const yOf = (v: number) => MARGIN.top + ((scales.y.max - v) / (scales.y.max - scales.y.min)) * plotH;
  const yDecimals = stepDecimals(scales.y.step);

  const paths = useMemo(
    () =>
      series.map((s) => {
        let d = "";
        let pen = false;
        for (let k = 0; k < nf; k++) {
          const v = s.values[k];
          if (!Number.isFinite(v)) {
            pen = false;
            continue;
          }
          d += `${pen ? "L" : "M"}${xOf(frequencies[k]).toFixed(1)} ${yOf(Math.min(Math.max(v, scales.y.min - 1e6), scales.y.max + 1e6)).toFixed(1)}`;
          pen = true;
        }
        return d;
      }),
    // xOf and yOf follow from these
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [series, frequencies, nf, scales, plotW, plotH],
  );

  const moveTo = (k: number | null) => {
    setCursor(k);
    onHover?.(k);
  };
  const indexAt = (clientX: number): number | null => {
    const el = svg.current;
    if (!el || nf === 0) return null;
    const rect = el.getBoundingClientRect();
    const x = ((clientX - rect.left) / rect.width) * width;
    if (x < MARGIN.left - 4 || x > width - MARGIN.right + 4) return null;
    return nearestIndex(frequencies, scales.x.min + ((x - MARGIN.left) / plotW) * xSpan);
  };

  const name = `Trace plot of ${series.map((s) => s.label).join(", ")} in ${unit}`;
  const clipId = `trace-clip-${useId().replace(/[^A-Za-z0-9_-]/g, "")}`;
  const top = MARGIN.top;
  const bottom = MARGIN.top + plotH;

  return (
    <div className="flex flex-col gap-1">
      {exportStem ? (
        <div className="flex justify-end">
          <PlotExportMenu
            what="trace plot"
            stem={`${exportStem}-${unit === "deg" ? "phase" : unit === "ns" ? "delay" : "magnitude"}`}
            svg={() => svg.current}
            csv={() => plotToCsv(frequencies, series.map((s) => ({ label: s.label, unit, values: s.values })))}
          />
        </div>
      ) : null}
      <div ref={box} className="w-full">
        <svg
          ref={svg}
          width={width}
          height={totalH}
          viewBox={`0 0 ${width} ${totalH}`}
          role="img"
          aria-label={name}
          tabIndex={0}
          data-plot="trace"
          className="block cursor-crosshair rounded focus-visible:outline-2 focus-visible:outline-[var(--pt-focus)]"
          fontFamily="var(--font-mono, monospace)"
          fontSize={10.5}
          onPointerMove={(e) => moveTo(indexAt(e.clientX))}
          onPointerLeave={() => moveTo(null)}
          onClick={(e) => {
            const k = indexAt(e.clientX);
            if (k !== null) onPick?.(k);
          }}
          onKeyDown={(e) => {
            if (nf === 0) return;
            const step = e.shiftKey ? Math.max(1, Math.round(nf / 20)) : 1;
            if (e.key === "ArrowRight" || e.key === "ArrowLeft") {
              e.preventDefault();
              const from = cursor ?? (e.key === "ArrowRight" ? -step : nf - 1 + step);
              moveTo(Math.min(nf - 1, Math.max(0, from + (e.key === "ArrowRight" ? step : -step))));
            } else if (e.key === "Enter" && cursor !== null) {
              e.preventDefault();
              onPick?.(cursor);
            } else if (e.key === "Escape" && cursor !== null) {
              moveTo(null);
            }
          }}
          onBlur={() => (cursor !== null ? moveTo(null) : undefined)}
        >
          <defs>
            <clipPath id={clipId}>
              <rect x={MARGIN.left} y={top} width={plotW} height={plotH} />
            </clipPath>
          </defs>
          <g stroke="var(--pt-rule)" strokeWidth={1}>
            {scales.y.ticks.map((v) => (
              <line key={`gy${v}`} x1={MARGIN.left} x2={MARGIN.left + plotW} y1={yOf(v)} y2={yOf(v)} />
            ))}
            {scales.x.ticks.map((v) => (
              <line key={`gx${v}`} x1={xOf(v)} x2={xOf(v)} y1={top} y2={bottom} />
            ))}
          </g>
          <g clipPath={`url(#${clipId})`}>
            {limitSpans.map(({ line, span }, k) => {
              const y = Math.min(bottom, Math.max(top, yOf(line.db)));
              const x0 = xOf(span.x0);
              const x1 = Math.max(xOf(span.x1), x0 + 1);
              return (
                <g key={`lim${k}`} data-limit={line.rule}>
                  <rect x={x0} width={x1 - x0} y={line.fails === "above" ? top : y} height={line.fails === "above" ? y - top : bottom - y} fill="var(--pt-fail)" fillOpacity={0.08} />
                  <line x1={x0} x2={x1} y1={y} y2={y} stroke="var(--pt-fail)" strokeWidth={1.5} strokeDasharray="6 3" />
                </g>
              );
            })}
            {paths.map((d, k) => (
              <path key={`p${k}`} d={d} fill="none" stroke={TRACE_COLOURS[k % TRACE_COLOURS.length]} strokeWidth={k === 0 ? 1.75 : 1.25} strokeLinejoin="round" />
            ))}
            {markers.map((k, n) =>
              frequencies[k] === undefined ? null : (
                <g key={`m${n}`} stroke="var(--pt-fail)">
                  <line x1={xOf(frequencies[k])} x2={xOf(frequencies[k])} y1={top} y2={bottom} strokeDasharray="4 3" />
                  <text x={xOf(frequencies[k]) + 3} y={top + 11} fill="var(--pt-fail-strong)" stroke="none">
                    M{n + 1}
                  </text>
                </g>
              ),
            )}
            {limitSpans.map(({ line, span }, k) => {
              const y = Math.min(bottom, Math.max(top, yOf(line.db)));
              // the name sits on the failing side, inside the shade, so it never covers the passing trace's side
              const ty = line.fails === "above" ? Math.max(top + 10, y - 4) : Math.min(bottom - 3, y + 12);
              return (
                <text key={`lt${k}`} x={xOf(span.x0) + 4} y={ty} fill="var(--pt-fail-strong)" fontSize={10} fontFamily="var(--font-sans, sans-serif)" paintOrder="stroke" stroke="var(--pt-surface)" strokeWidth={3} strokeLinejoin="round">
                  {line.rule}
                </text>
              );
            })}
            {cursor !== null && frequencies[cursor] !== undefined ? (
              <g data-export="skip">
                <line x1={xOf(frequencies[cursor])} x2={xOf(frequencies[cursor])} y1={top} y2={bottom} stroke="var(--pt-muted)" strokeWidth={1} />
                {series.map((s, k) =>
                  Number.isFinite(s.values[cursor]) ? (
                    <circle key={`c${k}`} cx={xOf(frequencies[cursor])} cy={yOf(s.values[cursor])} r={3.5} fill={TRACE_COLOURS[k % TRACE_COLOURS.length]} />
                  ) : null,
                )}
              </g>
            ) : null}
          </g>
          <rect x={MARGIN.left} y={top} width={plotW} height={plotH} fill="none" stroke="var(--pt-rule-strong)" strokeWidth={1} />
          <g fill="var(--pt-ink)" data-axis="y">
            {scales.y.ticks.map((v) => (
              <text key={`ty${v}`} x={MARGIN.left - 5} y={yOf(v) + 3.5} textAnchor="end">
                {formatNumber(Number(v.toFixed(yDecimals)), 6)}
              </text>
            ))}
            <text x={12} y={top + plotH / 2} textAnchor="middle" transform={`rotate(-90 12 ${top + plotH / 2})`} fontFamily="var(--font-sans, sans-serif)" fontSize={11}>
              {unit}
            </text>
          </g>
          <g fill="var(--pt-ink)" data-axis="x">
            {scales.x.ticks.map((v, k) => (
              <text key={`tx${v}`} x={xOf(v)} y={bottom + 15} textAnchor={k === 0 && xOf(v) - MARGIN.left < 24 ? "start" : k === scales.x.ticks.length - 1 && MARGIN.left + plotW - xOf(v) < 24 ? "end" : "middle"}>
                {formatHz(v)}
              </text>
            ))}
          </g>
          {legend.items.length > 0 ? (
            <g aria-label="Legend" fontFamily="var(--font-sans, sans-serif)" fontSize={11}>
              {legend.items.map((item) => {
                const y = height + 4 + item.row * LEGEND_ROW;
                return (
                  <g key={item.key}>
                    <line x1={item.x} x2={item.x + 18} y1={y - 4} y2={y - 4} stroke={item.colour} strokeWidth={item.dashed ? 1.5 : 2} strokeDasharray={item.dashed ? "6 3" : undefined} />
                    <text x={item.x + 24} y={y} fill="var(--pt-ink)">
                      {item.text}
                    </text>
                  </g>
                );
              })}
            </g>
          ) : null}
        </svg>
      </div>
    </div>
  );
}
