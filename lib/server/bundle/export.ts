import "server-only";
import { getPartTexts, partFilesOf } from "@/db/queries/parts";
import { loadProject } from "@/db/queries/projects";
import { loadScenario } from "@/db/queries/scenarios";
import { waiversOfRevision } from "@/db/queries/signoffs";
import { db } from "@/db/client";
import { getCheckRun, findCurrentRun } from "@/db/queries/check-runs";
import { hashRuleSet, summariseSpread, type BundleIdentity, type SpreadSummary } from "@/engine/bundle";
import type { EffectiveRuleSet } from "@/engine/checks";
import { ENGINE_VERSION } from "@/engine/version";
import packageJson from "@/package.json";
import { recordAudit } from "@/lib/server/audit";
import type { SessionUser } from "@/lib/server/auth/session";
import { allow, type ProjectAccess } from "@/lib/server/permissions";
import { fileStem } from "@/lib/domain/scenarios/file-stem";
import { revisionRules } from "@/lib/server/verdicts";
import { refusalError, runInPool, taskLimits } from "@/lib/server/jobs/pool";

export type ExportedBundle = { fileName: string; bytes: Uint8Array; identity: BundleIdentity; revisionNumber: number; contentHash: string };

/**
 * The bundle of one scenario revision (latest unless `revisionId`): scenario, parts, composite, checks,
 * report and manifest, judged by the revision's effective rule set (each rule with its source) and
 * carrying the waivers given when it was approved. Anyone who may export bundles (every member); 422
 * when the revision cannot be solved.
 */
export async function exportBundle({
  actor,
  access,
  scenarioId,
  revisionId,
  signal,
}: {
  actor: SessionUser;
  /** the actor's access to the project, resolved once by the route */
  access: ProjectAccess;
  scenarioId: string;
  revisionId?: string;
  /** the request's signal: the job stops when the client goes away */
  signal?: AbortSignal;
}): Promise<ExportedBundle> {
  allow(access, "bundle.export");
  const { projectId } = access;
  const project = await loadProject(access);
  const { scenario, revision } = await loadScenario(access, { scenarioId, revisionId });
  const parts = await getPartTexts({ projectId, files: partFilesOf(revision.content) });
  // judged by the revision's effective rule set, as the app judges it; waivers of its sign-offs come along
  const { ruleSet } = await revisionRules({ projectId, content: revision.content });
  const waivers = (await waiversOfRevision({ scenarioId, contentHash: revision.contentHash })).map((w) => ({
    reviewer: w.reviewer,
    decided_at: w.decidedAt ? w.decidedAt.toISOString() : "",
    comment: w.comment,
    rules: w.rules,
  }));
  const identity: BundleIdentity = {
    app: { name: "portolan", version: packageJson.version },
    created_at: new Date().toISOString(),
    created_by: { name: actor.name, email: actor.email },
    project: { id: project.id, name: project.name },
    scenario: { id: scenario.id, name: scenario.name },
    revision: { id: revision.id, number: revision.number, content_hash: revision.contentHash },
  };
  // solve, checks, report and zip run in a job thread (lib/server/jobs), never on the request's thread
  const spread = await currentSpreadSummary(access, scenarioId, revision.id, ruleSet);
  const output = await runInPool({ kind: "bundle", content: revision.content, parts, identity, ruleSet, waivers, ...(spread ? { spread } : {}), ...taskLimits() }, { signal });
  if (!output.ok) {
    throw refusalError(output, output.code === "too_large" || output.message.startsWith("The scenario uses") ? "" : `Revision ${revision.number} cannot be solved, so it cannot be bundled: `);
  }
  if (output.kind !== "bundle") throw new Error(`a bundle job answered ${output.kind}`);
  const { bytes } = output;
  await recordAudit(db, {
    actor,
    projectId,
    action: "bundle.export",
    target: scenario.name,
    detail: { scenarioId, revision: revision.number, contentHash: revision.contentHash, rulesHash: output.rulesHash, verdict: output.verdict, bytes: bytes.length },
  });
  return { fileName: `${fileStem(scenario.name)}-r${revision.number}-bundle.zip`, bytes, identity, revisionNumber: revision.number, contentHash: revision.contentHash };
}

/** The summary of the revision's newest spread run judged by this rule set and engine, or undefined when it has none. */
async function currentSpreadSummary(access: ProjectAccess, scenarioId: string, revisionId: string, ruleSet: EffectiveRuleSet): Promise<SpreadSummary | undefined> {
  const runId = await findCurrentRun({ scenarioId, revisionId, check: "spread", rulesHash: hashRuleSet(ruleSet), engineVersion: ENGINE_VERSION });
  if (!runId) return undefined;
  const run = await getCheckRun({ access, scenarioId, runId });
  return run.check === "spread" ? summariseSpread(run.figures.result) : undefined;
}
