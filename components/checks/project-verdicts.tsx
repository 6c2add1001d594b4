"use client";

import Link from "next/link";
import { useState } from "react";
import { useRouter } from "next/navigation";
import { Alert, Badge, Button, VerdictBadge } from "@/components/ui";
import { requestJson } from "@/lib/browser/api-client";
import { verdictUrl } from "./revision-verdict";

/** One scenario's latest verdict as lib/server/verdicts.ts `projectVerdicts` lists it (dates as strings). */
export type ScenarioVerdictItem = {
  scenarioId: string;
  scenarioName: string;
  revisionNumber: number;
  state: "current" | "stale" | "none";
  verdict: "pass" | "fail" | "warn" | null;
  reasons: string[];
  judgedAt: string | null;
};

/**
 * The project overview's verdicts: each scenario's latest revision with its "all rules" verdict, current
 * for the rules and engine of today or marked stale (with why), and one action to judge it again.
 */
export function ProjectVerdicts({ projectId, rows, canRun }: { projectId: string; rows: ScenarioVerdictItem[]; canRun: boolean }) {
  const router = useRouter();
  const [busy, setBusy] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const rerun = async (scenarioId: string) => {
    setBusy(scenarioId);
    setError(null);
    try {
      await requestJson(verdictUrl(projectId, scenarioId), { method: "POST", json: {} });
      router.refresh();
    } catch (e) {
      setError(e instanceof Error ? e.message : String(e));
    } finally {
      setBusy(null);
    }
  };
  if (rows.length === 0) return <p className="text-sm text-muted">No scenarios yet.</p>;
  return (
    <div className="flex flex-col gap-2">
      {error ? <Alert tone="error">{error}</Alert> : null}
      <ul aria-label="Scenario verdicts" className="flex flex-col gap-1 text-sm">
        {rows.map((r) => (
          <li key={r.scenarioId} className="flex flex-wrap items-center gap-2" data-scenario={r.scenarioName}>
            <Link href={`/projects/${projectId}/scenarios/${r.scenarioId}`} className="font-medium underline underline-offset-4">
              {r.scenarioName}
            </Link>
            <span className="text-muted">r{r.revisionNumber}</span>
            {r.verdict ? <VerdictBadge verdict={r.verdict} /> : null}
            {r.state === "stale" ? (
              <Badge tone="warn" title={r.reasons.join("; ")} data-testid="stale-mark">
                stale: {r.reasons.join("; ")}
              </Badge>
            ) : null}
            {r.state === "none" ? <span className="text-muted">not judged yet</span> : null}
            {r.state !== "current" && canRun ? (
              <Button size="sm" variant="secondary" loading={busy === r.scenarioId} onClick={() => void rerun(r.scenarioId)}>
                {r.state === "none" ? "Run all rules" : "Re-run"}
              </Button>
            ) : null}
          </li>
        ))}
      </ul>
    </div>
  );
}
