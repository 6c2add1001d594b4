import "server-only";
import { randomUUID } from "node:crypto";
import { and, desc, eq, inArray, sql, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { db, runInTransaction } from "@/db/client";
import { checkRuns, memberships, projects, scenarioRevisions, scenarios, signoffs, users, type SignoffEvidence, type SignoffState, type SignoffWaiver, type VerdictSnapshotEntry } from "@/db/schema";
import { recordAudit } from "@/lib/server/audit";
import type { SessionUser } from "@/lib/server/auth/session";
import { AppError } from "@/lib/base/errors";
import { authorize } from "@/lib/server/permissions";
import { loadRevision, requireScenarioRow } from "./revisions";

/** Roles that may be asked to sign off (docs/README.md "Roles": reviewers sign off; owners may too). */
export const SIGNOFF_REVIEWER_ROLES = ["reviewer", "owner"] as const;

/** A sign-off as the API returns it. `stale` when the scenario's latest revision has another content hash. */
export type SignoffView = {
  id: string;
  projectId: string;
  scenarioId: string;
  scenarioName: string;
  revisionId: string;
  revisionNumber: number;
  contentHash: string;
  latestRevisionId: string | null;
  latestRevisionNumber: number;
  state: SignoffState;
  stale: boolean;
  /** the state to file it under: "stale" wins over the recorded state */
  displayState: SignoffState | "stale";
  requestNote: string;
  /** the verdicts the request was made on (latest run of each check on that revision) */
  verdictSnapshot: VerdictSnapshotEntry[] | null;
  comment: string;
  /** failing rules the reviewer waived on approval, each with a reason */
  waiver: SignoffWaiver | null;
  /** the verdict the decision was taken on */
  evidence: SignoffEvidence | null;
  requestedBy: { id: string; name: string; email: string } | null;
  reviewer: { id: string; name: string; email: string };
  createdAt: Date;
  decidedAt: Date | null;
};

const requester = alias(users, "requester");
const latest = alias(scenarioRevisions, "latest_revision");

function baseQuery() {
  return db
    .select({
      id: signoffs.id,
      projectId: signoffs.projectId,
      scenarioId: signoffs.scenarioId,
      scenarioName: scenarios.name,
      revisionId: signoffs.revisionId,
      revisionNumber: scenarioRevisions.number,
      contentHash: signoffs.contentHash,
      latestRevisionId: scenarios.latestRevisionId,
      latestRevisionNumber: scenarios.latestRevisionNumber,
      latestHash: latest.contentHash,
      state: signoffs.state,
      requestNote: signoffs.requestNote,
      verdictSnapshot: signoffs.verdictSnapshot,
      comment: signoffs.comment,
      waiver: signoffs.waiver,
      evidence: signoffs.evidence,
      requesterId: requester.id,
      requesterName: requester.name,
      requesterEmail: requester.email,
      reviewerId: users.id,
      reviewerName: users.name,
      reviewerEmail: users.email,
      createdAt: signoffs.createdAt,
      decidedAt: signoffs.decidedAt,
    })
    .from(signoffs)
    .innerJoin(scenarios, eq(scenarios.id, signoffs.scenarioId))
    .innerJoin(scenarioRevisions, eq(scenarioRevisions.id, signoffs.revisionId))
    .leftJoin(latest, eq(latest.id, scenarios.latestRevisionId))
    .innerJoin(users, eq(users.id, signoffs.reviewerId))
    .leftJoin(requester, eq(requester.id, signoffs.requestedBy));
}

type Row = Awaited<ReturnType<ReturnType<typeof baseQuery>["where"]>>[number];

function toView(row: Row): SignoffView {
  const stale = row.latestHash !== null && row.latestHash !== row.contentHash;
  return {
    id: row.id,
    projectId: row.projectId,
    scenarioId: row.scenarioId,
    scenarioName: row.scenarioName,
    revisionId: row.revisionId,
    revisionNumber: row.revisionNumber,
    contentHash: row.contentHash,
    latestRevisionId: row.latestRevisionId,
    latestRevisionNumber: row.latestRevisionNumber,
    state: row.state,
    stale,
    displayState: stale ? "stale" : row.state,
    requestNote: row.requestNote,
    verdictSnapshot: row.verdictSnapshot ?? null,
    comment: row.comment,
    waiver: row.waiver ?? null,
    evidence: row.evidence ?? null,
    requestedBy: row.requesterId ? { id: row.requesterId, name: row.requesterName ?? "", email: row.requesterEmail ?? "" } : null,
    reviewer: { id: row.reviewerId, name: row.reviewerName, email: row.reviewerEmail },
    createdAt: row.createdAt,
    decidedAt: row.decidedAt,
  };
}

async function loadView(id: string): Promise<SignoffView> {
  const [row] = await baseQuery().where(eq(signoffs.id, id));
  if (!row) throw new AppError("not_found", 404, "Sign-off not found.");
  return toView(row);
}

/** A project's sign-offs, newest first; optionally of one scenario. Any member. */
export async function listSignoffs({ userId, projectId, scenarioId }: { userId: string; projectId: string; scenarioId?: string }): Promise<SignoffView[]> {
  await authorize({ userId, projectId, action: "signoff.read" });
  const where: SQL[] = [eq(signoffs.projectId, projectId)];
  if (scenarioId) where.push(eq(signoffs.scenarioId, scenarioId));
  const rows = await baseQuery()
    .where(and(...where))
    .orderBy(desc(signoffs.createdAt), desc(sql`${signoffs}.rowid`));
  return rows.map(toView);
}

/** What a notification needs to know (and whether the person wants it). */
export type SignoffRecipient = { id: string; email: string; name: string; notifySignoff: boolean };

export type RequestedSignoffs = { signoffs: SignoffView[]; reviewers: SignoffRecipient[]; projectName: string; requester: SessionUser };

/**
 * Ask reviewers to sign off a revision (latest unless `revisionId`). Engineers and owners. Each reviewer
 * must be a member with the reviewer or owner role and not the requester (422 naming them); a reviewer
 * who already has an open request for the same revision content is refused (409). One row and one audit
 * event per reviewer, in one transaction.
 */
export async function requestSignoff({
  actor,
  projectId,
  scenarioId,
  revisionId,
  reviewerIds,
  note = "",
}: {
  actor: SessionUser;
  projectId: string;
  scenarioId: string;
  revisionId?: string;
  reviewerIds: string[];
  note?: string;
}): Promise<RequestedSignoffs> {
  const ids = [...new Set(reviewerIds)];
  const created = await runInTransaction(async (tx) => {
    await authorize({ userId: actor.id, projectId, action: "signoff.request", executor: tx });
    const scenario = await requireScenarioRow(tx, { projectId, scenarioId });
    const revision = await loadRevision(tx, { scenarioId, revisionId: revisionId ?? scenario.latestRevisionId ?? "" });
    const members = await tx
      .select({ id: users.id, email: users.email, name: users.name, notifySignoff: users.notifySignoff, role: memberships.role })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(and(eq(memberships.projectId, projectId), inArray(memberships.userId, ids)));
    const byId = new Map(members.map((m) => [m.id, m]));
    for (const id of ids) {
      const member = byId.get(id);
      if (!member) throw new AppError("unprocessable", 422, "A chosen reviewer is not a member of this project.", { reviewerIds: id });
      if (!(SIGNOFF_REVIEWER_ROLES as readonly string[]).includes(member.role)) {
        throw new AppError("unprocessable", 422, `${member.name} is an ${member.role}; only reviewers and owners can sign off.`, { reviewerIds: id });
      }
      if (id === actor.id) throw new AppError("unprocessable", 422, "Ask someone else: you cannot sign off your own request.", { reviewerIds: id });
    }
    const open = await tx
      .select({ reviewerId: signoffs.reviewerId })
      .from(signoffs)
      .where(and(eq(signoffs.scenarioId, scenarioId), eq(signoffs.contentHash, revision.contentHash), eq(signoffs.state, "requested"), inArray(signoffs.reviewerId, ids)));
    if (open.length > 0) {
      const who = byId.get(open[0].reviewerId)!;
      throw new AppError("conflict", 409, `${who.name} already has an open sign-off request for this revision.`, { reviewerIds: who.id });
    }
    const [project] = await tx.select({ name: projects.name }).from(projects).where(eq(projects.id, projectId));
    // the verdicts the request is made on: the latest run of each check on this revision, newest first
    const runs = await tx
      .select({ check: checkRuns.check, verdict: checkRuns.verdict, figures: checkRuns.figures, createdAt: checkRuns.createdAt, userName: users.name })
      .from(checkRuns)
      .leftJoin(users, eq(users.id, checkRuns.userId))
      .where(eq(checkRuns.revisionId, revision.id))
      .orderBy(desc(checkRuns.createdAt), desc(sql`${checkRuns}.rowid`));
    const seen = new Set<string>();
    const verdictSnapshot: VerdictSnapshotEntry[] = [];
    for (const r of runs) {
      if (seen.has(r.check)) continue;
      seen.add(r.check);
      verdictSnapshot.push({ check: r.check, verdict: r.verdict, headline: (r.figures as { headline?: string } | null)?.headline ?? "", runAt: r.createdAt.toISOString(), runBy: r.userName ?? null });
    }
    const newIds: string[] = [];
    const now = new Date();
    for (const id of ids) {
      const signoffId = randomUUID();
      newIds.push(signoffId);
      await tx.insert(signoffs).values({
        id: signoffId,
        projectId,
        scenarioId,
        revisionId: revision.id,
        contentHash: revision.contentHash,
        requestedBy: actor.id,
        reviewerId: id,
        state: "requested",
        requestNote: note,
        verdictSnapshot,
        createdAt: now,
        updatedAt: now,
      });
      await recordAudit(tx, {
        actor,
        projectId,
        action: "signoff.request",
        target: `${scenario.name} r${revision.number} → ${byId.get(id)!.email}`,
        detail: { signoffId, scenarioId, revision: revision.number, contentHash: revision.contentHash, reviewer: byId.get(id)!.email },
      });
    }
    return { newIds, reviewers: ids.map((id) => byId.get(id)!), projectName: project?.name ?? "" };
  });
  const views = await Promise.all(created.newIds.map(loadView));
  return {
    signoffs: views,
    reviewers: created.reviewers.map(({ id, email, name, notifySignoff }) => ({ id, email, name, notifySignoff })),
    projectName: created.projectName,
    requester: actor,
  };
}

export type DecidedSignoff = { signoff: SignoffView; requester: SignoffRecipient | null; projectName: string };

/**
 * Record a reviewer's decision with a comment. Only the named reviewer may decide (403 for anyone else,
 * engineers included), and only while they still hold the reviewer or owner role; only an open request can
 * be decided (409), and not once the scenario has changed since the request (409: stale).
 */
export async function decideSignoff({
  actor,
  projectId,
  signoffId,
  decision,
  comment,
  waiver = null,
  evidence = null,
}: {
  actor: SessionUser;
  projectId: string;
  signoffId: string;
  decision: "approved" | "changes_requested";
  comment: string;
  /** checked against the verdict by lib/server/signoffs/evidence.ts */
  waiver?: SignoffWaiver | null;
  evidence?: SignoffEvidence | null;
}): Promise<DecidedSignoff> {
  const result = await runInTransaction(async (tx) => {
    await authorize({ userId: actor.id, projectId, action: "signoff.decide", executor: tx });
    const [row] = await tx.select().from(signoffs).where(and(eq(signoffs.id, signoffId), eq(signoffs.projectId, projectId)));
    if (!row) throw new AppError("not_found", 404, "Sign-off not found.");
    if (row.reviewerId !== actor.id) throw new AppError("forbidden", 403, "Only the reviewer asked for this sign-off can decide it.");
    if (row.state !== "requested") throw new AppError("conflict", 409, "This sign-off has already been decided.");
    const [scenario] = await tx
      .select({ name: scenarios.name, latestHash: scenarioRevisions.contentHash })
      .from(scenarios)
      .leftJoin(scenarioRevisions, eq(scenarioRevisions.id, scenarios.latestRevisionId))
      .where(eq(scenarios.id, row.scenarioId));
    if (scenario && scenario.latestHash !== null && scenario.latestHash !== row.contentHash) {
      throw new AppError("conflict", 409, "The scenario changed after this sign-off was requested, so the request is stale. Ask for a sign-off of the latest revision.");
    }
    if (evidence?.checkRunId) {
      // the run the decision rests on is kept by the retention rule from now on (pinned); if a burst of
      // newer runs pruned it between the verdict and this write, the evidence is gone and the reviewer retries
      const pinned = await tx
        .update(checkRuns)
        .set({ pinned: true })
        .where(and(eq(checkRuns.id, evidence.checkRunId), eq(checkRuns.scenarioId, row.scenarioId)))
        .returning({ id: checkRuns.id });
      if (pinned.length === 0) throw new AppError("conflict", 409, "The verdict this decision rests on was replaced by newer runs meanwhile. Decide again.");
    }
    const now = new Date();
    await tx.update(signoffs).set({ state: decision, comment, waiver, evidence, decidedAt: now, updatedAt: now }).where(eq(signoffs.id, signoffId));
    await recordAudit(tx, {
      actor,
      projectId,
      action: decision === "approved" ? (waiver ? "signoff.approve_with_waiver" : "signoff.approve") : "signoff.request_changes",
      target: scenario?.name ?? null,
      detail: {
        signoffId,
        scenarioId: row.scenarioId,
        contentHash: row.contentHash,
        comment,
        ...(evidence ? { verdict: evidence.verdict, rulesHash: evidence.rulesHash, engineVersion: evidence.engineVersion, failing: evidence.failing } : {}),
        ...(waiver ? { waiver: waiver.rules } : {}),
      },
    });
    let requesterRow: SignoffRecipient | null = null;
    if (row.requestedBy) {
      const [r] = await tx.select({ id: users.id, email: users.email, name: users.name, notifySignoff: users.notifySignoff }).from(users).where(eq(users.id, row.requestedBy));
      requesterRow = r ?? null;
    }
    const [project] = await tx.select({ name: projects.name }).from(projects).where(eq(projects.id, projectId));
    return { requester: requesterRow, projectName: project?.name ?? "" };
  });
  return { signoff: await loadView(signoffId), ...result };
}

/** Which revision a sign-off is of and who must decide it (the caller authorises). */
export async function signoffTarget({ projectId, signoffId }: { projectId: string; signoffId: string }): Promise<{ scenarioId: string; revisionId: string; reviewerId: string; state: SignoffState }> {
  const [row] = await db
    .select({ scenarioId: signoffs.scenarioId, revisionId: signoffs.revisionId, reviewerId: signoffs.reviewerId, state: signoffs.state })
    .from(signoffs)
    .where(and(eq(signoffs.id, signoffId), eq(signoffs.projectId, projectId)));
  if (!row) throw new AppError("not_found", 404, "Sign-off not found.");
  return row;
}

/** Waivers given on approval of a revision (by content hash), oldest first: what its later bundles carry. */
export async function waiversOfRevision({ scenarioId, contentHash }: { scenarioId: string; contentHash: string }): Promise<{ reviewer: string; decidedAt: Date | null; comment: string; rules: { id: string; reason: string }[] }[]> {
  const rows = await db
    .select({ waiver: signoffs.waiver, decidedAt: signoffs.decidedAt, comment: signoffs.comment, name: users.name, email: users.email })
    .from(signoffs)
    .innerJoin(users, eq(users.id, signoffs.reviewerId))
    .where(and(eq(signoffs.scenarioId, scenarioId), eq(signoffs.contentHash, contentHash), eq(signoffs.state, "approved")))
    .orderBy(signoffs.decidedAt);
  return rows.filter((r) => r.waiver && r.waiver.rules.length > 0).map((r) => ({ reviewer: `${r.name} <${r.email}>`, decidedAt: r.decidedAt, comment: r.comment, rules: r.waiver!.rules }));
}

/** Turn sign-off e-mails on or off for one's own account. */
export async function setSignoffNotifications({ actor, enabled }: { actor: SessionUser; enabled: boolean }): Promise<boolean> {
  await runInTransaction(async (tx) => {
    await tx.update(users).set({ notifySignoff: enabled }).where(eq(users.id, actor.id));
    await recordAudit(tx, { actor, action: "account.notifications", target: actor.email, detail: { notifySignoff: enabled } });
  });
  return enabled;
}

/** The account's sign-off e-mail setting. */
export async function getSignoffNotifications({ userId }: { userId: string }): Promise<boolean> {
  const [row] = await db.select({ notifySignoff: users.notifySignoff }).from(users).where(eq(users.id, userId));
  if (!row) throw new AppError("not_found", 404, "Account not found.");
  return row.notifySignoff;
}
