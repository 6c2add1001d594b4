import "server-only";
import { randomUUID } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { runInTransaction, type Executor } from "@/db/client";
import { createPart, readPartText } from "@/db/queries/parts";
import { hashScenarioContent, insertRevision, type RevisionDetail } from "@/db/queries/revisions";
import { parts, scenarios } from "@/db/schema";
import { BundleError, engineScenario, openBundle, usedPartFiles, type BundleManifest } from "@/engine/bundle";
import { parseScenario } from "@/engine/scenario";
import { parsePinnedPartPath, pinnedPartPath } from "@/engine/system/parts";
import { EngineInputError } from "@/engine/types";
import { recordAudit } from "@/lib/server/audit";
import type { SessionUser } from "@/lib/server/auth/session";
import { AppError } from "@/lib/base/errors";
import { authorize } from "@/lib/server/permissions";
import { PART_FILE_NAME_PATTERN, PART_MAX_BYTES } from "@/lib/base/validation/parts";
import { draftScenarioSchema, scenarioNameSchema, type DraftScenario } from "@/lib/base/validation/scenarios";

/** Largest bundle zip accepted for upload (its inflated contents are limited separately, to 50 MB). */
export const BUNDLE_UPLOAD_MAX_BYTES = 20 * 1024 * 1024;

export type ImportedPart = { fileName: string; reused: boolean; renamedFrom: string | null };

export type ImportResult = {
  scenario: { id: string; name: string };
  revision: RevisionDetail;
  parts: ImportedPart[];
  manifest: Omit<BundleManifest, "files"> & { files: string[] };
  /** the new revision has the same content hash as the exported one (no part had to be renamed) */
  contentHashMatches: boolean;
};

/** A refused bundle as an API error: 413 for size limits, 422 otherwise, naming the entry. */
export function bundleAppError(error: BundleError): AppError {
  const fields = error.entry ? { entry: error.entry } : undefined;
  return error.kind === "too_large" ? new AppError("payload_too_large", 413, error.message, fields) : new AppError("unprocessable", 422, error.message, fields);
}

function partStem(fileName: string): [string, string] {
  const dot = fileName.lastIndexOf(".");
  return [fileName.slice(0, dot), fileName.slice(dot)];
}

async function freePartName(tx: Executor, projectId: string, fileName: string): Promise<string> {
  const [stem, ext] = partStem(fileName);
  for (let i = 2; i < 1000; i++) {
    const candidate = `${stem}-${i}${ext}`;
    const [row] = await tx.select({ id: parts.id }).from(parts).where(and(eq(parts.projectId, projectId), eq(parts.fileName, candidate)));
    if (!row) return candidate;
  }
  throw new AppError("conflict", 409, `The project has too many parts named like ${fileName}.`);
}

/**
 * Import a bundle as a new scenario with its parts (engineers, owners). Everything is checked before
 * anything is written: zip limits and entry names, manifest and hashes, the scenario file, every part. Parts
 * whose file name and text already exist in the project (as any version) are reused and the blocks pin that
 * version; a different text under the same name (another part, or another version in the bundle under
 * `parts/v<N>/`) is stored as a new part under a free name ("ant-2.s1p") and the blocks point at it. One
 * transaction.
 */
/** "Baseline (imported r3 from Kestrel)", shortened to the 200-character limit of scenario names. */
export function importedScenarioName(name: string, revision: number, fromProject: string): string {
  const suffix = ` (imported r${revision} from ${fromProject})`;
  const short = ` (imported r${revision})`;
  if (name.length + suffix.length <= 200) return `${name}${suffix}`;
  return `${name.slice(0, 200 - short.length - 1).trimEnd()}…${short}`;
}

