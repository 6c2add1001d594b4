"use client";

import { useMemo, useState } from "react";
import { Download, X } from "lucide-react";
import type { RuleSpec, Scenario } from "@/engine/types";
import { effectiveRuleSet, judgingRules } from "@/engine/checks/rule-set";
import { Alert, Badge, Button, EmptyState, Input, Select, Spinner } from "@/components/ui";
import { writeCompositeTouchstone } from "@/engine/touchstone";
import { downloadText as download } from "@/lib/browser/downloads";
import { fileStem } from "@/lib/domain/scenarios/file-stem";
import { evaluateQuantity } from "@/lib/browser/expressions";
import { formatHz } from "@/engine/format";
import { formatFixed, formatNumber } from "@/lib/browser/format";
import {
  nearestFrequencyIndex,
  solutionToCsv,
  TRACE_UNITS,
  traceLabel,
  traceValues,
  type TraceQuantity,
} from "@/lib/domain/results/results-math";
import { limitLinesForTrace, type LimitLine } from "@/lib/domain/results/limit-lines";
import { markerIndexInPlan } from "@/lib/domain/results/plot-data";
import type { SolverState } from "@/lib/browser/use-solver";
import { PortMatrix } from "./port-matrix";
import { SmithChart } from "./smith-chart";
import { TracePlot } from "./trace-plot";

export type ResultsPanelProps = {
  scenario: Scenario;
  state: SolverState;
  /** the project's rules: with the scenario's own, overrides and opt-outs they give the limit lines on traces */
  projectRules?: readonly RuleSpec[];
};

const QUANTITY_LABEL: Record<TraceQuantity, string> = { db: "Magnitude (dB)", phase: "Phase (deg)", delay: "Group delay (ns)" };

/** Traces, markers, the port matrix, the Smith chart, warnings and downloads of the latest solve. */
export function ResultsPanel({ scenario, state, projectRules }: ResultsPanelProps) {
  if (state.status === "empty") {
    return (
      <EmptyState
        title={state.reason === "no-blocks" ? "No blocks yet" : "No system ports"}
        description={
          state.reason === "no-blocks"
            ? "Add a block to the chart (Add block, or press A) and mark at least one system port to see results."
            : "Mark at least one system port to see results: right-click a port handle, or use Mark as system port in the inspector."
        }
      />
    );
  }
  const result = state.status === "done" ? state.result : state.status === "solving" ? state.last : undefined;
  return (
    <div className="flex flex-col gap-4" aria-busy={state.status === "solving"}>
      <StatusLine state={state} />
      {state.status === "error" ? (
        <Alert tone="error" title={state.kind === "SingularSystemError" ? "The system cannot be solved" : "The scenario cannot be solved"}>
          <span className="font-mono text-xs" data-testid="solve-error">
            {state.error}
          </span>
        </Alert>
      ) : null}
      {result ? <SolvedResults key={result.view.ports.join("\u0000")} scenario={scenario} projectRules={projectRules} result={result} stale={state.status !== "done"} /> : null}
      {!result && state.status === "solving" ? <Spinner label="Solving" /> : null}
    </div>
  );
}

function StatusLine({ state }: { state: SolverState }) {
  if (state.status === "solving") {
    return (
      <p role="status" aria-label="Solve status" className="flex items-center gap-2 text-sm text-muted">
        <Spinner size="sm" /> solving…
      </p>
    );
  }
  if (state.status === "done") {
    const r = state.result;
    return (
      <p role="status" aria-label="Solve status" className="figures text-sm text-muted">
        Solved in {formatFixed(r.solveMs, r.solveMs < 10 ? 1 : 0)} ms · {r.view.s.nf} points · {r.view.s.n} system port{r.view.s.n === 1 ? "" : "s"}
      </p>
    );
  }
  if (state.status === "error") {
    return (
      <p role="status" aria-label="Solve status" className="text-sm text-fail-strong">
        Not solved
      </p>
    );
  }
  return null;
}

type Solved = Extract<SolverState, { status: "done" }>["result"];

