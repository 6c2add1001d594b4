import "server-only";
import { Queue, type Job } from "bullmq";
import { Redis } from "ioredis";
import { AppError } from "@/lib/base/errors";
import { getEnv } from "@/lib/base/env";
import type { JobView } from "@/lib/domain/jobs";
import type { JobRefusal, JobTask } from "./tasks";

/** The BullMQ queue long jobs go through when REDIS_URL is set; `npm run worker` processes take them. */
export const QUEUE_NAME = "portolan-jobs";

/** What a queued job carries: the task (all it needs, so a worker on another machine reads no parts) and where its run goes. */
export type QueuedCheck = {
  projectId: string;
  scenarioId: string;
  revisionId: string;
  userId: string;
  task: Extract<JobTask, { kind: "check" }>;
  /** what the verdict is of (content hash, rules hash, engine version), stored with the run */
  identity: { contentHash: string; rulesHash: string; engineVersion: string };
};

/** What a queue worker returns: the stored run, or the refusal of the task; and who took it. */
export type QueuedResult = ({ runId: string } | { refusal: JobRefusal }) & { takenBy: string };

/** The Redis key a DELETE sets to stop a job a worker process is running (the worker polls it). */
export const cancelKey = (jobId: string) => `portolan:job-cancel:${jobId}`;

const holder = globalThis as typeof globalThis & { __portolanQueue?: { queue: Queue; redis: Redis } };

/** Whether long jobs go through Redis (REDIS_URL set) rather than the in-process pool. */
export function queueEnabled(): boolean {
  return Boolean(getEnv().redisUrl);
}

function connection(): { queue: Queue; redis: Redis } {
  if (!holder.__portolanQueue) {
    const url = getEnv().redisUrl;
    if (!url) throw new Error("REDIS_URL is not set");
    // BullMQ needs maxRetriesPerRequest: null on connections that block
    const redis = new Redis(url, { maxRetriesPerRequest: null });
    holder.__portolanQueue = { queue: new Queue(QUEUE_NAME, { connection: redis }), redis };
  }
  return holder.__portolanQueue;
}

/** Closes the app's queue connection (tests; shutdown). */
export async function closeQueue(): Promise<void> {
  const held = holder.__portolanQueue;
  holder.__portolanQueue = undefined;
  await held?.queue.close();
  held?.redis.disconnect();
}

async function view(job: Job<QueuedCheck, QueuedResult>): Promise<JobView> {
  const state = await job.getState();
  const cancelled = (await connection().redis.exists(cancelKey(job.id!))) === 1;
  const result = job.returnvalue as QueuedResult | null;
  const refusal = result && "refusal" in result ? result.refusal : null;
  const base: JobView = {
    id: job.id!,
    projectId: job.data.projectId,
    scenarioId: job.data.scenarioId,
    kind: job.data.task.request.check,
    state: "queued",
    progress: typeof job.progress === "object" && job.progress !== null ? (job.progress as JobView["progress"]) : null,
    runId: null,
    error: null,
    createdAt: new Date(job.timestamp).toISOString(),
    finishedAt: job.finishedOn ? new Date(job.finishedOn).toISOString() : null,
    takenBy: result?.takenBy ?? null,
  };
  if (cancelled) return { ...base, state: "cancelled" };
  if (state === "active") return { ...base, state: "running" };
  if (state === "failed") return { ...base, state: "failed", error: { code: "internal", status: 500, message: job.failedReason || "The job failed." } };
  if (state === "completed" && refusal) return { ...base, state: "failed", error: { code: refusal.code, status: refusal.status, message: refusal.message } };
  if (state === "completed" && result && "runId" in result) return { ...base, state: "done", runId: result.runId, progress: { phase: "storing", fraction: 1 } };
  return base;
}

/** Puts a check on the queue; a worker process runs it and stores its run. */
export async function enqueueCheck(data: QueuedCheck): Promise<JobView> {
  const job = (await connection().queue.add(data.task.request.check, data, { removeOnComplete: { age: 15 * 60 }, removeOnFail: { age: 15 * 60 } })) as Job<QueuedCheck, QueuedResult>;
  return view(job);
}

/** A queued job of this project, or 404. */
export async function getQueuedJob({ projectId, jobId }: { projectId: string; jobId: string }): Promise<JobView> {
  const job = (await connection().queue.getJob(jobId)) as Job<QueuedCheck, QueuedResult> | undefined;
  if (!job || job.data.projectId !== projectId) throw new AppError("not_found", 404, "Job not found (finished jobs are kept for 15 minutes).");
  return view(job);
}

/** Cancels a queued job (removed) or a running one (its worker sees the cancel key and stops it); nothing is stored. */
export async function cancelQueuedJob({ projectId, jobId, userId, isOwner }: { projectId: string; jobId: string; userId: string; isOwner: boolean }): Promise<JobView> {
  const job = (await connection().queue.getJob(jobId)) as Job<QueuedCheck, QueuedResult> | undefined;
  if (!job || job.data.projectId !== projectId) throw new AppError("not_found", 404, "Job not found (finished jobs are kept for 15 minutes).");
  if (job.data.userId !== userId && !isOwner) throw new AppError("forbidden", 403, "Only who started a job, or an owner, can cancel it.");
  const before = await view(job);
  if (before.state !== "queued" && before.state !== "running") return before;
  await connection().redis.set(cancelKey(jobId), "1", "EX", 15 * 60);
  if (before.state === "queued") await job.remove().catch(() => undefined); // a worker took it meanwhile: the key stops it
  return { ...before, state: "cancelled", finishedAt: new Date().toISOString() };
}
