"use client";

import { useMemo, useState } from "react";
import type { LineupResult } from "@/engine/lineup";
import { Table, TBody, THead, Td, Th, Tr } from "@/components/ui";
import { TracePlot } from "@/components/results/trace-plot";
import { fmt, fmtHz } from "./format";
import { NotesAlert } from "./notes-alert";

/** A stored figure: JSON turns ∞ and NaN into null. */
const value = (x: number | null | undefined): number => (typeof x === "number" ? x : NaN);

/**
 * A line-up (docs/checks.md#line-up): the stage table and the level and noise figure along the path at
 * one plan frequency (slider), and the gain and noise figure from end to end over the plan.
 */
export function LineupView({ result }: { result: LineupResult }) {
  const nf = result.frequencies.length;
  const [k, setK] = useState(Math.floor((nf - 1) / 2));
  const [hover, setHover] = useState<number | null>(null);
  const [markers, setMarkers] = useState<number[]>([]);
  const frequencies = useMemo(() => Float64Array.from(result.frequencies), [result]);
  const series = useMemo(
    () => [
      { label: `Gain ${result.from}→${result.to}`, values: Float64Array.from(result.gainDb, value) },
      { label: `Noise figure ${result.from}→${result.to}`, values: Float64Array.from(result.nfDb, value) },
    ],
    [result],
  );
  const withLevels = result.inputDbm !== null;
  const readout = hover === null ? "Point at the traces to read them." : `${fmtHz(result.frequencies[hover])} · gain ${fmt(value(result.gainDb[hover]))} dB · noise figure ${fmt(value(result.nfDb[hover]))} dB`;
  return (
    <div className="flex flex-col gap-3">
      <p className="text-sm">
        Path ({result.path.source === "given" ? "given blocks" : `strongest leak-trace path at ${fmtHz(result.path.frequencyHz)}`}):{" "}
        <span className="font-mono">{result.path.text}</span>
        {withLevels ? `; ${fmt(result.inputDbm, 1)} dBm in at ${result.from}` : ""}
      </p>
      <NotesAlert notes={result.warnings} />
      <label className="flex items-center gap-2 text-sm">
        Frequency
        <input
          type="range"
          aria-label="Line-up frequency"
          min={0}
          max={nf - 1}
          value={k}
          onChange={(e) => setK(Number(e.target.value))}
          className="w-48"
        />
        <span className="figures" data-testid="lineup-frequency">
          {fmtHz(result.frequencies[k])}
        </span>
      </label>
      <LineupChart result={result} k={k} />
      <Table>
        <THead>
          <Tr>
            <Th>Stage</Th>
            <Th numeric>Gain dB</Th>
            <Th numeric>Cum. gain dB</Th>
            <Th numeric>Cum. NF dB</Th>
            {withLevels ? <Th numeric>Level out dBm</Th> : null}
            {withLevels ? <Th numeric>Headroom dB</Th> : null}
            <Th numeric>Cum. OIP3 dBm</Th>
            <Th numeric>Cum. OP1dB dBm</Th>
          </Tr>
        </THead>
        <TBody>
          {result.stages.map((s) => (
            <Tr key={`${s.block}:${s.inPort}>${s.outPort}`}>
              <Td className="font-mono">
                {s.block} {s.inPort}→{s.outPort}
              </Td>
              <Td numeric>{fmt(value(s.gainDb[k]))}</Td>
              <Td numeric>{fmt(value(s.cumulativeGainDb[k]))}</Td>
              <Td numeric>{fmt(value(s.cumulativeNfDb[k]))}</Td>
              {withLevels ? <Td numeric>{fmt(value(s.levelOutDbm?.[k]))}</Td> : null}
              {withLevels ? <Td numeric className={value(s.headroomDb?.[k]) < 0 ? "text-fail-strong" : undefined}>{s.headroomDb ? fmt(value(s.headroomDb[k])) : "—"}</Td> : null}
              <Td numeric>{fmt(value(s.cumulativeOip3Dbm[k]))}</Td>
              <Td numeric>{fmt(value(s.cumulativeOp1dbDbm[k]))}</Td>
            </Tr>
          ))}
        </TBody>
      </Table>
      <p className="text-xs text-muted">
        Gain from the actual waves (mismatch counts); cascade OIP3 and OP1dB by the usual formulas (common practice), blocks without a figure counted linear; a
        dash where a figure is not defined.
      </p>
      <section aria-label="Gain and noise figure over frequency" className="flex flex-col gap-1">
        <TracePlot
          frequencies={frequencies}
          series={series}
          unit="dB"
          markers={markers.map((hz) => result.frequencies.indexOf(hz)).filter((x) => x >= 0)}
          onHover={setHover}
          onPick={(idx) => {
            setK(idx);
            setMarkers((m) => (m.includes(result.frequencies[idx]) ? m : [...m, result.frequencies[idx]]));
          }}
          height={200}
        />
        <p className="figures text-xs text-muted" aria-live="polite">
          {readout}
        </p>
      </section>
    </div>
  );
}

