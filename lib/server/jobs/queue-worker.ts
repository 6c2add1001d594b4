// `npm run worker`: a process that takes long jobs from the BullMQ queue on REDIS_URL, runs each in its
// own pool of job threads (as the app does without Redis) and stores the run in the database the app
// uses (DATABASE_URL). Built to dist/queue-worker.mjs by scripts/build-cli.mjs.
import os from "node:os";
import { Worker } from "bullmq";
import { Redis } from "ioredis";
import { randomUUID } from "node:crypto";
import { insertCheckRun } from "@/db/queries/check-runs";
import { getEnv } from "@/lib/base/env";
import { closeJobPool, runInPool } from "./pool";
import { cancelKey, QUEUE_NAME, type QueuedCheck, type QueuedResult } from "./queue";

const env = getEnv();
if (!env.redisUrl) {
  console.error("npm run worker needs REDIS_URL (redis://host:port): the queue it takes jobs from.");
  process.exit(2);
}
const takenBy = `worker ${process.pid}@${os.hostname()}`;
const redis = new Redis(env.redisUrl, { maxRetriesPerRequest: null });

const worker = new Worker<QueuedCheck, QueuedResult>(
  QUEUE_NAME,
  async (job) => {
    const data = job.data;
    // a DELETE in the app sets the cancel key; stop the thread when it appears
    const stop = new AbortController();
    const poll = setInterval(() => {
      void redis.exists(cancelKey(job.id!)).then((n) => n === 1 && stop.abort(), () => undefined);
    }, 250);
    try {
      const output = await runInPool(data.task, { signal: stop.signal, onProgress: (p) => void job.updateProgress(p) });
      if (!output.ok) return { refusal: output, takenBy };
      if (output.kind !== "check") throw new Error(`a check job answered ${output.kind}`);
      const id = randomUUID();
      await insertCheckRun(
        {
          id,
          scenarioId: data.scenarioId,
          revisionId: data.revisionId,
          userId: data.userId,
          check: data.task.request.check,
          inputs: data.task.request.inputs as Record<string, unknown>,
          verdict: output.verdict,
          headline: output.headline,
          figuresGz: output.figuresGz,
          ...data.identity,
        },
        { keep: env.runsKept },
      );
      return { runId: id, takenBy };
    } finally {
      clearInterval(poll);
    }
  },
  { connection: new Redis(env.redisUrl, { maxRetriesPerRequest: null }), concurrency: env.jobThreads ?? Math.max(1, os.availableParallelism() - 1) },
);

worker.on("ready", () => console.log(`portolan worker: taking jobs from ${QUEUE_NAME} (${takenBy})`));
worker.on("failed", (job, error) => console.error(`portolan worker: job ${job?.id} failed: ${error.message}`));

async function shutdown(): Promise<void> {
  await worker.close();
  await closeJobPool();
  redis.disconnect();
  process.exit(0);
}
process.on("SIGTERM", () => void shutdown());
process.on("SIGINT", () => void shutdown());
