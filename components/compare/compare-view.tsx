"use client";

import { useMemo, useState } from "react";
import { usePathname, useRouter } from "next/navigation";
import useSWR from "swr";
import type { RuleResult } from "@/engine/checks";
import type { RuleSpec, Scenario } from "@/engine/types";
import { RULE_SOURCE_LABELS } from "@/engine/checks";
import { Alert, Badge, Field, Select, Spinner, VerdictBadge } from "@/components/ui";
import { fetchJson, requestJson } from "@/lib/browser/api-client";
import type { RevisionVerdict } from "@/lib/domain/checks/types";
import { ruleText } from "@/lib/domain/rules/describe";
import { verdictUrl } from "@/components/checks/revision-verdict";
import { fmt, fmtMargin } from "@/components/checks/format";
import { defaultPair } from "@/components/helm/commands";
import { changeText, diffScenarios, valueText, type ScenarioDiff } from "@/lib/domain/scenarios/diff";
import { TraceOverlay } from "./trace-overlay";

type Side = { scenarioId: string; revisionId: string };
type Loaded = { revision: { id: string; number: number; content: Scenario } };
type Solved = { frequencies: number[]; ports: string[]; s: [number, number][][][] };

/**
 * The revision's current verdict under its own current rules (POST …/verdict runs "all rules" when no
 * stored run is current, so a verdict from before a rule edit is never shown as current).
 */
async function verdictFor(projectId: string, scenarioId: string, revisionId: string): Promise<RevisionVerdict> {
  return (await requestJson<{ verdict: RevisionVerdict }>(verdictUrl(projectId, scenarioId), { method: "POST", json: { revisionId } })).verdict;
}

const message = (e: unknown): string | null => (e ? (e instanceof Error ? e.message : String(e)) : null);

function useSide(projectId: string, side: Side, canRun: boolean) {
  const base = `/api/projects/${projectId}/scenarios/${side.scenarioId}`;
  const revisions = useSWR<{ revisions: { id: string; number: number }[] }>(side.scenarioId ? `${base}/revisions` : null, fetchJson);
  const loaded = useSWR<Loaded>(side.scenarioId ? `${base}${side.revisionId ? `?revision=${encodeURIComponent(side.revisionId)}` : ""}` : null, fetchJson);
  const revisionId = loaded.data?.revision.id;
  const verdict = useSWR<RevisionVerdict>(
    revisionId ? ["verdict", side.scenarioId, revisionId, canRun] : null,
    () => (canRun ? verdictFor(projectId, side.scenarioId, revisionId!) : fetchJson<{ verdict: RevisionVerdict }>(verdictUrl(projectId, side.scenarioId, revisionId)).then((r) => r.verdict)),
    { shouldRetryOnError: false, revalidateOnFocus: true },
  );
  const solved = useSWR<Solved>(revisionId ? `${base}/solve?format=json&revision=${encodeURIComponent(revisionId)}` : null, fetchJson, { shouldRetryOnError: false });
  return {
    revisions: revisions.data?.revisions ?? [],
    loaded: loaded.data,
    verdict: verdict.data,
    /** why this side has no verdict (a draft that does not solve), in the engine's words */
    verdictError: message(verdict.error),
    solved: solved.data,
    solveError: message(solved.error),
    error: message(loaded.error),
  };
}

function magDb(s: Solved, to: string, from: string): { hz: number[]; db: number[] } | null {
  const i = s.ports.indexOf(to);
  const j = s.ports.indexOf(from);
  if (i < 0 || j < 0) return null;
  return { hz: s.frequencies, db: s.s.map((m) => 10 * Math.log10(m[i][j][0] ** 2 + m[i][j][1] ** 2 || 1e-40)) };
}

export type CompareViewProps = {
  projectId: string;
  scenarios: { id: string; name: string }[];
  initial: { a: Side; b: Side };
  /** the viewer may run checks (then stale verdicts are re-run on open) */
  canRun?: boolean;
};

