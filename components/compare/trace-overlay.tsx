"use client";

import { fmtHz } from "@/components/checks/format";

export type OverlaySeries = { label: string; hz: number[]; db: number[]; colour: string; dashed?: boolean };

/** Two (or more) |S_ij| traces in dB on one frequency axis: a small SVG of our own. */
export function TraceOverlay({ series, title }: { series: OverlaySeries[]; title: string }) {
  const all = series.flatMap((s) => s.db.filter(Number.isFinite));
  const hzAll = series.flatMap((s) => s.hz);
  if (all.length === 0 || hzAll.length === 0) return <p className="text-sm text-muted">No data to plot.</p>;
  let lo = Math.min(...all);
  let hi = Math.max(...all);
  if (hi - lo < 1) {
    lo -= 0.5;
    hi += 0.5;
  }
  const f0 = Math.min(...hzAll);
  const f1 = Math.max(...hzAll);
  const W = 640;
  const H = 260;
  const L = 52;
  const B = 28;
  const x = (f: number) => L + ((f - f0) / Math.max(f1 - f0, 1)) * (W - L - 10);
  const y = (d: number) => 8 + ((hi - d) / (hi - lo)) * (H - B - 8);
  const ticks = Array.from({ length: 5 }, (_, i) => lo + ((hi - lo) * i) / 4);
  return (
    <figure className="flex flex-col gap-1">
      <svg role="img" aria-label={title} viewBox={`0 0 ${W} ${H}`} className="w-full max-w-[48rem] rounded-card border border-rule bg-surface">
        {ticks.map((t) => (
          <g key={t}>
            <line x1={L} x2={W - 10} y1={y(t)} y2={y(t)} stroke="var(--pt-rule)" strokeWidth={0.75} />
            <text x={L - 6} y={y(t) + 4} textAnchor="end" fontSize="10" fill="currentColor">
              {t.toFixed(1)}
            </text>
          </g>
        ))}
        <text x={L} y={H - 8} fontSize="10" fill="currentColor">
          {fmtHz(f0)}
        </text>
        <text x={W - 10} y={H - 8} fontSize="10" textAnchor="end" fill="currentColor">
          {fmtHz(f1)}
        </text>
        <text x={8} y={14} fontSize="10" fill="currentColor">
          dB
        </text>
        {series.map((s) => (
          <polyline
            key={s.label}
            fill="none"
            stroke={s.colour}
            strokeWidth={1.75}
            strokeDasharray={s.dashed ? "6 4" : undefined}
            points={s.hz
              .map((f, i) => (Number.isFinite(s.db[i]) ? `${x(f).toFixed(1)},${y(s.db[i]).toFixed(1)}` : null))
              .filter(Boolean)
              .join(" ")}
          />
        ))}
      </svg>
      <figcaption className="flex flex-wrap gap-4 text-xs">
        {series.map((s) => (
          <span key={s.label} className="flex items-center gap-1.5">
            <svg width="22" height="6" aria-hidden="true">
              <line x1="0" x2="22" y1="3" y2="3" stroke={s.colour} strokeWidth="2" strokeDasharray={s.dashed ? "6 4" : undefined} />
            </svg>
            {s.label}
          </span>
        ))}
      </figcaption>
    </figure>
  );
}
