import "server-only";
import { existsSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { MessageChannel } from "node:worker_threads";
import { Piscina } from "piscina";
import { AppError } from "@/lib/base/errors";
import { getEnv } from "@/lib/base/env";
import { sizeFields, type JobOutput, type JobProgress, type JobTask } from "./tasks";

/**
 * The compiled job thread (scripts/build-cli.mjs). Resolved from the working directory: `next start`,
 * vitest and `npm run worker` all run from the repository root, and a bundled route has no stable
 * __dirname of its own.
 */
export function workerFile(): string {
  const file = path.resolve(process.cwd(), "dist", "job-worker.mjs");
  if (!existsSync(file)) throw new Error(`${file} is missing: run \`npm run build:cli\` (npm install and npm run build do it)`);
  return file;
}

// One pool per process; kept on globalThis because Next may load this module once per route bundle.
const holder = globalThis as typeof globalThis & { __portolanPool?: Piscina };

/** The process's pool of job threads (JOB_THREADS, default cores − 1 and at least 1). */
export function jobPool(): Piscina {
  holder.__portolanPool ??= new Piscina({
    filename: workerFile(),
    maxThreads: getEnv().jobThreads ?? Math.max(1, os.availableParallelism() - 1),
    minThreads: 1,
    // a thread that solved something large gives its memory back when it is replaced
    idleTimeout: 30_000,
  });
  return holder.__portolanPool;
}

/** Closes the pool (tests; a server shutting down). */
export async function closeJobPool(): Promise<void> {
  const pool = holder.__portolanPool;
  holder.__portolanPool = undefined;
  await pool?.destroy();
}

export type RunOptions = {
  /** aborts the job (the request's signal: the client went away; a DELETE of a long job) */
  signal?: AbortSignal;
  /** milliseconds before the job is cancelled (default JOB_TIME_LIMIT_SECONDS) */
  timeLimitMs?: number;
  onProgress?: (p: JobProgress) => void;
};

/**
 * Runs a task in a pool thread, never on the request's thread. Aborting (the signal, or the time limit)
 * ends the thread running it: piscina terminates a worker whose task is aborted, so its memory goes too.
 *
 * @throws AppError 504 job_timeout past the time limit, 499 job_cancelled when the signal aborts
 */
export async function runInPool(task: JobTask, opts: RunOptions = {}): Promise<JobOutput> {
  const limitMs = opts.timeLimitMs ?? getEnv().jobTimeLimitMs;
  const timer = new AbortController();
  const timeout = setTimeout(() => timer.abort(), limitMs);
  const signal = opts.signal ? AbortSignal.any([opts.signal, timer.signal]) : timer.signal;
  const channel = opts.onProgress ? new MessageChannel() : null;
  if (channel && opts.onProgress) channel.port2.on("message", opts.onProgress);
  try {
    return (await jobPool().run(channel ? { task, progress: channel.port1 } : { task }, { signal, transferList: channel ? [channel.port1] : undefined })) as JobOutput;
  } catch (error) {
    if (timer.signal.aborted) throw new AppError("job_timeout", 504, `The job took longer than its limit of ${Math.round(limitMs / 1000)} s and was stopped (JOB_TIME_LIMIT_SECONDS on the server).`);
    if (opts.signal?.aborted) throw new AppError("job_cancelled", 499, "The job was cancelled.");
    throw error;
  } finally {
    clearTimeout(timeout);
    channel?.port2.close();
  }
}

/** A task's refusal as the AppError a route answers with (422, the size estimate and limit in `fields`). */
export function refusalError(output: Extract<JobOutput, { ok: false }>, prefix: string): AppError {
  return new AppError(output.code === "too_large" ? "too_large" : "unprocessable", output.status, `${prefix}${output.message}`, sizeFields(output));
}

/** Task limits from the environment (MAX_SOLVE_MEMORY, PART_CACHE_SIZE). */
export function taskLimits(): { maxBytes: number; partCacheBytes: number } {
  const env = getEnv();
  return { maxBytes: env.maxSolveBytes, partCacheBytes: env.partCacheBytes };
}
