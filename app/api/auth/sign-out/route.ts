import { apiRoute, noContent } from "@/lib/server/api";
import { blankSessionCookie, invalidateSessionToken, readSessionToken } from "@/lib/server/auth/session";

/** POST /api/auth/sign-out → 204; ends the session in the database and clears the cookie. */
export const POST = apiRoute(async (ctx) => {
  await invalidateSessionToken(readSessionToken(ctx.request.headers.get("cookie")));
  ctx.setCookie(blankSessionCookie());
  return noContent();
}, { public: true });
