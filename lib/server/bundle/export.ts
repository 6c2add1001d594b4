import "server-only";
import { getPartTexts } from "@/db/queries/parts";
import { loadProject } from "@/db/queries/projects";
import { loadScenario } from "@/db/queries/scenarios";
import { waiversOfRevision } from "@/db/queries/signoffs";
import { db } from "@/db/client";
import { BUNDLE_PATHS, BundleError, bundleFiles, computeBundleResults, sha256, writeBundleZip, type BundleIdentity } from "@/engine/bundle";
import { EngineInputError, SingularSystemError } from "@/engine/types";
import packageJson from "@/package.json";
import { recordAudit } from "@/lib/server/audit";
import type { SessionUser } from "@/lib/server/auth/session";
import { AppError } from "@/lib/base/errors";
import { allow, type ProjectAccess } from "@/lib/server/permissions";
import { fileStem } from "@/lib/domain/scenarios/file-stem";
import { revisionRules } from "@/lib/server/verdicts";
import { renderReportHtml } from "./report-html";

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
}: {
  actor: SessionUser;
  /** the actor's access to the project, resolved once by the route */
  access: ProjectAccess;
  scenarioId: string;
  revisionId?: string;
}): Promise<ExportedBundle> {
  allow(access, "bundle.export");
  const { projectId } = access;
  const project = await loadProject(access);
  const { scenario, revision } = await loadScenario(access, { scenarioId, revisionId });
  const allParts = await getPartTexts({ projectId });
  // judged by the revision's effective rule set, as the app judges it; waivers of its sign-offs come along
  const { ruleSet } = await revisionRules({ projectId, content: revision.content });
  const waivers = (await waiversOfRevision({ scenarioId, contentHash: revision.contentHash })).map((w) => ({
    reviewer: w.reviewer,
    decided_at: w.decidedAt ? w.decidedAt.toISOString() : "",
    comment: w.comment,
    rules: w.rules,
  }));
  let results;
  try {
    results = computeBundleResults(revision.content, allParts, ruleSet, waivers);
  } catch (error) {
    if (error instanceof EngineInputError || error instanceof SingularSystemError) {
      throw new AppError("unprocessable", 422, `Revision ${revision.number} cannot be solved, so it cannot be bundled: ${error.message}`);
    }
    throw error;
  }
  let files: Map<string, string>;
  try {
    files = bundleFiles(revision.content, allParts, results);
  } catch (error) {
    if (error instanceof BundleError) throw new AppError("unprocessable", 422, error.message);
    throw error;
  }
  const identity: BundleIdentity = {
    app: { name: "portolan", version: packageJson.version },
    created_at: new Date().toISOString(),
    created_by: { name: actor.name, email: actor.email },
    project: { id: project.id, name: project.name },
    scenario: { id: scenario.id, name: scenario.name },
    revision: { id: revision.id, number: revision.number, content_hash: revision.contentHash },
  };
  const hashes = [...files].map(([path, text]) => ({ path, sha256: sha256(text) }));
  files.set(BUNDLE_PATHS.report, renderReportHtml({ identity, results, files: hashes }));
  const bytes = await writeBundleZip(identity, files);
  await recordAudit(db, {
    actor,
    projectId,
    action: "bundle.export",
    target: scenario.name,
    detail: { scenarioId, revision: revision.number, contentHash: revision.contentHash, rulesHash: results.checks.rule_set.sha256, verdict: results.checks.verdict, bytes: bytes.length },
  });
  return { fileName: `${fileStem(scenario.name)}-r${revision.number}-bundle.zip`, bytes, identity, revisionNumber: revision.number, contentHash: revision.contentHash };
}