export async function importBundle({ actor, projectId, bytes }: { actor: SessionUser; projectId: string; bytes: Uint8Array }): Promise<ImportResult> {
  await authorize({ userId: actor.id, projectId, action: "bundle.import" });
  let bundle;
  try {
    bundle = openBundle(bytes);
  } catch (error) {
    if (error instanceof BundleError) throw bundleAppError(error);
    throw error;
  }
  const draft = draftScenarioSchema.safeParse(bundle.scenario);
  if (!draft.success) {
    const issue = draft.error.issues[0];
    throw new AppError("unprocessable", 422, `scenario.json is not a scenario file: ${issue.path.map(String).join(".") || "(root)"}: ${issue.message}`, { entry: "scenario.json" });
  }
  const content: DraftScenario = draft.data;
  const name = scenarioNameSchema.safeParse(content.name);
  if (!name.success) throw new AppError("unprocessable", 422, `scenario.json: name: ${name.error.issues[0].message}`, { entry: "scenario.json" });
  let used: string[];
  try {
    used = usedPartFiles(content);
    parseScenario(engineScenario(content), { parts: bundle.parts });
  } catch (error) {
    if (error instanceof BundleError) throw bundleAppError(error);
    if (error instanceof EngineInputError) throw new AppError("unprocessable", 422, `scenario.json cannot be used: ${error.message}`, { entry: "scenario.json" });
    throw error;
  }
  for (const file of used) {
    const fileName = parsePinnedPartPath(file).file.slice("parts/".length);
    const text = bundle.parts[file];
    if (text === undefined) throw new AppError("unprocessable", 422, `scenario.json uses ${file}, which the bundle does not contain.`, { entry: file });
    if (!PART_FILE_NAME_PATTERN.test(fileName)) throw new AppError("unprocessable", 422, `Entry "${file}" is not a Touchstone file name (.s1p … .sNp or .ts).`, { entry: file });
    if (Buffer.byteLength(text, "utf8") > PART_MAX_BYTES) throw new AppError("payload_too_large", 413, `Entry "${file}" is larger than the ${PART_MAX_BYTES / (1024 * 1024)} MB limit for a part.`, { entry: file });
    readPartText(text, fileName);
  }
  const manifest = { ...bundle.manifest, files: Object.keys(bundle.manifest.files) };
  return runInTransaction(async (tx) => {
    await authorize({ userId: actor.id, projectId, action: "bundle.import", executor: tx });
    await authorize({ userId: actor.id, projectId, action: "scenario.create", executor: tx });
    await authorize({ userId: actor.id, projectId, action: "part.upload", executor: tx });
    const imported: ImportedPart[] = [];
    // bundle path (pinnedPartPath) → the project's file name and version the blocks will pin
    const targets = new Map<string, { fileName: string; version: number }>();
    for (const file of used) {
      const fileName = parsePinnedPartPath(file).file.slice("parts/".length);
      const text = bundle.parts[file];
      const existing = await tx
        .select({ text: parts.text, partVersion: parts.partVersion })
        .from(parts)
        .where(and(eq(parts.projectId, projectId), eq(parts.fileName, fileName)));
      const same = existing.find((row) => row.text === text);
      if (same) {
        targets.set(file, { fileName, version: same.partVersion });
        imported.push({ fileName, reused: true, renamedFrom: null });
        continue;
      }
      // another text under a taken name (another project's part, or another version of it): a new part
      const target = existing.length > 0 ? await freePartName(tx, projectId, fileName) : fileName;
      targets.set(file, { fileName: target, version: 1 });
      await createPart({ actor, projectId, name: partStem(target)[0], fileName: target, text, executor: tx });
      imported.push({ fileName: target, reused: false, renamedFrom: target === fileName ? null : fileName });
    }
    const retarget = (b: DraftScenario["blocks"][number]) => {
      if (b.kind !== "touchstone" || b.data !== undefined || typeof b.file !== "string") return b;
      const to = targets.get(pinnedPartPath(b.file, b.part_version));
      if (!to || (`parts/${to.fileName}` === b.file && to.version === (b.part_version ?? 1))) return b;
      const { part_version: _pinned, ...rest } = b;
      void _pinned;
      return { ...rest, file: `parts/${to.fileName}`, ...(to.version > 1 ? { part_version: to.version } : {}) };
    };
    const moved = content.blocks.some((b) => retarget(b) !== b);
    const stored: DraftScenario = moved ? { ...content, blocks: content.blocks.map(retarget) } : content;
    const scenarioId = randomUUID();
    // The name says where the scenario came from (not a second "Baseline"). The stored file takes the
    // new name (it follows the scenario's), so "arrived intact" compares the content under its old name.
    const listName = importedScenarioName(name.data, bundle.manifest.revision.number, bundle.manifest.project.name);
    await tx.insert(scenarios).values({ id: scenarioId, projectId, name: listName, createdBy: actor.id });
    const revision = await insertRevision(tx, { scenarioId, projectId, content: stored, authorId: actor.id, origin: "import" });
    await recordAudit(tx, {
      actor,
      projectId,
      action: "bundle.import",
      target: listName,
      detail: {
        scenarioId,
        fromProject: bundle.manifest.project.name,
        fromScenario: bundle.manifest.scenario.id,
        fromRevision: bundle.manifest.revision.number,
        contentHash: revision.contentHash,
        parts: imported.map((p) => p.fileName),
      },
    });
    return {
      scenario: { id: scenarioId, name: listName },
      revision,
      parts: imported,
      manifest,
      contentHashMatches: hashScenarioContent({ ...revision.content, name: name.data }) === bundle.manifest.revision.content_hash,
    };
  });
}
