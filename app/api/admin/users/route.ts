import { listUsers } from "@/db/queries/users";
import { assertSiteAdmin } from "@/lib/server/admin";
import { apiRoute, json } from "@/lib/server/api";

/** GET /api/admin/users → { users } (site admin). */
export const GET = apiRoute(async (ctx) => {
  const user = await ctx.requireUser();
  assertSiteAdmin(user);
  return json({ users: await listUsers() });
});
