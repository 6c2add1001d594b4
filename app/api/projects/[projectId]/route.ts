import { deleteProject, getProjectForUser, updateProject } from "@/db/queries/projects";
import { apiRoute, json, noContent } from "@/lib/server/api";
import { updateProjectSchema } from "@/lib/base/validation/projects";

type Params = { projectId: string };

/** GET /api/projects/:projectId → { project } with my role; 404 unless I am a member. */
export const GET = apiRoute<Params>(async (ctx) => {
  const user = await ctx.requireUser();
  return json({ project: await getProjectForUser({ projectId: ctx.params.projectId, userId: user.id }) });
});

/** PATCH /api/projects/:projectId { name?, description? } → { project } (owners). */
export const PATCH = apiRoute<Params>(async (ctx) => {
  const input = await ctx.body(updateProjectSchema);
  const user = await ctx.requireUser();
  const project = await updateProject({ actor: user, projectId: ctx.params.projectId, ...input });
  return json({ project });
});

/** DELETE /api/projects/:projectId → 204 (owners). Everything in the project goes with it. */
export const DELETE = apiRoute<Params>(async (ctx) => {
  const user = await ctx.requireUser();
  await deleteProject({ actor: user, projectId: ctx.params.projectId });
  return noContent();
});
