import { apiRoute, noContent } from "@/lib/server/api";
import { revokeApiToken } from "@/lib/server/auth/api-tokens";

/** DELETE /api/account/tokens/:tokenId → 204; the token stops working at once (404 if not yours). */
export const DELETE = apiRoute<{ tokenId: string }>(async (ctx) => {
  const user = await ctx.requireUser();
  await revokeApiToken({ actor: user, tokenId: ctx.params.tokenId });
  return noContent();
});
