import "server-only";
import { randomUUID } from "node:crypto";
import { AppError } from "@/lib/base/errors";
import type { JobProgress, JobView } from "@/lib/domain/jobs";

export type { JobView };

type Entry = JobView & { userId: string; controller: AbortController };

// In-process jobs of this server; on globalThis because Next may load this module once per route bundle.
const holder = globalThis as typeof globalThis & { __portolanJobs?: Map<string, Entry> };
const jobs = (holder.__portolanJobs ??= new Map<string, Entry>());

/** Finished jobs are forgotten after this long (their results are in the database). */
const KEEP_FINISHED_MS = 15 * 60 * 1000;

function forgetOld(now: number): void {
  for (const [id, job] of jobs) {
    if (job.finishedAt && now - Date.parse(job.finishedAt) > KEEP_FINISHED_MS) jobs.delete(id);
  }
}

function view(entry: Entry): JobView {
  const { userId: _userId, controller: _controller, ...rest } = entry;
  void _userId;
  void _controller;
  return { ...rest };
}

/**
 * Starts a long job in the background and answers at once with its view (state "queued"). `work` gets
 * the job's abort signal (DELETE, shutdown) and a progress reporter, and resolves to the stored run's id.
 */
export function startJob(
  { projectId, scenarioId, userId, kind }: { projectId: string; scenarioId: string; userId: string; kind: string },
  work: (ctx: { signal: AbortSignal; report: (p: JobProgress) => void }) => Promise<string>,
): JobView {
  forgetOld(Date.now());
  const entry: Entry = {
    id: randomUUID(),
    projectId,
    scenarioId,
    userId,
    kind,
    state: "queued",
    progress: null,
    runId: null,
    error: null,
    createdAt: new Date().toISOString(),
    finishedAt: null,
    takenBy: "app",
    controller: new AbortController(),
  };
  jobs.set(entry.id, entry);
  const report = (p: JobProgress) => {
    if (entry.state === "queued") entry.state = "running";
    entry.progress = p;
  };
  work({ signal: entry.controller.signal, report }).then(
    (runId) => {
      if (entry.state === "cancelled") return;
      entry.state = "done";
      entry.runId = runId;
      entry.progress = { phase: "storing", fraction: 1 };
      entry.finishedAt = new Date().toISOString();
    },
    (error: unknown) => {
      if (entry.state === "cancelled") return;
      entry.state = "failed";
      entry.error =
        error instanceof AppError
          ? { code: error.code, status: error.status, message: error.message }
          : { code: "internal", status: 500, message: "The job failed with an internal error." };
      if (!(error instanceof AppError)) console.error(`job ${entry.id} (${kind}) failed`, error);
      entry.finishedAt = new Date().toISOString();
    },
  );
  return view(entry);
}

/** A job of this project, or 404 (a job of another project is not found, not forbidden). */
export function getJob({ projectId, jobId }: { projectId: string; jobId: string }): JobView {
  const entry = jobs.get(jobId);
  if (!entry || entry.projectId !== projectId) throw new AppError("not_found", 404, "Job not found (finished jobs are kept for 15 minutes).");
  return view(entry);
}

/**
 * Cancels a running or queued job: its thread is stopped and nothing is stored. Whoever started it, or an
 * owner of the project, may cancel it.
 */
export function cancelJob({ projectId, jobId, userId, isOwner }: { projectId: string; jobId: string; userId: string; isOwner: boolean }): JobView {
  const entry = jobs.get(jobId);
  if (!entry || entry.projectId !== projectId) throw new AppError("not_found", 404, "Job not found (finished jobs are kept for 15 minutes).");
  if (entry.userId !== userId && !isOwner) throw new AppError("forbidden", 403, "Only who started a job, or an owner, can cancel it.");
  if (entry.state === "queued" || entry.state === "running") {
    entry.state = "cancelled";
    entry.finishedAt = new Date().toISOString();
    entry.controller.abort();
  }
  return view(entry);
}