/** Level (or cumulative gain without an input level) and cumulative noise figure after each stage, at plan index k. */
function LineupChart({ result, k }: { result: LineupResult; k: number }) {
  const W = 480;
  const H = 160;
  const pad = { l: 40, r: 40, t: 10, b: 28 };
  const withLevels = result.inputDbm !== null;
  const level = [withLevels ? (result.inputDbm as number) : 0, ...result.stages.map((s) => value(withLevels ? s.levelOutDbm?.[k] : s.cumulativeGainDb[k]))];
  const noise = [0, ...result.stages.map((s) => value(s.cumulativeNfDb[k]))];
  const range = (xs: number[]): [number, number] => {
    const fin = xs.filter(Number.isFinite);
    if (fin.length === 0) return [0, 1];
    const lo = Math.min(...fin);
    const hi = Math.max(...fin);
    return hi - lo < 1 ? [lo - 0.5, hi + 0.5] : [lo, hi];
  };
  const [l0, l1] = range(level);
  const [n0, n1] = range(noise);
  const x = (i: number) => pad.l + (i * (W - pad.l - pad.r)) / Math.max(1, level.length - 1);
  const y = (v: number, lo: number, hi: number) => pad.t + (1 - (v - lo) / (hi - lo)) * (H - pad.t - pad.b);
  const line = (vs: number[], lo: number, hi: number) =>
    vs
      .map((v, i) => (Number.isFinite(v) ? `${x(i).toFixed(1)},${y(v, lo, hi).toFixed(1)}` : null))
      .filter(Boolean)
      .join(" ");
  const labels = [result.from, ...result.stages.map((s) => s.block)];
  return (
    <svg
      viewBox={`0 0 ${W} ${H}`}
      className="w-full max-w-xl"
      role="img"
      aria-label={`${withLevels ? "Level" : "Cumulative gain"} and cumulative noise figure along the path at ${fmtHz(result.frequencies[k])}`}
    >
      <line x1={pad.l} x2={W - pad.r} y1={H - pad.b} y2={H - pad.b} stroke="currentColor" strokeOpacity={0.3} />
      <polyline points={line(level, l0, l1)} fill="none" stroke="var(--color-accent, #2563eb)" strokeWidth={2} />
      <polyline points={line(noise, n0, n1)} fill="none" stroke="var(--color-warn, #d97706)" strokeWidth={2} strokeDasharray="5 3" />
      {labels.map((t, i) => (
        <text key={`${t}-${i}`} x={x(i)} y={H - 10} fontSize={10} textAnchor="middle" fill="currentColor">
          {t}
        </text>
      ))}
      <text x={4} y={pad.t + 8} fontSize={10} fill="var(--color-accent, #2563eb)">
        {fmt(l1, 1)} {withLevels ? "dBm" : "dB"}
      </text>
      <text x={4} y={H - pad.b} fontSize={10} fill="var(--color-accent, #2563eb)">
        {fmt(l0, 1)}
      </text>
      <text x={W - 4} y={pad.t + 8} fontSize={10} textAnchor="end" fill="var(--color-warn, #d97706)">
        NF {fmt(n1, 1)} dB
      </text>
      <text x={W - 4} y={H - pad.b} fontSize={10} textAnchor="end" fill="var(--color-warn, #d97706)">
        {fmt(n0, 1)}
      </text>
    </svg>
  );
}
