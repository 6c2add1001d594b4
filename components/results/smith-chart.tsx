"use client";

import { useMemo, useRef, useState } from "react";
import { elementAt, reflectionToImpedance, type SolvedView } from "@/lib/domain/results/results-math";
import { formatHz } from "@/engine/format";
import { formatFixed, formatImpedance } from "@/lib/browser/format";

export type SmithChartProps = {
  view: SolvedView;
  /** system port index (0-based) whose reflection S_pp is drawn */
  port: number;
  /** frequency index to mark (e.g. the port matrix's frequency) */
  highlight?: number;
};

const R_CIRCLES = [0.2, 0.5, 1, 2, 5];
const X_ARCS = [0.2, 0.5, 1, 2, 5];

/**
 * Constant-resistance circle r: centre (r/(1+r), 0), radius 1/(1+r); constant-reactance circle x:
 * centre (1, 1/x), radius 1/|x| (Pozar, Microwave Engineering, 4th ed., §2.4). SVG y grows downwards,
 * so Im Γ is drawn as −y.
 */
function Grid() {
  return (
    <g fill="none" stroke="var(--pt-rule)" strokeWidth={0.006}>
      <clipPath id="smith-unit">
        <circle cx={0} cy={0} r={1} />
      </clipPath>
      <circle cx={0} cy={0} r={1} stroke="var(--pt-ink)" strokeWidth={0.01} />
      <line x1={-1} y1={0} x2={1} y2={0} />
      <g clipPath="url(#smith-unit)">
        {R_CIRCLES.map((r) => (
          <circle key={`r${r}`} cx={r / (1 + r)} cy={0} r={1 / (1 + r)} />
        ))}
        {X_ARCS.flatMap((x) => [
          <circle key={`x+${x}`} cx={1} cy={-1 / x} r={1 / x} />,
          <circle key={`x-${x}`} cx={1} cy={1 / x} r={1 / x} />,
        ])}
      </g>
      <g fill="var(--pt-muted)" stroke="none" fontSize={0.055} fontFamily="var(--font-mono, monospace)">
        {R_CIRCLES.map((r) => (
          <text key={`tr${r}`} x={(r - 1) / (1 + r) + 0.012} y={-0.015}>
            {r}
          </text>
        ))}
        {X_ARCS.map((x) => {
          // where the x arc meets the unit circle: Γ = (jx − 1)/(jx + 1) … = ((x² − 1) + 2jx)/(x² + 1)
          const re = (x * x - 1) / (x * x + 1);
          const im = (2 * x) / (x * x + 1);
          return (
            <g key={`tx${x}`}>
              <text x={re * 1.06 - 0.03} y={-im * 1.06}>
                +j{x}
              </text>
              <text x={re * 1.06 - 0.03} y={im * 1.06 + 0.04}>
                −j{x}
              </text>
            </g>
          );
        })}
      </g>
    </g>
  );
}

/** Smith chart of the reflection at one system port over the plan, with a hover read-out of Γ and Z. */
export function SmithChart({ view, port, highlight }: SmithChartProps) {
  const svg = useRef<SVGSVGElement>(null);
  const [hover, setHover] = useState<number | null>(null);
  const z0 = view.portZ0[port] ?? 50;

  const points = useMemo(() => {
    const out: [number, number][] = [];
    for (let k = 0; k < view.s.nf; k++) out.push(elementAt(view.s, k, port, port));
    return out;
  }, [view, port]);

  const path = points.map(([re, im], k) => `${k === 0 ? "M" : "L"}${re.toFixed(5)} ${(-im).toFixed(5)}`).join("");

  const onMove = (e: React.MouseEvent<SVGSVGElement>) => {
    const el = svg.current;
    const ctm = el?.getScreenCTM();
    if (!el || !ctm) return;
    const p = new DOMPoint(e.clientX, e.clientY).matrixTransform(ctm.inverse());
    let best = 0;
    let bestD = Infinity;
    points.forEach(([re, im], k) => {
      const d = (re - p.x) ** 2 + (-im - p.y) ** 2;
      if (d < bestD) {
        bestD = d;
        best = k;
      }
    });
    setHover(bestD < 0.04 ? best : null);
  };

  const shown = hover ?? highlight ?? null;
  const readout = shown === null ? null : describe(view, points, shown, z0);
  const name = view.ports[port];

  return (
    <figure className="flex flex-col gap-1.5">
      <svg
        ref={svg}
        viewBox="-1.16 -1.16 2.32 2.32"
        className="aspect-square w-full max-w-[22rem] self-center"
        role="img"
        aria-label={`Smith chart of the reflection at ${name} (Z0 ${formatFixed(z0, 1)} Ω)`}
        onMouseMove={onMove}
        onMouseLeave={() => setHover(null)}
      >
        <Grid />
        <path d={path} fill="none" stroke="var(--pt-sea)" strokeWidth={0.012} strokeLinejoin="round" />
        {points.length > 0 ? (
          <>
            <circle cx={points[0][0]} cy={-points[0][1]} r={0.02} fill="var(--pt-paper)" stroke="var(--pt-sea)" strokeWidth={0.008} />
            <circle cx={points[points.length - 1][0]} cy={-points[points.length - 1][1]} r={0.02} fill="var(--pt-sea)" />
          </>
        ) : null}
        {shown !== null && points[shown] ? (
          <circle cx={points[shown][0]} cy={-points[shown][1]} r={0.028} fill="none" stroke="var(--pt-fail)" strokeWidth={0.01} />
        ) : null}
      </svg>
      <figcaption className="text-xs text-muted">
        Reflection at {name}; open dot: start of the plan, filled dot: stop.
      </figcaption>
      <output aria-label="Smith chart read-out" className="figures min-h-[2.5rem] text-xs text-ink">
        {readout ?? "Point at the locus to read Γ and Z."}
      </output>
    </figure>
  );
}

function describe(view: SolvedView, points: [number, number][], k: number, z0: number): string {
  const [re, im] = points[k];
  const mag = Math.hypot(re, im);
  const ang = (Math.atan2(im, re) * 180) / Math.PI;
  const [r, x] = reflectionToImpedance(re, im, z0);
  const z = Number.isFinite(r) ? formatImpedance(r, x) : "open (∞)";
  return `${formatHz(view.frequencies[k])} · Γ = ${formatFixed(mag, 4)} ∠ ${formatFixed(ang, 1)}° · Z = ${z}`;
}
