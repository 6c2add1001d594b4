"use client";

import { Button } from "@/components/ui";
import type { JobView } from "@/lib/domain/jobs";

const PHASES: Record<string, string> = { estimating: "Checking the size", solving: "Solving", sampling: "Solving the samples", checking: "Running the check", storing: "Storing the run" };

/** A long job's progress bar with Cancel (a state sweep started from the checks panel or the helm). */
export function JobProgress({ job, title, onCancel }: { job: Pick<JobView, "state" | "progress">; title: string; onCancel: () => void }) {
  const fraction = job.progress?.fraction ?? 0;
  const phase = job.state === "queued" ? "Waiting for a free worker" : (PHASES[job.progress?.phase ?? ""] ?? "Running");
  return (
    <div className="mb-3 flex items-center gap-3 rounded border border-rule-strong p-2" data-testid="job-progress">
      <div className="min-w-0 flex-1">
        <p className="text-sm">
          {title}: {phase}…
        </p>
        <div
          role="progressbar"
          aria-label={`${title} progress`}
          aria-valuemin={0}
          aria-valuemax={100}
          aria-valuenow={Math.round(fraction * 100)}
          className="mt-1 h-2 w-full overflow-hidden rounded bg-sunken"
        >
          <div className="h-full bg-ink transition-[width]" style={{ width: `${Math.round(fraction * 100)}%` }} />
        </div>
      </div>
      <Button variant="secondary" size="sm" onClick={onCancel}>
        Cancel
      </Button>
    </div>
  );
}