function SolvedResults({ scenario, projectRules, result, stale }: { scenario: Scenario; projectRules?: readonly RuleSpec[]; result: Solved; stale: boolean }) {
  const view = result.view;
  const n = view.s.n;
  const [pair, setPair] = useState<[number, number]>(n > 1 ? [1, 0] : [0, 0]);
  const [quantity, setQuantity] = useState<TraceQuantity>("db");
  const [hover, setHover] = useState<number | null>(null);
  const [markers, setMarkers] = useState<number[]>([]); // Hz
  const [matrixHz, setMatrixHz] = useState<number>(() => view.frequencies[Math.floor(view.s.nf / 2)]);
  const [smithPort, setSmithPort] = useState(0);
  const [markerText, setMarkerText] = useState("");
  const [markerError, setMarkerError] = useState<string | null>(null);

  const [i, j] = [Math.min(pair[0], n - 1), Math.min(pair[1], n - 1)];
  const [extra, setExtra] = useState<[number, number][]>([]);
  const shownPairs = useMemo(() => {
    const all: [number, number][] = [[i, j]];
    for (const [a, b] of extra) if (a < n && b < n && !all.some(([x, y]) => x === a && y === b)) all.push([a, b]);
    return all;
  }, [i, j, extra, n]);
  const series = useMemo(
    () => shownPairs.map(([a, b]) => ({ label: traceLabel(view.ports, a, b), values: traceValues(view, a, b, quantity) })),
    [shownPairs, view, quantity],
  );
  // the effective rules (docs/checks.md): each that bounds a shown trace draws its limit on the plot
  const rules = useMemo(() => judgingRules(effectiveRuleSet(projectRules ?? [], scenario)), [projectRules, scenario]);
  const limits = useMemo(() => {
    const out: LimitLine[] = [];
    for (const pairShown of shownPairs) {
      for (const line of limitLinesForTrace(rules, view.ports, pairShown, quantity)) {
        if (!out.some((o) => o.rule === line.rule && o.db === line.db)) out.push(line);
      }
    }
    return out;
  }, [rules, view.ports, shownPairs, quantity]);
  const values = series[0].values;
  const label = series[0].label;
  const unit = TRACE_UNITS[quantity];
  // a marker the plan no longer holds (the plan was narrowed) reads nothing rather than the nearest edge
  const markerIdx = useMemo(() => markers.map((hz) => markerIndexInPlan(view.frequencies, hz) ?? -1), [markers, view]);
  const matrixIndex = nearestFrequencyIndex(view.frequencies, matrixHz);

  const options = [];
  for (let a = 0; a < n; a++) for (let b = 0; b < n; b++) options.push({ value: `${a},${b}`, label: traceLabel(view.ports, a, b) });

  const fmt = (v: number) => (quantity === "db" ? formatFixed(v, 2) : quantity === "phase" ? formatFixed(v, 1) : formatNumber(v, 4));
  const readout =
    hover === null
      ? "Point at the trace to read a value; click to place a marker."
      : `${formatHz(view.frequencies[hover])} · ${series.map((s) => `${s.label} ${fmt(s.values[hover])} ${unit}`).join(" · ")}`;

  const addMarkerAt = (hz: number) => setMarkers((m) => (m.includes(hz) ? m : [...m, hz]));

  return (
    <div className={stale ? "flex flex-col gap-5 opacity-60 transition-opacity" : "flex flex-col gap-5"}>
      <div className="flex flex-wrap gap-2">
        <Button
          variant="secondary"
          size="sm"
          onClick={() => download(`${fileStem(scenario.name)}.s${n}p`, writeCompositeTouchstone(view, { scenarioName: scenario.name }), "text/plain")}
        >
          <Download aria-hidden="true" className="h-4 w-4" /> Download Touchstone
        </Button>
        <Button variant="secondary" size="sm" onClick={() => download(`${fileStem(scenario.name)}.csv`, solutionToCsv(view), "text/csv")}>
          <Download aria-hidden="true" className="h-4 w-4" /> Download CSV
        </Button>
      </div>

      <section aria-labelledby="results-traces" className="flex flex-col gap-2">
        <h3 id="results-traces" className="text-sm font-semibold text-ink">
          Traces
        </h3>
        <div className="grid grid-cols-2 gap-2">
          <label className="flex flex-col gap-1 text-xs text-muted">
            Trace
            <Select
              aria-label="Trace"
              value={`${i},${j}`}
              onChange={(e) => {
                const [a, b] = e.target.value.split(",").map(Number);
                setPair([a, b]);
              }}
              options={options}
            />
          </label>
          <label className="flex flex-col gap-1 text-xs text-muted">
            Quantity
            <Select
              aria-label="Quantity"
              value={quantity}
              onChange={(e) => setQuantity(e.target.value as TraceQuantity)}
              options={(Object.keys(QUANTITY_LABEL) as TraceQuantity[]).map((q) => ({ value: q, label: QUANTITY_LABEL[q] }))}
            />
          </label>
        </div>
        <div className="flex flex-wrap items-center gap-2">
          <label className="flex items-center gap-2 text-xs text-muted">
            Overlay
            <Select
              aria-label="Overlay another trace"
              value=""
              onChange={(e) => {
                if (!e.target.value) return;
                const [a, b] = e.target.value.split(",").map(Number);
                setExtra((list) => [...list, [a, b]]);
              }}
              options={[
                { value: "", label: "add a trace…" },
                ...options.filter((o) => !shownPairs.some(([a, b]) => o.value === `${a},${b}`)),
              ]}
            />
          </label>
          {shownPairs.slice(1).map(([a, b]) => (
            <Button
              key={`${a},${b}`}
              variant="ghost"
              size="sm"
              aria-label={`Remove overlay ${traceLabel(view.ports, a, b)}`}
              onClick={() => setExtra((list) => list.filter(([x, y]) => x !== a || y !== b))}
            >
              {traceLabel(view.ports, a, b)} <X aria-hidden="true" className="h-3.5 w-3.5" />
            </Button>
          ))}
        </div>
        <TracePlot
          frequencies={view.frequencies}
          series={series}
          unit={unit}
          markers={markerIdx}
          onHover={setHover}
          onPick={(k) => addMarkerAt(view.frequencies[k])}
          limits={limits}
          exportStem={`${fileStem(scenario.name)}-traces`}
        />
        <output aria-label="Trace read-out" className="figures min-h-5 text-xs text-ink">
          {readout}
        </output>
        <form
          className="flex items-start gap-2"
          aria-label="Add a marker by frequency"
          onSubmit={(e) => {
            e.preventDefault();
            const r = evaluateQuantity(markerText, "Hz");
            if (!r.ok || typeof r.value !== "number") {
              setMarkerError(r.ok ? "Enter a frequency." : r.error);
              return;
            }
            const first = view.frequencies[0];
            const last = view.frequencies[view.s.nf - 1];
            // refused, not moved to the nearest edge: a marker must read a frequency the plan solved
            if (markerIndexInPlan(view.frequencies, r.value) === null) {
              setMarkerError(`${formatHz(r.value)} is outside the frequency plan (${formatHz(first)} to ${formatHz(last)}): place the marker within it, or widen the plan.`);
              return;
            }
            setMarkerError(null);
            addMarkerAt(view.frequencies[nearestFrequencyIndex(view.frequencies, r.value)]);
            setMarkerText("");
          }}
        >
          <div className="flex flex-1 flex-col gap-1">
            <Input
              aria-label="Marker frequency"
              placeholder="Marker at… e.g. 2.45 GHz"
              className="font-mono"
              value={markerText}
              aria-invalid={markerError ? true : undefined}
              onChange={(e) => setMarkerText(e.target.value)}
            />
            {markerError ? (
              <p role="alert" className="text-xs text-fail-strong" data-testid="marker-error">
                {markerError}
              </p>
            ) : null}
          </div>
          <Button type="submit" variant="secondary" size="md">
            Add marker
          </Button>
        </form>
        {markers.length > 0 ? (
          <table className="w-full text-xs" aria-label="Markers">
            <thead>
              <tr className="text-left text-muted">
                <th scope="col" className="py-1 font-normal">
                  Marker
                </th>
                <th scope="col" className="py-1 text-right font-normal">
                  Frequency
                </th>
                <th scope="col" className="py-1 text-right font-normal">
                  {sLabelShort(label)} ({unit})
                </th>
                {series.slice(1).map((s) => (
                  <th key={s.label} scope="col" className="py-1 text-right font-normal">
                    {sLabelShort(s.label)} ({unit})
                  </th>
                ))}
                <th scope="col" className="sr-only">
                  Remove
                </th>
              </tr>
            </thead>
            <tbody>
              {markers.map((hz, m) => {
                const k = markerIdx[m];
                if (k < 0) {
                  return (
                    <tr key={hz} className="border-t border-rule text-muted">
                      <td className="py-1 font-mono">M{m + 1}</td>
                      <td className="figures py-1 text-right">{formatHz(hz)}</td>
                      <td colSpan={series.length} className="py-1 text-right">
                        outside the plan
                      </td>
                      <td className="py-1 text-right">
                        <Button variant="ghost" size="sm" aria-label={`Remove marker M${m + 1}`} onClick={() => setMarkers(markers.filter((x) => x !== hz))}>
                          <X aria-hidden="true" className="h-3.5 w-3.5" />
                        </Button>
                      </td>
                    </tr>
                  );
                }
                return (
                  <tr key={hz} className="border-t border-rule">
                    <td className="py-1 font-mono">M{m + 1}</td>
                    <td className="figures py-1 text-right">{formatHz(view.frequencies[k])}</td>
                    <td className="figures py-1 text-right">{fmt(values[k])}</td>
                    {series.slice(1).map((s) => (
                      <td key={s.label} className="figures py-1 text-right">
                        {fmt(s.values[k])}
                      </td>
                    ))}
                    <td className="py-1 text-right">
                      <Button variant="ghost" size="sm" aria-label={`Remove marker M${m + 1}`} onClick={() => setMarkers(markers.filter((x) => x !== hz))}>
                        <X aria-hidden="true" className="h-3.5 w-3.5" />
                      </Button>
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        ) : null}
      </section>

      <section aria-labelledby="results-matrix" className="flex flex-col gap-2">
        <h3 id="results-matrix" className="text-sm font-semibold text-ink">
          Port matrix
        </h3>
        <PortMatrix
          view={view}
          index={matrixIndex}
          onIndexChange={(k) => setMatrixHz(view.frequencies[k])}
          active={[i, j]}
          onPick={(a, b) => setPair([a, b])}
        />
      </section>

      <section aria-labelledby="results-smith" className="flex flex-col gap-2">
        <div className="flex items-center justify-between gap-2">
          <h3 id="results-smith" className="text-sm font-semibold text-ink">
            Smith chart
          </h3>
          <label className="flex items-center gap-2 text-xs text-muted">
            Port
            <Select
              aria-label="Smith chart port"
              value={String(Math.min(smithPort, n - 1))}
              onChange={(e) => setSmithPort(Number(e.target.value))}
              options={view.ports.map((p, k) => ({ value: String(k), label: p }))}
            />
          </label>
        </div>
        <SmithChart view={view} port={Math.min(smithPort, n - 1)} highlight={matrixIndex} exportStem={`${fileStem(scenario.name)}-smith-${fileStem(view.ports[Math.min(smithPort, n - 1)])}`} />
      </section>

      <Warnings result={result} z0={scenario.z0} />
    </div>
  );
}

function sLabelShort(label: string): string {
  return label.split(" ")[0];
}

function Warnings({ result, z0 }: { result: Solved; z0: number }) {
  // unterminated ports are listed once, in the workspace's words, not again as the engine's warning
  const warnings = result.unterminated.length > 0 ? result.warnings.filter((w) => !/not linked and not a system port/.test(w)) : result.warnings;
  const count = warnings.length + result.unterminated.length;
  return (
    <section aria-labelledby="results-warnings" className="flex flex-col gap-2">
      <h3 id="results-warnings" className="flex items-center gap-2 text-sm font-semibold text-ink">
        Warnings <Badge tone={count > 0 ? "warn" : "neutral"}>{count}</Badge>
      </h3>
      {count === 0 ? (
        <p className="text-sm text-muted">None: every block port is linked or a system port, and no part data was extrapolated.</p>
      ) : (
        <ul className="flex flex-col gap-1 text-sm" aria-label="Warnings">
          {result.unterminated.map((ref) => (
            <li key={`u:${ref}`} className="border-l-2 border-warn pl-2">
              <span className="font-mono">{ref}</span> is not linked and not a system port: it is terminated in the system Z0 ({formatNumber(z0)} Ω).
            </li>
          ))}
          {warnings.map((w) => (
            <li key={`w:${w}`} className="border-l-2 border-warn pl-2">
              {w}
            </li>
          ))}
        </ul>
      )}
      {result.notes.length > 0 ? (
        <ul className="flex flex-col gap-1 text-sm text-muted" aria-label="Notes">
          {result.notes.map((note) => (
            <li key={`n:${note}`} className="border-l-2 border-rule pl-2">
              {note}
            </li>
          ))}
        </ul>
      ) : null}
    </section>
  );
}
