// The job thread's entry, built by scripts/build-cli.mjs into dist/job-worker.mjs (plain JavaScript, so
// that piscina loads it the same under `next start`, vitest and `npm run worker`). A task may carry a
// MessagePort; progress is posted on it.
import type { MessagePort } from "node:worker_threads";
import { runTask, type JobOutput, type JobTask } from "./tasks";

export default async function run({ task, progress }: { task: JobTask; progress?: MessagePort }): Promise<JobOutput> {
  try {
    return await runTask(task, (p) => progress?.postMessage(p));
  } finally {
    progress?.close();
  }
}
