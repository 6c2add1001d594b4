"use client";

import { useMemo, useState } from "react";
import type { LedgerResult } from "@/engine/checks";
import { Select } from "@/components/ui";
import { fmtHz } from "./format";

type Bar = { label: string; role: string; fraction: number };

function barsAt(result: LedgerResult, k: number): Bar[] {
  const bars: Bar[] = [{ label: `reflected at ${result.port}`, role: "reflected", fraction: result.reflected[k] }];
  for (const o of result.outputs) bars.push({ label: `out of ${o.port}`, role: "output", fraction: o.fraction[k] });
  for (const b of result.blocks) bars.push({ label: `${b.block} (${b.role})`, role: b.role, fraction: b.fraction[k] });
  for (const t of result.terminations) bars.push({ label: `open port ${t.block}:${t.port}`, role: "termination", fraction: t.fraction[k] });
  return bars.sort((a, b) => Math.abs(b.fraction) - Math.abs(a.fraction));
}

const FILL: Record<string, string> = {
  reflected: "var(--pt-warn, #B5852A)",
  output: "var(--pt-pass, #2F7A68)",
  absorbed: "var(--pt-ink, #1D2936)",
  radiated: "var(--pt-sea, #2F5F7A)",
  added: "var(--pt-fail, #B8432B)",
  termination: "var(--pt-rule-strong, #9C8E70)",
};

/**
 * Where the power entering one system port goes, at one plan frequency: horizontal bars of the fraction of
 * the incident power reflected, leaving each port, taken by each block and each open block port.
 */
export function LedgerChart({ result }: { result: LedgerResult }) {
  const mid = Math.floor(result.frequenciesHz.length / 2);
  const [k, setK] = useState(mid);
  const bars = useMemo(() => barsAt(result, Math.min(k, result.frequenciesHz.length - 1)), [result, k]);
  const max = Math.max(1e-12, ...bars.map((b) => Math.abs(b.fraction)));
  const rowH = 22;
  const labelW = 170;
  const width = 520;
  const barW = width - labelW - 70;
  const shown = bars.filter((b) => Math.abs(b.fraction) >= 1e-6 || b.role === "output");
  return (
    <figure className="flex flex-col gap-2">
      <div className="flex flex-wrap items-center gap-2 text-sm">
        <label htmlFor="ledger-frequency">Frequency</label>
        <Select id="ledger-frequency" value={String(k)} onChange={(e) => setK(Number(e.target.value))} className="w-auto">
          {result.frequenciesHz.map((f, i) => (
            <option key={i} value={i}>
              {fmtHz(f)}
            </option>
          ))}
        </Select>
        <span className="text-xs text-muted">closure {result.closure[k]?.toExponential(1)}</span>
      </div>
      <svg role="img" aria-label={`Power ledger from ${result.port} at ${fmtHz(result.frequenciesHz[k])}`} viewBox={`0 0 ${width} ${shown.length * rowH + 8}`} className="w-full max-w-[40rem]">
        {shown.map((b, i) => {
          const w = (Math.abs(b.fraction) / max) * barW;
          const y = 4 + i * rowH;
          return (
            <g key={b.label}>
              <text x={labelW - 6} y={y + 14} textAnchor="end" fontSize="11" fill="currentColor">
                {b.label}
              </text>
              <rect x={labelW} y={y + 3} width={Math.max(w, 0.5)} height={rowH - 8} fill={FILL[b.role] ?? FILL.absorbed} opacity={0.85} />
              <text x={labelW + w + 6} y={y + 14} fontSize="11" fill="currentColor" fontFamily="var(--font-mono, monospace)">
                {(b.fraction * 100).toFixed(2)} %
              </text>
            </g>
          );
        })}
      </svg>
      <figcaption className="text-xs text-muted">Fractions of 1 W incident at {result.port}, other system ports matched; a negative block share is power added (amplifier).</figcaption>
    </figure>
  );
}
