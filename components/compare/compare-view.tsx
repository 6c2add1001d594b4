"use client";

import { useMemo, useState } from "react";
import { usePathname, useRouter } from "next/navigation";
import useSWR from "swr";
import type { RuleResult } from "@/engine/checks";
import type { Scenario } from "@/engine/types";
import { Alert, Badge, Field, Select, Spinner, VerdictBadge } from "@/components/ui";
import { checkRunUrls, fetchJson, requestJson } from "@/lib/browser/api-client";
import type { CheckRunOf, CheckRunSummary } from "@/lib/domain/checks/types";
import { fmt, fmtMargin } from "@/components/checks/format";
import { defaultPair } from "@/components/helm/commands";
import { diffScenarios, type ScenarioDiff } from "@/lib/domain/scenarios/diff";
import { TraceOverlay } from "./trace-overlay";

type Side = { scenarioId: string; revisionId: string };
type Loaded = { revision: { id: string; number: number; content: Scenario } };
type AllRulesRun = CheckRunOf<"all_rules">;
type Solved = { frequencies: number[]; ports: string[]; s: [number, number][][][] };

/** The latest stored "all rules" run of this revision, or a new one. */
async function allRulesFor(projectId: string, scenarioId: string, revisionId: string): Promise<AllRulesRun> {
  const { runs } = await requestJson<{ runs: CheckRunSummary[] }>(`${checkRunUrls.list(projectId, scenarioId)}?limit=200`);
  const found = runs.find((r) => r.check === "all_rules" && r.revisionId === revisionId);
  if (found) return (await requestJson<{ run: AllRulesRun }>(checkRunUrls.one(projectId, scenarioId, found.id))).run;
  return (await requestJson<{ run: AllRulesRun }>(checkRunUrls.list(projectId, scenarioId), { method: "POST", json: { check: "all_rules", inputs: {}, revisionId } })).run;
}

function useSide(projectId: string, side: Side) {
  const base = `/api/projects/${projectId}/scenarios/${side.scenarioId}`;
  const revisions = useSWR<{ revisions: { id: string; number: number }[] }>(side.scenarioId ? `${base}/revisions` : null, fetchJson);
  const loaded = useSWR<Loaded>(side.scenarioId ? `${base}${side.revisionId ? `?revision=${encodeURIComponent(side.revisionId)}` : ""}` : null, fetchJson);
  const revisionId = loaded.data?.revision.id;
  const rules = useSWR<AllRulesRun>(revisionId ? ["all-rules", side.scenarioId, revisionId] : null, () => allRulesFor(projectId, side.scenarioId, revisionId!));
  const solved = useSWR<Solved>(revisionId ? `${base}/solve?format=json&revision=${encodeURIComponent(revisionId)}` : null, fetchJson);
  return { revisions: revisions.data?.revisions ?? [], loaded: loaded.data, rules: rules.data, solved: solved.data, error: loaded.error ?? rules.error ?? solved.error };
}

function magDb(s: Solved, to: string, from: string): { hz: number[]; db: number[] } | null {
  const i = s.ports.indexOf(to);
  const j = s.ports.indexOf(from);
  if (i < 0 || j < 0) return null;
  return { hz: s.frequencies, db: s.s.map((m) => 10 * Math.log10(m[i][j][0] ** 2 + m[i][j][1] ** 2 || 1e-40)) };
}

export type CompareViewProps = { projectId: string; scenarios: { id: string; name: string }[]; initial: { a: Side; b: Side } };

/** Two scenarios (or two revisions) side by side: rule verdicts and margins, an S_ij overlay, and the differences. */
export function CompareView({ projectId, scenarios, initial }: CompareViewProps) {
  const router = useRouter();
  const pathname = usePathname() ?? "";
  const [a, setA] = useState<Side>(initial.a);
  const [b, setB] = useState<Side>(initial.b);
  const A = useSide(projectId, a);
  const Bs = useSide(projectId, b);
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
  const rulesA = A.rules?.figures.result.rules ?? [];
  const rulesB = Bs.rules?.figures.result.rules ?? [];
  const ruleIds = [...new Set([...rulesA.map((r) => r.id), ...rulesB.map((r) => r.id)])];
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
          {String((A.error ?? Bs.error) instanceof Error ? (A.error ?? Bs.error).message : (A.error ?? Bs.error))}
        </Alert>
      ) : null}

      <section aria-labelledby="cmp-rules" className="flex flex-col gap-2">
        <h2 id="cmp-rules" className="text-base font-semibold">
          Rule verdicts
        </h2>
        {!A.rules || !Bs.rules ? (
          <p className="flex items-center gap-2 text-sm text-muted">
            <Spinner size="sm" /> Running all rules on both…
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
                  const cell = (r: RuleResult | undefined) =>
                    r ? (
                      <span className="flex items-center gap-2">
                        <VerdictBadge verdict={r.verdict} />
                        <span className="figures">
                          {fmt(r.worst)} {r.unit}, margin {fmtMargin(r.margin)}
                        </span>
                      </span>
                    ) : (
                      <span className="text-muted">not run</span>
                    );
                  return (
                    <tr key={id} className="border-t border-rule" data-rule={id} data-differs={differs ? "true" : undefined} aria-label={`Rule ${id}${differs ? ", verdict differs" : ""}`}>
                      <th scope="row" className="px-3 py-2 text-left font-mono font-normal">
                        {id} {differs ? <Badge tone="warn">verdict differs</Badge> : null}
                      </th>
                      <td className="px-3 py-2">{cell(ra)}</td>
                      <td className="px-3 py-2">{cell(rb)}</td>
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
          <p className="text-sm text-muted">{ports.length < 1 ? "The two scenarios share no system port." : "Solving…"}</p>
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
                    {[
                      ...d.params.map((p) => `${p.name}: ${JSON.stringify(p.before)} → ${JSON.stringify(p.after)}`),
                      ...d.fields.map((p) => `${p.name}: ${JSON.stringify(p.before)} → ${JSON.stringify(p.after)}`),
                      ...(d.state ? [`switch state: ${d.state.before ?? 1} → ${d.state.after ?? 1}`] : []),
                    ].join("; ")}
                  </span>
                ) : null}
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
                <span className="font-mono text-xs">{"at" in p ? p.at : `${String(p.before)} → ${String(p.after)}`}</span>
              </li>
            ))}
            {diff.settings.map((s) => (
              <li key={`s-${s.name}`}>
                <Badge tone="info">changed</Badge> {s.name}: <span className="font-mono text-xs">{JSON.stringify(s.before)} → {JSON.stringify(s.after)}</span>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
