import { listProjectsForUser } from "@/db/queries/projects";
import { getUserById } from "@/db/queries/users";
import { assertSiteAdmin } from "@/lib/server/admin";
import { apiRoute, json } from "@/lib/server/api";
import { AppError } from "@/lib/base/errors";

/** GET /api/admin/users/:userId/projects → { projects: [{ id, name, role }] } (site admin): the person's memberships. */
export const GET = apiRoute<{ userId: string }>(async (ctx) => {
  const actor = await ctx.requireUser();
  assertSiteAdmin(actor);
  if (!(await getUserById({ userId: ctx.params.userId }))) throw new AppError("not_found", 404, "User not found.");
  const projects = await listProjectsForUser({ userId: ctx.params.userId });
  return json({ projects: projects.map((p) => ({ id: p.id, name: p.name, role: p.role })) });
});
