"use client";

import { useMemo, useState } from "react";
import type { LedgerResult } from "@/engine/checks";
import { Select } from "@/components/ui";
import { describeBalance, ledgerShares, type LedgerShare } from "@/lib/domain/checks/ledger-shares";
import { fmtHz } from "./format";

const FILL: Record<string, string> = {
  reflected: "var(--pt-warn, #B5852A)",
  output: "var(--pt-pass, #2F7A68)",
  absorbed: "var(--pt-ink, #1D2936)",
  radiated: "var(--pt-sea, #2F5F7A)",
  added: "var(--pt-fail, #B8432B)",
  termination: "var(--pt-rule-strong, #9C8E70)",
};

/** "−4.77 dB · 33.3 %": dB and percentage of the entering power (the reflection: of the incident power). */
function shareText(b: LedgerShare): string {
  const pct = (b.ofEntering ?? b.ofIncident) * 100;
  const db = Number.isFinite(b.db) ? `${b.db >= 0 ? "+" : ""}${b.db.toFixed(2)} dB` : "−∞ dB";
  const p = Math.abs(pct) >= 1000 ? pct.toExponential(2) : Math.abs(pct) >= 10 ? pct.toFixed(1) : pct.toPrecision(3);
  return `${db} · ${p} %${b.ofEntering === null ? " of incident" : ""}`;
}

/**
 * Where the power entering one system port goes, at one plan frequency: horizontal bars of the fraction of
 * the incident power reflected, leaving each port, taken by each block and each open block port.
 */
export function LedgerChart({ result }: { result: LedgerResult }) {
  const mid = Math.floor(result.frequenciesHz.length / 2);
  const [k, setK] = useState(mid);
  const kk = Math.min(k, result.frequenciesHz.length - 1);
  const bars = useMemo(() => ledgerShares(result, kk), [result, kk]);
  const max = Math.max(1e-12, ...bars.map((b) => Math.abs(b.ofIncident)));
  const rowH = 22;
  const labelW = 170;
  const width = 560;
  const barW = width - labelW - 150;
  const shown = bars.filter((b) => Math.abs(b.ofIncident) >= 1e-6 || b.role === "output");
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
      </div>
      <p className="text-xs" data-testid="ledger-balance">
        {describeBalance(result, kk)}
      </p>
      <svg role="img" aria-label={`Power ledger from ${result.port} at ${fmtHz(result.frequenciesHz[kk])}`} viewBox={`0 0 ${width} ${shown.length * rowH + 8}`} className="w-full max-w-[40rem]">
        {shown.map((b, i) => {
          const w = (Math.abs(b.ofIncident) / max) * barW;
          const y = 4 + i * rowH;
          return (
            <g key={b.label}>
              <text x={labelW - 6} y={y + 14} textAnchor="end" fontSize="11" fill="currentColor">
                {b.label}
              </text>
              <rect x={labelW} y={y + 3} width={Math.max(w, 0.5)} height={rowH - 8} fill={FILL[b.role] ?? FILL.absorbed} opacity={0.85} />
              <text x={labelW + w + 6} y={y + 14} fontSize="11" fill="currentColor" fontFamily="var(--font-mono, monospace)">
                {shareText(b)}
              </text>
            </g>
          );
        })}
      </svg>
      <figcaption className="text-xs text-muted">
        Each share in dB and % of the power entering {result.port} (incident less reflected); the reflection against the incident power. Other system ports matched; a negative block share is power added (amplifier).
      </figcaption>
    </figure>
  );
}
