import { deletePart, getPart, PartInUseError } from "@/db/queries/parts";
import { apiRoute, json, noContent } from "@/lib/server/api";

type Params = { projectId: string; partId: string };

/** GET …/parts/:partId → { part } with its Touchstone text. */
export const GET = apiRoute<Params>(async (ctx) => {
  const user = await ctx.requireUser();
  return json({ part: await getPart({ userId: user.id, projectId: ctx.params.projectId, partId: ctx.params.partId }) });
});

/** DELETE → 204; 409 { error, scenarios } while scenarios' latest revisions place it (engineers, owners). */
export const DELETE = apiRoute<Params>(async (ctx) => {
  const user = await ctx.requireUser();
  try {
    await deletePart({ actor: user, projectId: ctx.params.projectId, partId: ctx.params.partId });
  } catch (error) {
    if (error instanceof PartInUseError) return json({ error: { code: error.code, message: error.message }, scenarios: error.scenarios }, { status: 409 });
    throw error;
  }
  return noContent();
});
