import { decideSignoffOnEvidence } from "@/lib/server/signoffs/evidence";
import { apiRoute, json } from "@/lib/server/api";
import { notifySignoffDecided } from "@/lib/server/signoffs/notify";
import { decideSignoffSchema } from "../../schema";

type Params = { projectId: string; signoffId: string };

/**
 * POST …/signoffs/:signoffId/decide { decision: "approved" | "changes_requested", comment, waiver? } → { signoff, mail }.
 * Only the named reviewer (reviewer or owner role); 409 once decided or when the scenario changed since.
 * Decided on the revision's current verdict (run first if needed): approving a failing revision needs
 * `waiver: [{ id, reason }]` naming each failing rule, else 409 listing them.
 * The requester is e-mailed unless they turned sign-off e-mails off.
 */
export const POST = apiRoute<Params>(async (ctx) => {
  const input = await ctx.body(decideSignoffSchema);
  const user = await ctx.requireUser();
  const decided = await decideSignoffOnEvidence({ actor: user, projectId: ctx.params.projectId, signoffId: ctx.params.signoffId, decision: input.decision, comment: input.comment, waiver: input.waiver });
  const mail = await notifySignoffDecided(decided);
  return json({ signoff: decided.signoff, mail });
});
