"use client";

import { useCallback, useEffect, useState } from "react";
import useSWR from "swr";
import { RULE_SOURCE_LABELS } from "@/engine/checks";
import { Alert, Badge, Button, Spinner, VerdictBadge } from "@/components/ui";
import { ApiError, requestJson } from "@/lib/browser/api-client";
import type { RevisionVerdict } from "@/lib/domain/checks/types";

export const verdictUrl = (projectId: string, scenarioId: string, revisionId?: string) =>
  `/api/projects/${projectId}/scenarios/${scenarioId}/verdict${revisionId ? `?revisionId=${encodeURIComponent(revisionId)}` : ""}`;

export type RevisionVerdictCardProps = {
  projectId: string;
  scenarioId: string;
  /** the revision judged (default: the latest) */
  revisionId?: string;
  /** "open": run on open when no stored verdict is current (sign-off, compare); "look": only show what is stored */
  mode: "open" | "look";
  /** may run checks (check.run) */
  canRun: boolean;
  /** told the verdict once it is known (the sign-off panel shows its decision buttons only then) */
  onVerdict?: (verdict: RevisionVerdict | null) => void;
  title?: string;
};

const signed = (x: number | null | undefined) => (typeof x === "number" && Number.isFinite(x) ? `${x >= 0 ? "+" : "−"}${Math.abs(x).toFixed(2)}` : "—");

/**
 * The current verdict of one revision under its current rules (docs/checks.md "Verdict identity"): every
 * rule with its source and margin, the failing built-in checks, and which rule set and engine judged it.
 * When nothing stored is current it says so, with one action to run it; a revision that does not solve
 * is a readable message, never a spinner that does not stop.
 */
export function RevisionVerdictCard({ projectId, scenarioId, revisionId, mode, canRun, onVerdict, title }: RevisionVerdictCardProps) {
  const [running, setRunning] = useState(false);
  const [runError, setRunError] = useState<string | null>(null);
  const post = useCallback(
    async () => (await requestJson<{ verdict: RevisionVerdict }>(verdictUrl(projectId, scenarioId), { method: "POST", json: revisionId ? { revisionId } : {} })).verdict,
    [projectId, revisionId, scenarioId],
  );
  // on open: run when nothing stored is current (POST), or only look (GET); SWR keeps one request per key
  const open = mode === "open" && canRun;
  const { data: verdict, error: loadError, isLoading, mutate } = useSWR<RevisionVerdict>(
    [verdictUrl(projectId, scenarioId, revisionId), open ? "run" : "look"],
    async ([url]: [string, string]) => (open ? post() : (await requestJson<{ verdict: RevisionVerdict }>(url)).verdict),
    { revalidateOnFocus: !open, shouldRetryOnError: false },
  );
  useEffect(() => {
    if (verdict !== undefined) onVerdict?.(verdict);
    else if (loadError) onVerdict?.(null);
  }, [verdict, loadError, onVerdict]);
  const runNow = async () => {
    setRunning(true);
    setRunError(null);
    try {
      await mutate(post(), { revalidate: false });
    } catch (e) {
      setRunError(e instanceof Error ? e.message : String(e));
    } finally {
      setRunning(false);
    }
  };
  const busy = isLoading || running;
  const error = runError ?? (loadError ? (loadError instanceof ApiError || loadError instanceof Error ? loadError.message : String(loadError)) : null);

  const run = verdict?.run ?? null;
  const results = new Map((run?.figures.result.rules ?? []).map((r) => [r.id, r]));
  const builtIns = (run?.figures.result.checks ?? []).filter((c) => !c.name.startsWith("rule:") && c.verdict !== "pass");
  return (
    <section aria-label={title ?? "Verdict"} className="flex flex-col gap-2 rounded-md border border-rule bg-surface/60 p-3 text-sm" data-testid="revision-verdict">
      <div className="flex flex-wrap items-center gap-2">
        <h4 className="font-semibold">{title ?? (verdict ? `Verdict of revision ${verdict.revisionNumber}` : "Verdict")}</h4>
        {run ? <VerdictBadge verdict={run.verdict} /> : null}
        {verdict && !run ? (
          <Badge tone="warn" data-testid="stale-mark">
            stale
          </Badge>
        ) : null}
        {busy ? (
          <span role="status" className="flex items-center gap-1 text-muted">
            <Spinner size="sm" /> Judging…
          </span>
        ) : null}
      </div>
      {error ? (
        <Alert tone="error" title="No verdict">
          {error}
        </Alert>
      ) : null}
      {verdict && !run ? (
        <Alert
          tone="warn"
          actions={
            canRun ? (
              <Button size="sm" onClick={() => void runNow()} loading={busy}>
                Run all rules on revision {verdict.revisionNumber}
              </Button>
            ) : undefined
          }
        >
          No stored verdict is current for revision {verdict.revisionNumber}: the rules or the engine changed since it was last judged, or it was never judged.
        </Alert>
      ) : null}
      {verdict ? (
        <table aria-label="Rules and their verdicts" className="w-full border-collapse text-xs">
          <thead>
            <tr className="border-b border-rule text-left text-muted">
              <th className="py-1 pr-2 font-medium">Rule</th>
              <th className="py-1 pr-2 font-medium">Source</th>
              <th className="py-1 pr-2 font-medium">Verdict</th>
              <th className="py-1 font-medium">Worst, margin</th>
            </tr>
          </thead>
          <tbody>
            {verdict.ruleSet.rules.map((entry) => {
              const r = results.get(entry.id);
              return (
                <tr key={entry.id} className="border-b border-rule/60" data-rule={entry.id}>
                  <td className="py-1 pr-2 font-mono">{entry.id}</td>
                  <td className="py-1 pr-2">{RULE_SOURCE_LABELS[entry.source]}</td>
                  <td className="py-1 pr-2">{entry.not_run ? <span className="text-muted">not run</span> : r ? <VerdictBadge verdict={r.verdict} /> : <span className="text-muted">—</span>}</td>
                  <td className="figures py-1">
                    {entry.not_run ?? (r ? `${r.quantity} ${Number.isFinite(r.worst) ? r.worst.toFixed(2) : "—"} ${r.unit}, margin ${signed(r.margin)} ${r.unit === "dBm" ? "dB" : r.unit}` : "")}
                  </td>
                </tr>
              );
            })}
            {verdict.ruleSet.opted_out.map((o) => (
              <tr key={`x:${o.id}`} className="border-b border-rule/60 text-muted">
                <td className="py-1 pr-2 font-mono line-through">{o.id}</td>
                <td className="py-1 pr-2">project</td>
                <td className="py-1 pr-2">opted out</td>
                <td className="py-1">{o.reason}</td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : null}
      {builtIns.length > 0 ? (
        <ul className="text-xs">
          {builtIns.map((c) => (
            <li key={c.name}>
              <VerdictBadge verdict={c.verdict} /> <span className="font-mono">{c.name}</span>: {c.messages[0] ?? c.title}
            </li>
          ))}
        </ul>
      ) : null}
      {verdict ? (
        <p className="text-xs text-muted">
          Judged by rule set <span className="font-mono">{verdict.rulesHash.slice(0, 12)}</span>, engine {verdict.engineVersion}
          {run ? `, run by ${run.userName ?? "someone"}` : ""}.
        </p>
      ) : null}
    </section>
  );
}
