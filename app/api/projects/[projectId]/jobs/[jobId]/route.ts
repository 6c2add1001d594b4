import { z } from "zod";
import { apiRoute, json, parseWith } from "@/lib/server/api";
import { allow, resolveAccess } from "@/lib/server/permissions";
import { cancelQueuedJob, getQueuedJob, queueEnabled } from "@/lib/server/jobs/queue";
import { cancelJob, getJob } from "@/lib/server/jobs/registry";

type Params = { projectId: string; jobId: string };

// in-process jobs have UUIDs, BullMQ jobs numbers
const jobIdSchema = z.string().regex(/^[A-Za-z0-9-]{1,64}$/, "Give a job id.");

/**
 * GET → { job }: a long job's state (queued, running, done, failed, cancelled), progress
 * `{ phase, fraction }`, the stored run's id when done, the error when failed (anyone in the project).
 */
export const GET = apiRoute<Params>(async (ctx) => {
  const jobId = parseWith(jobIdSchema, ctx.params.jobId);
  const user = await ctx.requireUser();
  const access = await resolveAccess({ userId: user.id, projectId: ctx.params.projectId });
  allow(access, "scenario.read");
  return json({ job: queueEnabled() ? await getQueuedJob({ projectId: access.projectId, jobId }) : getJob({ projectId: access.projectId, jobId }) });
});

/** DELETE → { job }: cancels a queued or running job (who started it, or an owner); nothing is stored. */
export const DELETE = apiRoute<Params>(async (ctx) => {
  const jobId = parseWith(jobIdSchema, ctx.params.jobId);
  const user = await ctx.requireUser();
  const access = await resolveAccess({ userId: user.id, projectId: ctx.params.projectId });
  allow(access, "check.run");
  const args = { projectId: access.projectId, jobId, userId: user.id, isOwner: access.role === "owner" };
  return json({ job: queueEnabled() ? await cancelQueuedJob(args) : cancelJob(args) });
});
