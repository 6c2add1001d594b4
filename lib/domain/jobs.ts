// Shapes of the job API (lib/server/jobs), shared by the server and the browser.

/** Progress a job reports while it runs: a phase and the fraction done (0…1). */
export type JobProgress = { phase: "estimating" | "solving" | "sampling" | "checking" | "storing"; fraction: number };

/** What a long job reports at GET /api/projects/:p/jobs/:id. */
export type JobView = {
  id: string;
  projectId: string;
  scenarioId: string;
  kind: string;
  state: "queued" | "running" | "done" | "failed" | "cancelled";
  progress: JobProgress | null;
  /** the stored check run when done */
  runId: string | null;
  /** what went wrong when failed: the message a person can act on, and its status */
  error: { code: string; status: number; message: string } | null;
  createdAt: string;
  finishedAt: string | null;
  /** who ran it: "app" (this server's pool) or the queue worker process that took it ("worker <pid>@<host>") */
  takenBy: string | null;
};