/** Two scenarios (or two revisions) side by side: rule verdicts and margins, an S_ij overlay, and the differences. */
export function CompareView({ projectId, scenarios, initial, canRun = true }: CompareViewProps) {
  const router = useRouter();
  const pathname = usePathname() ?? "";
  const [a, setA] = useState<Side>(initial.a);
  const [b, setB] = useState<Side>(initial.b);
  const A = useSide(projectId, a, canRun);
  const Bs = useSide(projectId, b, canRun);
  const nameOf = (id: string) => scenarios.find((s) => s.id === id)?.name ?? "?";
  const labelA = A.loaded ? `${nameOf(a.scenarioId)} r${A.loaded.revision.number}` : nameOf(a.scenarioId);
  const labelB = Bs.loaded ? `${nameOf(b.scenarioId)} r${Bs.loaded.revision.number}` : nameOf(b.scenarioId);

  const update = (next: { a: Side; b: Side }) => {
    setA(next.a);
    setB(next.b);
    const q = new URLSearchParams({ a: next.a.scenarioId, b: next.b.scenarioId });
    if (next.a.revisionId) q.set("ra", next.a.revisionId);
    if (next.b.revisionId) q.set("rb", next.b.revisionId);
    router.replace(`${pathname}?${q.toString()}`);
  };

  const ports = useMemo(() => {
    const pa = A.loaded?.revision.content.ports.map((p) => p.name) ?? [];
    const pb = new Set(Bs.loaded?.revision.content.ports.map((p) => p.name) ?? []);
    return pa.filter((p) => pb.has(p));
  }, [A.loaded, Bs.loaded]);
  const [pair, setPair] = useState<{ from: string; to: string } | null>(null);
  const [defFrom, defTo] = defaultPair(ports);
  const from = pair?.from && ports.includes(pair.from) ? pair.from : defFrom;
  const to = pair?.to && ports.includes(pair.to) ? pair.to : defTo;

  const diff: ScenarioDiff | null = A.loaded && Bs.loaded ? diffScenarios(A.loaded.revision.content, Bs.loaded.revision.content) : null;
  const rulesA = A.verdict?.run?.figures.result.rules ?? [];
  const rulesB = Bs.verdict?.run?.figures.result.rules ?? [];
  const setIds = (v: RevisionVerdict | undefined) => [...(v?.ruleSet.rules.map((r) => r.id) ?? []), ...(v?.ruleSet.opted_out.map((o) => o.id) ?? [])];
  const ruleIds = [...new Set([...setIds(A.verdict), ...setIds(Bs.verdict)])];
  const sideReady = (side: typeof A) => Boolean(side.verdict) || Boolean(side.verdictError) || Boolean(side.error);
  const byId = (list: RuleResult[], id: string) => list.find((r) => r.id === id);

  const traceA = A.solved && from && to ? magDb(A.solved, to, from) : null;
  const traceB = Bs.solved && from && to ? magDb(Bs.solved, to, from) : null;

  const sidePicker = (label: string, side: Side, other: Side, which: "a" | "b", revisions: { id: string; number: number }[]) => (
    <fieldset className="flex flex-wrap gap-3 rounded-card border border-rule p-3">
      <legend className="px-1 text-sm font-semibold">{label}</legend>
      <Field label={`${label}: scenario`}>
        <Select value={side.scenarioId} onChange={(e) => update(which === "a" ? { a: { scenarioId: e.target.value, revisionId: "" }, b: other } : { a: other, b: { scenarioId: e.target.value, revisionId: "" } })}>
          {scenarios.map((s) => (
            <option key={s.id} value={s.id}>
              {s.name}
            </option>
          ))}
        </Select>
      </Field>
      <Field label={`${label}: revision`}>
        <Select value={side.revisionId} onChange={(e) => update(which === "a" ? { a: { ...side, revisionId: e.target.value }, b: other } : { a: other, b: { ...side, revisionId: e.target.value } })}>
          <option value="">latest</option>
          {revisions.map((r) => (
            <option key={r.id} value={r.id}>
              r{r.number}
            </option>
          ))}
        </Select>
      </Field>
    </fieldset>
  );

  return (
    <div className="flex flex-col gap-5">
      <div className="grid gap-3 md:grid-cols-2">
        {sidePicker("First", a, b, "a", A.revisions)}
        {sidePicker("Second", b, a, "b", Bs.revisions)}
      </div>
      {A.error || Bs.error ? (
        <Alert tone="error" title="Could not compare">
          {A.error ?? Bs.error}
        </Alert>
      ) : null}
      {[
        { label: labelA, side: A },
        { label: labelB, side: Bs },
      ].map(({ label, side }) =>
        side.verdictError ? (
          <Alert key={label} tone="warn" title={`${label} has no verdict`}>
            {side.verdictError}
          </Alert>
        ) : side.verdict && !side.verdict.run ? (
          <Alert key={label} tone="warn" title={`${label}: stale verdict`}>
            No stored verdict of revision {side.verdict.revisionNumber} is current for its rules and engine, and your role cannot run checks.
          </Alert>
        ) : null,
      )}

      <section aria-labelledby="cmp-rules" className="flex flex-col gap-2">
        <h2 id="cmp-rules" className="text-base font-semibold">
          Rule verdicts
        </h2>
        {!sideReady(A) || !sideReady(Bs) ? (
          <p className="flex items-center gap-2 text-sm text-muted">
            <Spinner size="sm" /> Judging both by their own current rules…
          </p>
        ) : (
          <div className="overflow-x-auto rounded-card border border-rule bg-surface">
            <table className="w-full text-sm">
              <caption className="sr-only">Rule verdicts of both scenarios</caption>
              <thead className="bg-sunken/70 text-xs text-muted uppercase">
                <tr>
                  <th scope="col" className="px-3 py-2 text-left">Rule</th>
                  <th scope="col" className="px-3 py-2 text-left">{labelA}</th>
                  <th scope="col" className="px-3 py-2 text-left">{labelB}</th>
                  <th scope="col" className="px-3 py-2 text-right">Change in margin</th>
                </tr>
              </thead>
              <tbody>
                {ruleIds.map((id) => {
                  const ra = byId(rulesA, id);
                  const rb = byId(rulesB, id);
                  const differs = ra?.verdict !== rb?.verdict;
                  const cell = (r: RuleResult | undefined, side: typeof A) => {
                    const entry = side.verdict?.ruleSet.rules.find((e) => e.id === id);
                    const out = side.verdict?.ruleSet.opted_out.find((o) => o.id === id);
                    const source = entry && entry.source !== "project" ? <span className="text-xs text-muted">({RULE_SOURCE_LABELS[entry.source]})</span> : null;
                    if (r)
                      return (
                        <span className="flex flex-wrap items-center gap-2">
                          <VerdictBadge verdict={r.verdict} />
                          <span className="figures">
                            {fmt(r.worst)} {r.unit}, margin {fmtMargin(r.margin)}
                          </span>
                          {source}
                        </span>
                      );
                    if (out) return <span className="text-muted">opted out: {out.reason}</span>;
                    if (entry?.not_run) return <span className="text-muted">not run: {entry.not_run}</span>;
                    if (side.verdictError) return <span className="text-muted">no verdict</span>;
                    if (!entry) return <span className="text-muted">not a rule of this one</span>;
                    return <span className="text-muted">stale</span>;
                  };
                  return (
                    <tr key={id} className="border-t border-rule" data-rule={id} data-differs={differs ? "true" : undefined} aria-label={`Rule ${id}${differs ? ", verdict differs" : ""}`}>
                      <th scope="row" className="px-3 py-2 text-left font-mono font-normal">
                        {id} {differs ? <Badge tone="warn">verdict differs</Badge> : null}
                      </th>
                      <td className="px-3 py-2">{cell(ra, A)}</td>
                      <td className="px-3 py-2">{cell(rb, Bs)}</td>
                      <td className="figures px-3 py-2 text-right">{ra && rb ? `${fmtMargin(rb.margin - ra.margin)} dB` : "—"}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
        )}
      </section>

      <section aria-labelledby="cmp-traces" className="flex flex-col gap-2">
        <h2 id="cmp-traces" className="text-base font-semibold">
          Traces
        </h2>
        <div className="flex flex-wrap gap-3">
          <Field label="From port">
            <Select value={from} onChange={(e) => setPair({ from: e.target.value, to })}>
              {ports.map((p) => (
                <option key={p}>{p}</option>
              ))}
            </Select>
          </Field>
          <Field label="To port">
            <Select value={to} onChange={(e) => setPair({ from, to: e.target.value })}>
              {ports.map((p) => (
                <option key={p}>{p}</option>
              ))}
            </Select>
          </Field>
        </div>
        {traceA && traceB ? (
          <TraceOverlay
            title={`|S(${to}, ${from})| of both`}
            series={[
              { label: `${labelA}: ${to}←${from}`, ...traceA, colour: "var(--pt-ink)" },
              { label: `${labelB}: ${to}←${from}`, ...traceB, colour: "var(--pt-fail)", dashed: true },
            ]}
          />
        ) : (
          <p className="text-sm text-muted">
            {A.solveError || Bs.solveError
              ? `No traces: ${A.solveError ? `${labelA} does not solve (${A.solveError})` : ""}${A.solveError && Bs.solveError ? "; " : ""}${Bs.solveError ? `${labelB} does not solve (${Bs.solveError})` : ""}.`
              : ports.length < 1
                ? "The two scenarios share no system port."
                : "Solving…"}
          </p>
        )}
      </section>

      <section aria-labelledby="cmp-diff" className="flex flex-col gap-2">
        <h2 id="cmp-diff" className="text-base font-semibold">
          Differences
        </h2>
        {!diff ? (
          <Spinner />
        ) : diff.same ? (
          <p className="text-sm text-muted">The two are the same in everything the checks read (positions and labels aside).</p>
        ) : (
          <ul aria-label="Differences" className="flex flex-col gap-1 text-sm">
            {diff.blocks.map((d) => (
              <li key={`b-${d.id}`}>
                <Badge tone={d.change === "added" ? "pass" : d.change === "removed" ? "fail" : "info"}>{d.change}</Badge> block <span className="font-mono">{d.id}</span> ({d.kind})
                {d.change === "changed" ? (
                  <span className="font-mono text-xs">
                    {" "}
                    {[...d.params.map(changeText), ...d.fields.map(changeText), ...(d.state ? [`switch state: throw ${d.state.before ?? 1} → throw ${d.state.after ?? 1}`] : [])].join("; ")}
                  </span>
                ) : null}
              </li>
            ))}
            {diff.rules.map((r) => (
              <li key={`r-${r.entry}-${r.id}`}>
                <Badge tone={r.change === "added" ? "pass" : r.change === "removed" ? "fail" : "info"}>{r.change}</Badge> {r.entry} <span className="font-mono">{r.id}</span>
                {r.entry === "opt-out" ? (
                  <span className="text-xs"> (reason: {String(r.after ?? r.before)})</span>
                ) : (
                  <span className="text-xs">
                    {" "}
                    {r.before ? ruleText(r.before as RuleSpec) : ""}
                    {r.before && r.after ? " → " : ""}
                    {r.after ? ruleText(r.after as RuleSpec) : ""}
                  </span>
                )}
              </li>
            ))}
            {diff.links.map((l) => (
              <li key={`l-${l.change}-${l.link.join("~")}`}>
                <Badge tone={l.change === "added" ? "pass" : "fail"}>{l.change}</Badge> link <span className="font-mono">{l.link.join(" – ")}</span>
              </li>
            ))}
            {diff.ports.map((p) => (
              <li key={`p-${p.change}-${p.name}`}>
                <Badge tone="info">{p.change}</Badge> system port <span className="font-mono">{p.name}</span>{" "}
                <span className="font-mono text-xs">{"at" in p ? p.at : p.change === "z0" ? `Z0 ${valueText("z0", p.before)} → ${valueText("z0", p.after)}` : `${p.before} → ${p.after}`}</span>
              </li>
            ))}
            {diff.settings.map((s) => (
              <li key={`s-${s.name}`}>
                <Badge tone="info">changed</Badge> {s.name === "frequency" ? "frequency plan" : s.name === "z0" ? "system Z0" : s.name}:{" "}
                <span className="font-mono text-xs">
                  {valueText(s.name, s.before)} → {valueText(s.name, s.after)}
                </span>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
