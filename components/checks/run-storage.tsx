"use client";

import useSWR from "swr";
import { ConfirmButton } from "@/components/ui";
import { fetchJson, jobUrls, requestJson } from "@/lib/browser/api-client";

type Storage = { runs: number; bytes: number; pinned: number; clearable: number; clearableBytes: number; keptPerCheck: number };

function formatSize(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 ** 2) return `${(bytes / 1024).toFixed(1)} KiB`;
  return `${(bytes / 1024 ** 2).toFixed(1)} MiB`;
}

/**
 * What the scenario's stored check runs take; owners can clear the runs the retention rule does not keep
 * (all but the newest few of each check and revision, and those a sign-off or bundle refers to).
 */
export function RunStorage({ projectId, scenarioId, canClear }: { projectId: string; scenarioId: string; canClear: boolean }) {
  const url = jobUrls.storage(projectId, scenarioId);
  const { data, mutate } = useSWR<{ storage: Storage }>(url, fetchJson);
  if (!data) return null;
  const s = data.storage;
  return (
    <section className="mt-3 text-xs text-muted" aria-label="Stored check runs">
      <p>
        Stored runs: {s.runs} ({formatSize(s.bytes)}); the newest {s.keptPerCheck} of each check and revision are kept
        {s.pinned > 0 ? `, and ${s.pinned} a sign-off or bundle refers to` : ""}.
        {s.clearable > 0 ? ` ${s.clearable} older run${s.clearable === 1 ? "" : "s"} (${formatSize(s.clearableBytes)}) can be cleared.` : ""}
      </p>
      {canClear && s.clearable > 0 ? (
        <ConfirmButton
          buttonProps={{ size: "sm", className: "mt-1" }}
          title="Clear older check runs?"
          description={`${s.clearable} run${s.clearable === 1 ? "" : "s"} beyond the newest ${s.keptPerCheck} of each check and revision will be deleted.`}
          confirmLabel="Clear"
          onConfirm={async () => {
            const answer = await requestJson<{ storage: Storage }>(url, { method: "DELETE" });
            await mutate(answer, { revalidate: false });
          }}
        >
          Clear older runs
        </ConfirmButton>
      ) : null}
    </section>
  );
}
