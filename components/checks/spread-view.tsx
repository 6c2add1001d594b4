"use client";

import { useMemo, useState } from "react";
import type { SpreadResult } from "@/engine/spread";
import { Button, Select, Table, TBody, THead, Td, Th, Tr } from "@/components/ui";
import { TracePlot } from "@/components/results/trace-plot";
import { fmt, fmtHz } from "./format";
import { NotesAlert } from "./notes-alert";

/** A stored figure: JSON turns ∞ and NaN into null. */
const value = (x: number | null | undefined): number => (typeof x === "number" ? x : NaN);
const percent = (x: number) => `${(100 * x).toFixed(1)}%`;

/**
 * A spread analysis (docs/checks.md "Spread analysis"): the yield of every rule with its 95% Wilson
 * interval and the nominal margin, the chosen rule's p5/p50/p95 envelope over its nominal trace, and the
 * parameters ranked by the rank correlation of their value with the rule's margin.
 */
export function SpreadView({ result, onOpenWorst }: { result: SpreadResult; onOpenWorst?: (rule: string) => void }) {
  const [ruleId, setRuleId] = useState(result.envelopes[0]?.rule ?? result.rules[0]?.id ?? "");
  const [hover, setHover] = useState<number | null>(null);
  const envelope = result.envelopes.find((e) => e.rule === ruleId) ?? null;
  const rule = result.rules.find((r) => r.id === ruleId) ?? null;
  const frequencies = useMemo(() => Float64Array.from(envelope?.frequencies ?? []), [envelope]);
  const series = useMemo(
    () =>
      envelope
        ? [
            { label: `Nominal ${envelope.quantity}`, values: Float64Array.from(envelope.nominal, value) },
            { label: "p5", values: Float64Array.from(envelope.p5, value) },
            { label: "p50", values: Float64Array.from(envelope.p50, value) },
            { label: "p95", values: Float64Array.from(envelope.p95, value) },
          ]
        : [],
    [envelope],
  );
  const readout =
    hover === null || !envelope
      ? "Point at the traces to read them."
      : `${fmtHz(envelope.frequencies[hover])} · nominal ${fmt(value(envelope.nominal[hover]))} dB · p5 ${fmt(value(envelope.p5[hover]))} · p50 ${fmt(value(envelope.p50[hover]))} · p95 ${fmt(value(envelope.p95[hover]))} dB`;
  return (
    <div className="flex flex-col gap-3">
      <p className="text-sm">
        {result.samples} samples, seed <span className="font-mono">{result.seed}</span>; {result.parameters.length} parameter{result.parameters.length === 1 ? "" : "s"} with a spread:{" "}
        {result.parameters.map((p) => `${p.name} ${p.distribution === "uniform" ? "±" : "σ "}${p.amount}${p.unit ? ` ${p.unit}` : ""}`).join(", ")}
      </p>
      <NotesAlert notes={result.warnings} />
      <Table aria-label="Yield per rule" data-testid="spread-yield-table">
        <THead>
          <Tr>
            <Th>Rule</Th>
            <Th numeric>Passed</Th>
            <Th numeric>Yield</Th>
            <Th numeric>95% interval</Th>
            <Th numeric>Nominal margin</Th>
            <Th numeric>Worst margin</Th>
          </Tr>
        </THead>
        <TBody>
          {result.rules.map((r) => (
            <Tr key={r.id}>
              <Td className="font-mono">{r.id}</Td>
              <Td numeric>
                {r.passed}/{r.total}
              </Td>
              <Td numeric>{percent(r.yield)}</Td>
              <Td numeric>
                {percent(r.low)}–{percent(r.high)}
              </Td>
              <Td numeric className={value(r.nominal_margin) < 0 ? "text-fail-strong" : undefined}>
                {fmt(value(r.nominal_margin))}
              </Td>
              <Td numeric>
                {r.worst ? `${fmt(value(r.worst.margin))} (sample ${r.worst.sample})` : "—"}
                {r.worst && onOpenWorst ? (
                  <Button size="sm" variant="ghost" className="ml-2" onClick={() => onOpenWorst(r.id)} aria-label={`Open worst sample of ${r.id} as a scenario`}>
                    Open as scenario
                  </Button>
                ) : null}
              </Td>
            </Tr>
          ))}
        </TBody>
      </Table>
      <p className="text-xs text-muted">
        Yield: the fraction of samples that meet the rule; the interval is the 95% Wilson score interval. Margins in the rule&apos;s unit, positive when met.
      </p>
      {result.rules.length > 1 ? (
        <label className="flex items-center gap-2 text-sm">
          Rule
          <Select value={ruleId} onChange={(e) => setRuleId(e.target.value)} options={result.rules.map((r) => ({ value: r.id, label: r.id }))} className="w-48" />
        </label>
      ) : null}
      {envelope ? (
        <section aria-label={`Envelope of ${envelope.rule}`} className="flex flex-col gap-1">
          <h4 className="text-sm font-semibold">
            {envelope.quantity} of {envelope.rule}: 5%, 50% and 95% over the samples, and the nominal trace
          </h4>
          <TracePlot frequencies={frequencies} series={series} unit="dB" markers={[]} onHover={setHover} onPick={() => undefined} height={200} />
          <p className="figures text-xs text-muted" aria-live="polite">
            {readout}
          </p>
        </section>
      ) : null}
      {rule ? (
        <section aria-label={`Sensitivity of ${rule.id}`} className="flex flex-col gap-1">
          <h4 className="text-sm font-semibold">What drives {rule.id}</h4>
          <Table aria-label={`Sensitivity ranking of ${rule.id}`}>
            <THead>
              <Tr>
                <Th>Parameter</Th>
                <Th numeric>Rank correlation ρ with the margin</Th>
              </Tr>
            </THead>
            <TBody>
              {rule.sensitivity.map((s) => (
                <Tr key={s.name}>
                  <Td className="font-mono">{s.name}</Td>
                  <Td numeric>{s.rho === null ? "—" : s.rho.toFixed(3)}</Td>
                </Tr>
              ))}
            </TBody>
          </Table>
          <p className="text-xs text-muted">Spearman rank correlation of each parameter&apos;s sampled value with the rule&apos;s margin, largest |ρ| first; a dash where the margin does not vary.</p>
        </section>
      ) : null}
    </div>
  );
}
