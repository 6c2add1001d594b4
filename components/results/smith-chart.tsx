"use client";

import { useEffect, useId, useMemo, useRef, useState } from "react";
import { Minus, Plus, RotateCcw } from "lucide-react";
import { Button } from "@/components/ui";
import { elementAt, reflectionToImpedance, sName, type SolvedView } from "@/lib/domain/results/results-math";
import { panSmith, plotToCsv, smithReadout, SMITH_HALF_SPAN, SMITH_HOME, zoomSmith, type SmithView } from "@/lib/domain/results/plot-data";
import { formatHz } from "@/engine/format";
import { formatFixed, formatImpedance, formatNumber } from "@/lib/browser/format";
import { PlotExportMenu } from "./plot-export-menu";

export type SmithChartProps = {
  view: SolvedView;
  /** system port index (0-based) whose reflection S_pp is drawn */
  port: number;
  /** frequency index to mark (e.g. the port matrix's frequency) */
  highlight?: number;
  /** file name stem of the exports (fileStem); without it the chart has no export menu */
  exportStem?: string;
};

const R_CIRCLES = [0.2, 0.5, 1, 2, 5];
const X_ARCS = [0.2, 0.5, 1, 2, 5];
/** Finer circles and arcs drawn once the chart is zoomed in enough to read them. */
const FINE = [0.1, 0.3, 0.4, 0.6, 0.7, 0.8, 0.9, 1.5, 3, 4, 10];
const ZOOM_STEP = 1.5;

/**
 * Constant-resistance circle r: centre (r/(1+r), 0), radius 1/(1+r); constant-reactance circle x:
 * centre (1, 1/x), radius 1/|x| (Pozar, Microwave Engineering, 4th ed., §2.4). SVG y grows downwards,
 * so Im Γ is drawn as −y. Strokes do not scale with the zoom; labels keep their size on screen.
 */
function Grid({ zoom, clipId }: { zoom: number; clipId: string }) {
  const circles = zoom >= 3 ? [...R_CIRCLES, ...FINE] : R_CIRCLES;
  const arcs = zoom >= 3 ? [...X_ARCS, ...FINE] : X_ARCS;
  const font = 0.055 / Math.sqrt(zoom);
  return (
    <g fill="none" stroke="var(--pt-rule)" strokeWidth={1} vectorEffect="non-scaling-stroke">
      <clipPath id={clipId}>
        <circle cx={0} cy={0} r={1} />
      </clipPath>
      <circle cx={0} cy={0} r={1} stroke="var(--pt-ink)" strokeWidth={1.5} vectorEffect="non-scaling-stroke" />
      <line x1={-1} y1={0} x2={1} y2={0} vectorEffect="non-scaling-stroke" />
      <g clipPath={`url(#${clipId})`}>
        {circles.map((r) => (
          <circle key={`r${r}`} cx={r / (1 + r)} cy={0} r={1 / (1 + r)} vectorEffect="non-scaling-stroke" />
        ))}
        {arcs.flatMap((x) => [
          <circle key={`x+${x}`} cx={1} cy={-1 / x} r={1 / x} vectorEffect="non-scaling-stroke" />,
          <circle key={`x-${x}`} cx={1} cy={1 / x} r={1 / x} vectorEffect="non-scaling-stroke" />,
        ])}
      </g>
      <g fill="var(--pt-muted)" stroke="none" fontSize={font} fontFamily="var(--font-mono, monospace)">
        {circles.map((r) => (
          <text key={`tr${r}`} x={(r - 1) / (1 + r) + font * 0.2} y={-font * 0.3}>
            {r}
          </text>
        ))}
        {arcs.map((x) => {
          // where the x arc meets the unit circle: Γ = (jx − 1)/(jx + 1) = ((x² − 1) + 2jx)/(x² + 1)
          const re = (x * x - 1) / (x * x + 1);
          const im = (2 * x) / (x * x + 1);
          return (
            <g key={`tx${x}`}>
              <text x={re * 1.06 - font * 0.55} y={-im * 1.06}>
                +j{x}
              </text>
              <text x={re * 1.06 - font * 0.55} y={im * 1.06 + font * 0.7}>
                −j{x}
              </text>
            </g>
          );
        })}
      </g>
    </g>
  );
}

/** "z = 1.2 + j0.5" with a real minus sign. */
function formatNormalised(r: number, x: number): string {
  if (!Number.isFinite(r)) return "open (∞)";
  return `${formatNumber(r, 4)} ${x < 0 ? "\u2212" : "+"} j${formatNumber(Math.abs(x), 4)}`;
}

/** What the chart reads at Γ: magnitude and angle, z normalised to the port's Z0, and Z in Ω. */
export function describeGamma(re: number, im: number, z0: number): string {
  const out = smithReadout(re, im, z0);
  const z = Number.isFinite(out.r) ? formatImpedance(out.resistance, out.reactance) : "open (∞)";
  return `Γ = ${formatFixed(out.magnitude, 4)} ∠ ${formatFixed(out.angleDeg, 1)}° · z = ${formatNormalised(out.r, out.x)} · Z = ${z}`;
}

