import "server-only";
import { decideSignoff, requestSignoff, signoffTarget, type DecidedSignoff, type RequestedSignoffs } from "@/db/queries/signoffs";
import { getScenario } from "@/db/queries/scenarios";
import { hasDraftBeyond } from "@/db/queries/drafts";
import { AppError } from "@/lib/base/errors";
import type { SessionUser } from "@/lib/server/auth/session";
import { authorize } from "@/lib/server/permissions";
import { revisionVerdict, solveProblem } from "@/lib/server/verdicts";

/**
 * Ask for a sign-off of a revision (latest unless `revisionId`) that solves: a revision the engine cannot
 * solve has no verdict to sign off, so the request is 422 naming the problem. The requester's working
 * draft must hold nothing beyond that revision (409 otherwise: what is signed off is a saved revision,
 * and the person should not believe their draft is under review). Then as requestSignoff.
 */
export async function requestSignoffOnEvidence(args: Parameters<typeof requestSignoff>[0]): Promise<RequestedSignoffs> {
  await authorize({ userId: args.actor.id, projectId: args.projectId, action: "signoff.request" });
  const { revision } = await getScenario({ userId: args.actor.id, projectId: args.projectId, scenarioId: args.scenarioId, revisionId: args.revisionId });
  if (await hasDraftBeyond({ userId: args.actor.id, scenarioId: args.scenarioId, content: revision.content })) {
    throw new AppError("conflict", 409, `Your working draft of this scenario has changes not in revision ${revision.number}. Save them as a revision (or discard the draft) before requesting sign-off.`);
  }
  const problem = await solveProblem({ projectId: args.projectId, content: revision.content });
  if (problem) {
    throw new AppError("unprocessable", 422, `Revision ${revision.number} does not solve, so it cannot be signed off: ${problem}`, { revisionId: problem });
  }
  return requestSignoff({ ...args, revisionId: revision.id });
}

/**
 * Decide a sign-off on the current verdict of the revision under review (run and stored first when no
 * stored run is current for its rules and engine). Approving a revision whose verdict fails needs a
 * waiver naming every failing rule (and failing built-in check) with a reason: without one 409 listing
 * them; a waiver that leaves one out or names one that does not fail is 422. The waiver and the verdict
 * are stored with the sign-off and its audit event. Otherwise as decideSignoff.
 */
export async function decideSignoffOnEvidence({
  actor,
  projectId,
  signoffId,
  decision,
  comment,
  waiver,
}: {
  actor: SessionUser;
  projectId: string;
  signoffId: string;
  decision: "approved" | "changes_requested";
  comment: string;
  waiver?: { id: string; reason: string }[];
}): Promise<DecidedSignoff> {
  await authorize({ userId: actor.id, projectId, action: "signoff.decide" });
  const target = await signoffTarget({ projectId, signoffId });
  if (target.reviewerId !== actor.id) throw new AppError("forbidden", 403, "Only the reviewer asked for this sign-off can decide it.");
  if (target.state !== "requested") throw new AppError("conflict", 409, "This sign-off has already been decided.");
  const verdict = await revisionVerdict({ actor, projectId, scenarioId: target.scenarioId, revisionId: target.revisionId, ensure: true });
  const run = verdict.run!;
  const failing = verdict.failing;
  const waived = waiver ?? [];
  if (decision === "approved") {
    if (failing.length > 0 && waived.length === 0) {
      throw new AppError(
        "conflict",
        409,
        `Revision ${verdict.revisionNumber} fails ${failing.join(", ")}. To approve it anyway, waive each failing rule with a reason.`,
        { waiver: `Waive ${failing.join(", ")}.` },
      );
    }
    const named = new Set(waived.map((w) => w.id));
    const missing = failing.filter((id) => !named.has(id));
    if (missing.length > 0) throw new AppError("unprocessable", 422, `The waiver leaves out ${missing.join(", ")}, which also fail${missing.length === 1 ? "s" : ""}.`, { waiver: `Waive ${missing.join(", ")} too.` });
    const extra = waived.filter((w) => !failing.includes(w.id)).map((w) => w.id);
    if (extra.length > 0) throw new AppError("unprocessable", 422, `${extra.join(", ")} ${extra.length === 1 ? "does" : "do"} not fail on this revision; waive only failing rules.`, { waiver: `Remove ${extra.join(", ")}.` });
  } else if (waived.length > 0) {
    throw new AppError("unprocessable", 422, "A waiver goes with an approval only.", { waiver: "Remove the waiver or approve." });
  }
  return decideSignoff({
    actor,
    projectId,
    signoffId,
    decision,
    comment,
    waiver: decision === "approved" && waived.length > 0 ? { rules: waived } : null,
    evidence: { verdict: run.verdict, rulesHash: verdict.rulesHash, engineVersion: verdict.engineVersion, failing, checkRunId: run.id },
  });
}
