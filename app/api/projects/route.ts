import { createProject, listProjectsForUser } from "@/db/queries/projects";
import { apiRoute, json } from "@/lib/server/api";
import { createProjectSchema } from "@/lib/base/validation/projects";

/** GET /api/projects → { projects: [{ id, name, description, role, createdAt, updatedAt }] } (mine). */
export const GET = apiRoute(async (ctx) => {
  const user = await ctx.requireUser();
  return json({ projects: await listProjectsForUser({ userId: user.id }) });
});

/** POST /api/projects { name, description? } → 201 { project }; the creator becomes owner. */
export const POST = apiRoute(async (ctx) => {
  const input = await ctx.body(createProjectSchema);
  const user = await ctx.requireUser();
  const project = await createProject({ actor: user, name: input.name, description: input.description });
  return json({ project }, { status: 201 });
});
