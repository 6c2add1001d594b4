import { apiRoute, json } from "@/lib/server/api";
import { createApiToken, listApiTokens } from "@/lib/server/auth/api-tokens";
import { createApiTokenSchema } from "@/lib/base/validation/api-tokens";

// Token management needs a browser session: the route helper refuses API tokens outside /api/projects/….

/** GET /api/account/tokens → { tokens } of the signed-in person (never the tokens themselves). */
export const GET = apiRoute(async (ctx) => {
  const user = await ctx.requireUser();
  return json({ tokens: await listApiTokens({ userId: user.id }) });
});

/**
 * POST /api/account/tokens { name, expiresInDays, projectIds, roleCeiling } → 201 { token, apiToken }.
 * `token` is shown this once; only its hash is kept.
 */
export const POST = apiRoute(async (ctx) => {
  const user = await ctx.requireUser();
  const input = await ctx.body(createApiTokenSchema);
  const { token, view } = await createApiToken({ actor: user, input });
  return json({ token, apiToken: view }, { status: 201 });
});
