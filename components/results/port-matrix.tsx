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
                          h > 0.55 ? "text-on-ink" : "text-ink",
                        )}
                        style={{ background: `color-mix(in srgb, var(--pt-sea) ${Math.round(h * 100)}%, var(--pt-surface))`, paddingRight: 6 }}
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
