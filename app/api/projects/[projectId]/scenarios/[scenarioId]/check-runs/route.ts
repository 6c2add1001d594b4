import { LONG_CHECKS, listRunsWithFreshness, runCheck, startCheckJob } from "@/lib/server/check-runs";
import { checkRunRequestSchema } from "@/lib/domain/checks/inputs";
import { apiRoute, json, parseWith } from "@/lib/server/api";
import { resolveAccess } from "@/lib/server/permissions";
import { z } from "zod";

type Params = { projectId: string; scenarioId: string };

const limitSchema = z.coerce.number().int().min(1).max(200).default(50);

/** GET …/check-runs[?limit=n] → { runs } newest first, without figures, each with `stale` reasons and `latest` (anyone in the project). */
export const GET = apiRoute<Params>(async (ctx) => {
  const raw = new URL(ctx.request.url).searchParams.get("limit");
  const limit = parseWith(limitSchema, raw ?? undefined);
  const user = await ctx.requireUser();
  const access = await resolveAccess({ userId: user.id, projectId: ctx.params.projectId });
  return json({ runs: await listRunsWithFreshness({ access, scenarioId: ctx.params.scenarioId, limit }) });
});

/**
 * POST { check, inputs, revisionId? } → 201 { run }: runs the check in the job pool on that revision
 * (default the latest) and stores it (check.run: owners, engineers, reviewers). A long check (state sweep)
 * answers 202 { job } at once; follow it at GET /api/projects/:p/jobs/:id. 400 for malformed input, 422
 * when the inputs do not fit the scenario, it cannot be solved, or its size estimate is over
 * MAX_SOLVE_MEMORY (`fields.estimate`, `fields.limit`); 504 past the time limit; nothing is stored then.
 * A client that goes away cancels its short job.
 */
export const POST = apiRoute<Params>(async (ctx) => {
  const request = await ctx.body(checkRunRequestSchema);
  const user = await ctx.requireUser();
  const access = await resolveAccess({ userId: user.id, projectId: ctx.params.projectId });
  const args = { access, scenarioId: ctx.params.scenarioId, request, signal: ctx.request.signal };
  if (LONG_CHECKS.has(request.check)) return json({ job: await startCheckJob(args) }, { status: 202 });
  const run = await runCheck(args);
  return json({ run }, { status: 201 });
});
