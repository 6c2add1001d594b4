"use client";

import useSWR from "swr";
import { useState } from "react";
import { Alert, Badge, Button, Spinner, Table, TBody, Td, Th, THead, Tr } from "@/components/ui";
import { fetchJson, requestJson, scenarioUrls } from "@/lib/browser/api-client";
import type { RevisionListItem } from "@/lib/domain/scenarios/types";
import { formatDate } from "@/lib/base/dates";
import { summaryText } from "@/lib/domain/scenarios/summary";

const ORIGIN_TEXT: Record<string, string> = { create: "created", save: "saved", restore: "restored", duplicate: "duplicated", seed: "demo", import: "imported from a bundle" };

/**
 * Every revision of the scenario, newest first: number, the author's note, what it changed in words
 * (stored when saved), who saved it and when (UTC); restore writes a new revision with the old content.
 */
export function RevisionHistory({
  projectId,
  scenarioId,
  currentNumber,
  readOnly,
  hasUnsavedEdits,
  onRestored,
}: {
  projectId: string;
  scenarioId: string;
  currentNumber: number;
  readOnly: boolean;
  hasUnsavedEdits: boolean;
  onRestored: () => Promise<void>;
}) {
  const url = scenarioUrls.revisions(projectId, scenarioId);
  // the key carries the current number so that a new save refreshes the list
  const { data, error, isLoading, mutate } = useSWR<{ revisions: RevisionListItem[] }>([url, currentNumber], ([u]: [string, number]) => fetchJson(u));
  const [restoring, setRestoring] = useState<string | null>(null);
  const [restoreError, setRestoreError] = useState<string | null>(null);

  const restore = async (revision: RevisionListItem) => {
    setRestoring(revision.id);
    setRestoreError(null);
    try {
      await requestJson(scenarioUrls.restore(projectId, scenarioId, revision.id), { method: "POST" });
      await onRestored();
      await mutate();
    } catch (e) {
      setRestoreError(e instanceof Error ? e.message : String(e));
    } finally {
      setRestoring(null);
    }
  };

  return (
    <section aria-label="Revision history" className="max-h-80 overflow-y-auto rounded-card border border-rule bg-surface p-3">
      {isLoading ? <Spinner label="Loading revisions…" /> : null}
      {error ? <Alert tone="error" title="The revisions could not be loaded">{error instanceof Error ? error.message : String(error)}</Alert> : null}
      {restoreError ? <Alert tone="error" title="Not restored">{restoreError}</Alert> : null}
      {hasUnsavedEdits && !readOnly ? <p className="mb-2 text-xs text-muted">Restoring is possible once your draft is saved as a revision or discarded.</p> : null}
      {data ? (
        <Table dense aria-label="Revisions">
          <THead>
            <Tr>
              <Th numeric>Revision</Th>
              <Th>Note</Th>
              <Th>What changed</Th>
              <Th>By</Th>
              <Th>Saved (UTC)</Th>
              <Th>
                <span className="sr-only">Actions</span>
              </Th>
            </Tr>
          </THead>
          <TBody>
            {data.revisions.map((r) => (
              <Tr key={r.id} data-testid="revision-row">
                <Td numeric title={`Content hash ${r.contentHash}`}>
                  r{r.number}
                  {r.number === currentNumber ? (
                    <Badge tone="info" className="ml-2">
                      latest
                    </Badge>
                  ) : null}
                </Td>
                <Td className="max-w-56 text-sm">{r.note ? r.note : <span className="text-muted">—</span>}</Td>
                <Td className="max-w-md text-xs">
                  <span className="text-muted">
                    {ORIGIN_TEXT[r.origin] ?? r.origin}
                    {r.restoredFrom ? ` r${r.restoredFrom}` : ""}
                    {r.mergedWith ? `, merged with r${r.mergedWith}` : ""}
                    {r.summary && r.summary.changes.length > 0 ? ": " : ""}
                  </span>
                  {r.summary && r.summary.changes.length > 0 ? summaryText(r.summary) : r.summary ? <span className="text-muted"> · {summaryText(r.summary)}</span> : null}
                  {r.warnings.length > 0 ? (
                    <Badge tone="warn" className="ml-2" title={r.warnings.join(" ")}>
                      incomplete
                    </Badge>
                  ) : null}
                </Td>
                <Td className="text-xs">{r.authorName ?? "—"}</Td>
                <Td className="figures text-xs whitespace-nowrap">{formatDate(r.createdAt, "second")}</Td>
                <Td>
                  {!readOnly && r.number !== currentNumber ? (
                    <Button size="sm" variant="ghost" disabled={hasUnsavedEdits} loading={restoring === r.id} onClick={() => restore(r)} aria-label={`Restore revision ${r.number}`}>
                      Restore
                    </Button>
                  ) : null}
                </Td>
              </Tr>
            ))}
          </TBody>
        </Table>
      ) : null}
    </section>
  );
}
