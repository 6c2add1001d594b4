"use client";

import { elementAt, sName, traceLabel, type SolvedView } from "@/lib/domain/results/results-math";
import { formatHz } from "@/engine/format";
import { formatFixed } from "@/lib/browser/format";
import { cn } from "@/components/ui/cn";

export type PortMatrixProps = {
  view: SolvedView;
  /** frequency index */
  index: number;
  onIndexChange: (index: number) => void;
  /** the trace currently shown (0-based i, j) */
  active: [number, number];
  /** a cell was picked: show its trace */
  onPick: (i: number, j: number) => void;
};

/** dB → heat 0…1: 0 dB (everything passes) is full, −60 dB and below is empty. */
function heat(db: number): number {
  if (!Number.isFinite(db)) return 0;
  return Math.min(1, Math.max(0, (db + 60) / 60));
}

/** Above this heat the figure is written light on a dark cell, at or below it dark on a light cell. */
const HEAT_SPLIT = 0.55;

/**
 * Percent of sea in a cell's background. Two bands, so the figure always reads at 4.5:1 or better
 * (WCAG 2.1 SC 1.4.3, contrast ratio from relative luminance) in both themes: ink on 0–45 % sea
 * (worst 4.69:1, dark theme), on-ink on 90–100 % sea (worst 4.79:1, light theme). A continuous
 * 0–100 % ramp put ink on 60 % sea at 2.58:1 in the dark theme.
 */
function heatMix(h: number): number {
  return Math.round(h <= HEAT_SPLIT ? (h / HEAT_SPLIT) * 45 : 90 + ((h - HEAT_SPLIT) / (1 - HEAT_SPLIT)) * 10);
}

/** The port-to-port matrix |S_ij| dB at one plan frequency as a heat map; each cell shows its trace when picked. */
export function PortMatrix({ view, index, onIndexChange, active, onPick }: PortMatrixProps) {
  const n = view.s.n;
  const k = Math.min(Math.max(0, index), view.s.nf - 1);
  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap items-center gap-3">
        <label className="flex flex-1 items-center gap-2 text-xs text-muted">
          Frequency
          <input
            type="range"
            min={0}
            max={Math.max(0, view.s.nf - 1)}
            step={1}
            value={k}
            onChange={(e) => onIndexChange(Number(e.target.value))}
            aria-label="Matrix frequency"
            aria-valuetext={formatHz(view.frequencies[k])}
            className="flex-1 accent-[var(--pt-ink)]"
          />
        </label>
        <span className="figures text-sm text-ink" aria-live="off" data-testid="matrix-frequency">
          {formatHz(view.frequencies[k])}
        </span>
      </div>
      <div className="overflow-x-auto">
        <table className="border-collapse text-xs" aria-label={`Port matrix |S| in dB at ${formatHz(view.frequencies[k])}`}>
          <thead>
            <tr>
              <th scope="col" className="px-1.5 py-1 text-left font-normal text-muted">
                to ↓ / from →
              </th>
              {view.ports.map((p) => (
                <th key={p} scope="col" className="px-1.5 py-1 font-mono font-semibold text-ink">
                  {p}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {Array.from({ length: n }, (_, i) => (
              <tr key={i}>
                <th scope="row" className="px-1.5 py-1 text-left font-mono font-semibold text-ink">
                  {view.ports[i]}
                </th>
                {Array.from({ length: n }, (_, j) => {
                  const [re, im] = elementAt(view.s, k, i, j);
                  const db = 20 * Math.log10(Math.hypot(re, im));
                  const h = heat(db);
                  const isActive = active[0] === i && active[1] === j;
                  const text = Number.isFinite(db) ? formatFixed(db, 2) : "−∞";
                  return (
                    <td key={j} className="p-0.5">
                      <button
                        type="button"
                        onClick={() => onPick(i, j)}
                        aria-label={`${traceLabel(view.ports, i, j)}: ${text} dB, show trace`}
                        aria-pressed={isActive}
                        title={`${sName(i, j)} = ${text} dB`}
                        className={cn(
                          "figures h-9 w-[4.75rem] rounded border text-right text-xs",
                          isActive ? "border-ink border-2" : "border-rule",
                          h > HEAT_SPLIT ? "text-on-ink" : "text-ink",
                        )}
                        style={{ background: `color-mix(in srgb, var(--pt-sea) ${heatMix(h)}%, var(--pt-surface))`, paddingRight: 6 }}
                      >
                        {text}
                      </button>
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