/**
 * Smith chart of the reflection at one system port over the plan: zoom with the wheel, the buttons or
 * the keyboard (+, −, 0 to reset, arrows to pan), and a read-out of Γ, z and Z under the pointer (or at
 * the view's centre when the keyboard drives it), beside the nearest point of the locus.
 */
export function SmithChart({ view, port, highlight, exportStem }: SmithChartProps) {
  const svg = useRef<SVGSVGElement>(null);
  const [hover, setHover] = useState<number | null>(null);
  const [probe, setProbe] = useState<[number, number] | null>(null);
  const [zoom, setZoom] = useState<SmithView>(SMITH_HOME);
  const clipId = `smith-unit-${useId().replace(/[^A-Za-z0-9_-]/g, "")}`;
  const z0 = view.portZ0[port] ?? 50;

  const points = useMemo(() => {
    const out: [number, number][] = [];
    for (let k = 0; k < view.s.nf; k++) out.push(elementAt(view.s, k, port, port));
    return out;
  }, [view, port]);

  const path = points.map(([re, im], k) => `${k === 0 ? "M" : "L"}${re.toFixed(5)} ${(-im).toFixed(5)}`).join("");

  /** The Γ-plane point under a client position. */
  const gammaAt = (clientX: number, clientY: number): [number, number] | null => {
    const ctm = svg.current?.getScreenCTM();
    if (!ctm) return null;
    const p = new DOMPoint(clientX, clientY).matrixTransform(ctm.inverse());
    return [p.x, -p.y];
  };

  const nearestPoint = (g: [number, number], zoomFactor: number): number | null => {
    let best = 0;
    let bestD = Infinity;
    points.forEach(([re, im], k) => {
      const d = (re - g[0]) ** 2 + (im - g[1]) ** 2;
      if (d < bestD) {
        bestD = d;
        best = k;
      }
    });
    return bestD < 0.04 / (zoomFactor * zoomFactor) ? best : null;
  };

  // the wheel zooms about the pointer; a passive React listener could not keep the page from scrolling
  useEffect(() => {
    const el = svg.current;
    if (!el) return;
    const wheel = (e: WheelEvent) => {
      const ctm = el.getScreenCTM();
      if (!ctm) return;
      e.preventDefault();
      const p = new DOMPoint(e.clientX, e.clientY).matrixTransform(ctm.inverse());
      const factor = Math.exp(-e.deltaY * 0.002);
      setZoom((v) => zoomSmith(v, factor, p.x, -p.y));
    };
    el.addEventListener("wheel", wheel, { passive: false });
    return () => el.removeEventListener("wheel", wheel);
  }, []);

  const zoomBy = (factor: number) => {
    const next = zoomSmith(zoom, factor);
    setZoom(next);
    if (probe && document.activeElement === svg.current) setProbe([next.cx, next.cy]);
  };
  const reset = () => {
    setZoom(SMITH_HOME);
    if (probe && document.activeElement === svg.current) setProbe([0, 0]);
  };

  const half = SMITH_HALF_SPAN / zoom.zoom;
  const viewBox = `${zoom.cx - half} ${-zoom.cy - half} ${2 * half} ${2 * half}`;
  const shown = hover ?? highlight ?? null;
  const name = view.ports[port];
  const dot = 0.02 / zoom.zoom;
  const locus = shown === null || !points[shown] ? null : `${formatHz(view.frequencies[shown])} · ${describeGamma(points[shown][0], points[shown][1], z0)}`;

  const csv = () => {
    const re = Float64Array.from(points, (p) => p[0]);
    const im = Float64Array.from(points, (p) => p[1]);
    const mag = Float64Array.from(points, (p) => Math.hypot(p[0], p[1]));
    const ang = Float64Array.from(points, (p) => (Math.atan2(p[1], p[0]) * 180) / Math.PI);
    const zs = points.map((p) => reflectionToImpedance(p[0], p[1], z0));
    const s = `${sName(port, port)} at ${name}`;
    return plotToCsv(view.frequencies, [
      { label: `Re ${s}`, unit: "1", values: re },
      { label: `Im ${s}`, unit: "1", values: im },
      { label: `|${s}|`, unit: "1", values: mag },
      { label: `arg ${s}`, unit: "deg", values: ang },
      { label: `R at ${name}`, unit: "Ω", values: Float64Array.from(zs, (z) => z[0]) },
      { label: `X at ${name}`, unit: "Ω", values: Float64Array.from(zs, (z) => (Number.isFinite(z[0]) ? z[1] : Number.NaN)) },
    ]);
  };

  return (
    <figure className="flex flex-col gap-1.5">
      <div className="flex items-center justify-end gap-1" role="group" aria-label="Smith chart zoom">
        <span className="figures mr-auto text-xs text-muted" data-testid="smith-zoom">
          {formatNumber(zoom.zoom, 3)}×
        </span>
        <Button variant="ghost" size="sm" aria-label="Zoom in on the Smith chart" onClick={() => zoomBy(ZOOM_STEP)}>
          <Plus aria-hidden="true" className="h-3.5 w-3.5" />
        </Button>
        <Button variant="ghost" size="sm" aria-label="Zoom out of the Smith chart" onClick={() => zoomBy(1 / ZOOM_STEP)} disabled={zoom.zoom <= 1}>
          <Minus aria-hidden="true" className="h-3.5 w-3.5" />
        </Button>
        <Button variant="ghost" size="sm" aria-label="Reset the Smith chart zoom" onClick={reset} disabled={zoom.zoom === 1 && zoom.cx === 0 && zoom.cy === 0}>
          <RotateCcw aria-hidden="true" className="h-3.5 w-3.5" />
        </Button>
        {exportStem ? <PlotExportMenu what="Smith chart" stem={exportStem} svg={() => svg.current} csv={csv} /> : null}
      </div>
      <svg
        ref={svg}
        viewBox={viewBox}
        className="aspect-square w-full max-w-[22rem] cursor-crosshair self-center rounded focus-visible:outline-2 focus-visible:outline-[var(--pt-focus)]"
        role="img"
        tabIndex={0}
        data-plot="smith"
        aria-label={`Smith chart of the reflection at ${name} (Z0 ${formatFixed(z0, 1)} Ω); + and − zoom, 0 resets, arrows pan`}
        onPointerMove={(e) => {
          const g = gammaAt(e.clientX, e.clientY);
          setProbe(g);
          setHover(g ? nearestPoint(g, zoom.zoom) : null);
        }}
        onPointerLeave={() => {
          setHover(null);
          setProbe(null);
        }}
        onFocus={() => setProbe((p) => p ?? [zoom.cx, zoom.cy])}
        onBlur={() => setProbe(null)}
        onKeyDown={(e) => {
          const pan = 0.1 / zoom.zoom;
          const move = { ArrowLeft: [-pan, 0], ArrowRight: [pan, 0], ArrowUp: [0, pan], ArrowDown: [0, -pan] }[e.key];
          let next: SmithView | null = null;
          if (e.key === "+" || e.key === "=") next = zoomSmith(zoom, ZOOM_STEP);
          else if (e.key === "-" || e.key === "_") next = zoomSmith(zoom, 1 / ZOOM_STEP);
          else if (e.key === "0") next = SMITH_HOME;
          else if (move) next = panSmith(zoom, move[0], move[1]);
          if (!next) return;
          e.preventDefault();
          setZoom(next);
          setProbe([next.cx, next.cy]);
          setHover(nearestPoint([next.cx, next.cy], next.zoom));
        }}
      >
        <Grid zoom={zoom.zoom} clipId={clipId} />
        <path d={path} fill="none" stroke="var(--pt-sea)" strokeWidth={2} vectorEffect="non-scaling-stroke" strokeLinejoin="round" />
        {points.length > 0 ? (
          <>
            <circle cx={points[0][0]} cy={-points[0][1]} r={dot} fill="var(--pt-surface)" stroke="var(--pt-sea)" strokeWidth={1.5} vectorEffect="non-scaling-stroke" />
            <circle cx={points[points.length - 1][0]} cy={-points[points.length - 1][1]} r={dot} fill="var(--pt-sea)" />
          </>
        ) : null}
        {shown !== null && points[shown] ? (
          <circle cx={points[shown][0]} cy={-points[shown][1]} r={dot * 1.4} fill="none" stroke="var(--pt-fail)" strokeWidth={1.75} vectorEffect="non-scaling-stroke" data-export={hover !== null ? "skip" : undefined} />
        ) : null}
        {probe ? (
          <g data-export="skip" stroke="var(--pt-ink)" strokeWidth={1} vectorEffect="non-scaling-stroke">
            <line x1={probe[0] - dot * 1.5} x2={probe[0] + dot * 1.5} y1={-probe[1]} y2={-probe[1]} vectorEffect="non-scaling-stroke" />
            <line x1={probe[0]} x2={probe[0]} y1={-probe[1] - dot * 1.5} y2={-probe[1] + dot * 1.5} vectorEffect="non-scaling-stroke" />
          </g>
        ) : null}
      </svg>
      <figcaption className="text-xs text-muted">
        Reflection at {name} (Z0 {formatNumber(z0, 4)} Ω); open dot: start of the plan, filled dot: stop. Wheel or +/− to zoom, 0 to reset.
      </figcaption>
      <output aria-label="Smith chart pointer read-out" className="figures min-h-5 text-xs text-ink">
        {probe ? `Pointer: ${describeGamma(probe[0], probe[1], z0)}` : "Point at the chart to read Γ, z and Z there."}
      </output>
      <output aria-label="Smith chart read-out" className="figures min-h-[2.5rem] text-xs text-ink">
        {locus ?? "Point at the locus to read it at a plan frequency."}
      </output>
    </figure>
  );
}
