import "server-only";
import { randomUUID } from "node:crypto";
import { and, asc, eq, getTableColumns, inArray, sql } from "drizzle-orm";
import { db, runInTransaction, type Executor } from "@/db/client";
import { parts, scenarioRevisions, scenarios, users, type Part } from "@/db/schema";
import { parseTouchstone, TouchstoneError, type TouchstoneData } from "@/engine/touchstone";
import { parseTouchstoneCached, parsePinnedPartPath, pinnedPartPath } from "@/engine/system";
import { recordAudit } from "@/lib/server/audit";
import type { SessionUser } from "@/lib/server/auth/session";
import { AppError } from "@/lib/base/errors";
import { authorize } from "@/lib/server/permissions";
import { PART_MAX_BYTES } from "@/lib/base/validation/parts";
import { partFilesOf } from "@/lib/domain/scenarios/part-files";
import { partFigures, partPreview, partVerdicts, type PartPreview, type PartVerdicts } from "@/lib/domain/parts/figures";

/** A part as the API lists it (no text unless asked), with its verdicts (lib/domain/parts/figures.ts). */
export type PartSummaryRow = Omit<Part, "text" | "projectId" | "uploadedBy"> &
  PartVerdicts & {
    preview: PartPreview;
    text?: string;
    /** in the list (latest versions): every version of the file, oldest first, with its row id */
    versions?: { id: string; partVersion: number }[];
    /** in the list: texts of older versions the caller named, keyed as blocks pin them (pinnedPartPath) */
    pinnedTexts?: Record<string, string>;
  };

/** The key a block pinning this row is resolved by: `parts/<fileName>` (version 1) or `parts/v<N>/<fileName>`. */
export function partKeyOf(row: { fileName: string; partVersion: number }): string {
  return pinnedPartPath(`parts/${row.fileName}`, row.partVersion);
}

function summarise(row: Part, withText: boolean): PartSummaryRow {
  const { text, projectId: _projectId, uploadedBy: _uploadedBy, ...rest } = row;
  void _projectId;
  void _uploadedBy;
  let preview: PartPreview = { label: "", hz: [], db: [] };
  try {
    preview = partPreview(parseTouchstoneCached(text, row.fileName));
  } catch {
    // stored parts were parsed on upload; a reader change should not break the list
  }
  return {
    ...rest,
    ...partVerdicts(row),
    preview,
    ...(withText ? { text } : {}),
  };
}

/**
 * Touchstone texts of a project's parts keyed as blocks resolve them: `parts/<fileName>` for version 1,
 * `parts/v<N>/<fileName>` for version N (pinnedPartPath). With `files` (keys as partFilesOf gives them)
 * only those versions are read: a solve never loads parts or versions it does not use.
 */
export async function getPartTexts({ projectId, files, executor = db }: { projectId: string; files?: readonly string[]; executor?: Executor }): Promise<Record<string, string>> {
  let where = eq(parts.projectId, projectId);
  let wanted: Set<string> | null = null;
  if (files) {
    const refs = files.map(parsePinnedPartPath).filter((r) => r.file.startsWith("parts/") && r.file.indexOf("/", "parts/".length) < 0);
    if (refs.length === 0) return {};
    wanted = new Set(refs.map((r) => pinnedPartPath(r.file, r.version)));
    const names = [...new Set(refs.map((r) => r.file.slice("parts/".length)))];
    const versions = [...new Set(refs.map((r) => r.version))];
    where = and(where, inArray(parts.fileName, names), inArray(parts.partVersion, versions))!;
  }
  const rows = await executor.select({ fileName: parts.fileName, partVersion: parts.partVersion, text: parts.text }).from(parts).where(where);
  return Object.fromEntries(rows.map((r) => [partKeyOf(r), r.text] as const).filter(([key]) => wanted === null || wanted.has(key)));
}

export { partFilesOf };

/**
 * The project's parts by name; `withText` adds the Touchstone text (the workspace needs it to solve):
 * `true` for every part, or the files a scenario names (as blocks name them, see partFilesOf) for those only.
 */
export async function listParts({ userId, projectId, withText = false }: { userId: string; projectId: string; withText?: boolean | readonly string[] }): Promise<PartSummaryRow[]> {
  await authorize({ userId, projectId, action: "part.read" });
  const rows = await db.select().from(parts).where(eq(parts.projectId, projectId)).orderBy(asc(parts.name), asc(parts.fileName), asc(parts.partVersion));
  const named = typeof withText === "boolean" ? null : new Set(withText);
  // one entry per file: its latest version, listing the others (a block pins one of them)
  const byFile = new Map<string, Part[]>();
  for (const row of rows) byFile.set(row.fileName, [...(byFile.get(row.fileName) ?? []), row]);
  return [...byFile.values()].map((versions) => {
    const latest = versions[versions.length - 1];
    const summary = summarise(latest, named ? named.has(partKeyOf(latest)) : withText === true);
    const pinnedTexts = Object.fromEntries(versions.slice(0, -1).filter((v) => named?.has(partKeyOf(v))).map((v) => [partKeyOf(v), v.text]));
    return { ...summary, versions: versions.map((v) => ({ id: v.id, partVersion: v.partVersion })), ...(Object.keys(pinnedTexts).length > 0 ? { pinnedTexts } : {}) };
  });
}

export async function getPart({ userId, projectId, partId }: { userId: string; projectId: string; partId: string }): Promise<PartSummaryRow> {
  await authorize({ userId, projectId, action: "part.read" });
  const [row] = await db.select().from(parts).where(and(eq(parts.id, partId), eq(parts.projectId, projectId)));
  if (!row) throw new AppError("not_found", 404, "Part not found.");
  return summarise(row, true);
}

/**
 * Read an uploaded Touchstone text; a file that cannot be read is a 422 with the reader's message
 * (file name and line number).
 */
export function readPartText(text: string, fileName: string): TouchstoneData {
  try {
    return parseTouchstone(text, { name: fileName, maxBytes: PART_MAX_BYTES });
  } catch (error) {
    if (error instanceof TouchstoneError) {
      throw new AppError("unprocessable", 422, `${fileName} cannot be read: ${error.message}`, { file: error.message });
    }
    throw error;
  }
}

/** Store a Touchstone file as a part (engineers, owners). 422 when it cannot be read, 409 when the file name is taken. */
export async function createPart({
  actor,
  projectId,
  name,
  fileName,
  text,
  executor,
}: {
  actor: SessionUser | { id: string; email: string } | null;
  projectId: string;
  name: string;
  fileName: string;
  text: string;
  /** an open transaction (the demo seed); otherwise one is opened */
  executor?: Executor;
}): Promise<PartSummaryRow> {
  const data = readPartText(text, fileName);
  const figures = partFigures(data);
  const work = async (tx: Executor) => {
    if (actor && !executor) await authorize({ userId: actor.id, projectId, action: "part.upload", executor: tx });
    const [clash] = await tx
      .select({ id: parts.id })
      .from(parts)
      .where(and(eq(parts.projectId, projectId), eq(parts.fileName, fileName)));
    if (clash) {
      throw new AppError("conflict", 409, `The project already has a part file named ${fileName}. Upload it as a new version of that part (Upload new version), or rename the file.`, {
        file: `${fileName} is taken.`,
      });
    }
    const row = newPartRow({ projectId, name: name.trim() || fileName.replace(/\.[^.]+$/, ""), fileName, partVersion: 1, text, data, figures, uploadedBy: actor?.id ?? null });
    await tx.insert(parts).values(row);
    await recordAudit(tx, { actor, projectId, action: "part.upload", target: fileName, detail: { partId: row.id, ports: row.ports, points: row.points } });
    return summarise(row, false);
  };
  return executor ? work(executor) : runInTransaction(work);
}

/** The row of one part version: the file as uploaded and what its reading found. */
function newPartRow({
  projectId,
  name,
  fileName,
  partVersion,
  text,
  data,
  figures,
  uploadedBy,
}: {
  projectId: string;
  name: string;
  fileName: string;
  partVersion: number;
  text: string;
  data: ReturnType<typeof readPartText>;
  figures: ReturnType<typeof partFigures>;
  uploadedBy: string | null;
}): Part {
  const z0: [number, number][] = [];
  for (let p = 0; p < data.ports; p++) z0.push([data.z0[2 * p], data.z0[2 * p + 1]]);
  return {
    id: randomUUID(),
    projectId,
    name,
    fileName,
    partVersion,
    text,
    sizeBytes: Buffer.byteLength(text, "utf8"),
    ports: data.ports,
    version: data.version,
    points: data.frequencies.length,
    startHz: data.frequencies[0],
    stopHz: data.frequencies[data.frequencies.length - 1],
    referenceOhms: z0,
    ...figures,
    uploadedBy,
    createdAt: new Date(),
  };
}

/** Version 2, 3… of an existing part: the same file name, new data; blocks keep the version they pin. */
export async function createPartVersion({
  actor,
  projectId,
  fileName,
  text,
  uploadedName,
}: {
  actor: SessionUser;
  projectId: string;
  fileName: string;
  text: string;
  /** the chosen file's own name, when it is a Touchstone name: its extension says how a 1.1 text is read */
  uploadedName?: string;
}): Promise<PartSummaryRow> {
  // stored and solved under the part's file name, so it must read the same under that name (same ports)
  const data = readPartText(text, uploadedName ?? fileName);
  const figures = partFigures(data);
  return runInTransaction(async (tx) => {
    await authorize({ userId: actor.id, projectId, action: "part.upload", executor: tx });
    const [latest] = await tx
      .select()
      .from(parts)
      .where(and(eq(parts.projectId, projectId), eq(parts.fileName, fileName)))
      .orderBy(sql`${parts.partVersion} desc`)
      .limit(1);
    if (!latest) {
      throw new AppError("not_found", 404, `The project has no part file named ${fileName}; upload it as a new part.`, { new_version_of: `No part named ${fileName}.` });
    }
    if (data.ports !== latest.ports) {
      // links and system ports of the blocks that move to it name port numbers: they must stay
      throw new AppError("unprocessable", 422, `${fileName} version ${latest.partVersion} has ${latest.ports} ports; this file has ${data.ports}. A new version keeps the port count: upload a different part instead.`, {
        file: `Expected ${latest.ports} ports, found ${data.ports}.`,
      });
    }
    if (uploadedName !== undefined && uploadedName !== fileName) readPartText(text, fileName);
    const row = newPartRow({ projectId, name: latest.name, fileName, partVersion: latest.partVersion + 1, text, data, figures, uploadedBy: actor.id });
    await tx.insert(parts).values(row);
    await recordAudit(tx, {
      actor,
      projectId,
      action: "part.version_upload",
      target: fileName,
      detail: { partId: row.id, version: row.partVersion, ports: row.ports, points: row.points },
    });
    return summarise(row, false);
  });
}

/** A block of a scenario's latest revision that uses a part file, with the version it pins. */
export type PartUse = { scenarioId: string; scenarioName: string; blockId: string; partVersion: number };

/**
 * Where the part file `parts/<fileName>` is used: blocks of each scenario's latest revision, with the
 * version they pin (absent = 1). SQLite reads the blocks out of the stored JSON, so nothing is parsed here.
 */
export async function partUses({ projectId, fileName, executor = db }: { projectId: string; fileName: string; executor?: Executor }): Promise<PartUse[]> {
  const rows = await executor.all<{ scenarioId: string; scenarioName: string; blockId: string; partVersion: number }>(sql`
    select s.id as scenarioId, s.name as scenarioName, json_extract(b.value, '$.id') as blockId,
           coalesce(json_extract(b.value, '$.part_version'), 1) as partVersion
    from ${scenarios} s
    join ${scenarioRevisions} r on r.id = s.latest_revision_id
    join json_each(r.content, '$.blocks') b
    where s.project_id = ${projectId}
      and json_extract(b.value, '$.kind') = 'touchstone'
      and json_extract(b.value, '$.data') is null
      and json_extract(b.value, '$.file') = ${`parts/${fileName}`}
    order by s.name, blockId`);
  return rows.map((r) => ({ ...r, partVersion: Number(r.partVersion) }));
}

/**
 * Per scenario of the project, the blocks of its latest revision that pin an older version of their
 * part than the library's latest ("newer version available"); scenarios with none are absent.
 */
export async function blocksBehindByScenario({ projectId, executor = db }: { projectId: string; executor?: Executor }): Promise<Map<string, number>> {
  const rows = await executor.all<{ scenarioId: string; behind: number }>(sql`
    select s.id as scenarioId, count(*) as behind
    from ${scenarios} s
    join ${scenarioRevisions} r on r.id = s.latest_revision_id
    join json_each(r.content, '$.blocks') b
    join (select file_name, max(part_version) as latest from ${parts} where project_id = ${projectId} group by file_name) p
      on json_extract(b.value, '$.file') = 'parts/' || p.file_name
    where s.project_id = ${projectId}
      and json_extract(b.value, '$.kind') = 'touchstone'
      and json_extract(b.value, '$.data') is null
      and coalesce(json_extract(b.value, '$.part_version'), 1) < p.latest
    group by s.id`);
  return new Map(rows.map((r) => [r.scenarioId, Number(r.behind)]));
}

/** Names of the scenarios whose latest revision places version `partVersion` of the part file `parts/<fileName>`. */
export async function scenariosUsingPart({ projectId, fileName, partVersion = 1, executor = db }: { projectId: string; fileName: string; partVersion?: number; executor?: Executor }): Promise<string[]> {
  const uses = await partUses({ projectId, fileName, executor });
  return [...new Set(uses.filter((u) => u.partVersion === partVersion).map((u) => u.scenarioName))];
}

/** Deleting a part version that scenarios still place: 409 with their names. */
export class PartInUseError extends AppError {
  readonly scenarios: string[];
  constructor(label: string, names: string[]) {
    super(
      "conflict",
      409,
      `${label} is used by ${names.length === 1 ? "scenario" : "scenarios"} ${names.map((n) => `“${n}”`).join(", ")}. Remove it from ${names.length === 1 ? "that scenario" : "those scenarios"} or move them to another version first.`,
    );
    this.scenarios = names;
  }
}

/** Delete one version of a part (engineers, owners); refused (409) while any scenario's latest revision pins it. */
export async function deletePart({ actor, projectId, partId }: { actor: SessionUser; projectId: string; partId: string }): Promise<void> {
  await runInTransaction(async (tx) => {
    await authorize({ userId: actor.id, projectId, action: "part.delete", executor: tx });
    const [row] = await tx
      .select({ id: parts.id, fileName: parts.fileName, partVersion: parts.partVersion })
      .from(parts)
      .where(and(eq(parts.id, partId), eq(parts.projectId, projectId)));
    if (!row) throw new AppError("not_found", 404, "Part not found.");
    const users = await scenariosUsingPart({ projectId, fileName: row.fileName, partVersion: row.partVersion, executor: tx });
    if (users.length > 0) throw new PartInUseError(row.partVersion === 1 ? row.fileName : `${row.fileName} version ${row.partVersion}`, users);
    await tx.delete(parts).where(eq(parts.id, partId));
    await recordAudit(tx, { actor, projectId, action: "part.delete", target: row.fileName, detail: { partId, version: row.partVersion } });
  });
}

/** One version of a part for its page: stored figures and verdicts, who uploaded it; no text, nothing parsed. */
export type PartVersionRow = Omit<Part, "text" | "projectId" | "uploadedBy"> & PartVerdicts & { uploadedByName: string | null };

/**
 * The part file of row `partId` with every version of it, oldest first (anyone in the project). Reads only
 * the figures stored at upload: the page never parses Touchstone text on the request's thread.
 */
export async function listPartVersions({ userId, projectId, partId }: { userId: string; projectId: string; partId: string }): Promise<{ fileName: string; versions: PartVersionRow[] }> {
  await authorize({ userId, projectId, action: "part.read" });
  const [ref] = await db.select({ fileName: parts.fileName }).from(parts).where(and(eq(parts.id, partId), eq(parts.projectId, projectId)));
  if (!ref) throw new AppError("not_found", 404, "Part not found.");
  const { text: _text, projectId: _projectId, uploadedBy: _uploadedBy, ...columns } = getTableColumns(parts);
  void _text;
  void _projectId;
  void _uploadedBy;
  const rows = await db
    .select({ ...columns, uploadedByName: users.name })
    .from(parts)
    .leftJoin(users, eq(users.id, parts.uploadedBy))
    .where(and(eq(parts.projectId, projectId), eq(parts.fileName, ref.fileName)))
    .orderBy(asc(parts.partVersion));
  return { fileName: ref.fileName, versions: rows.map((row) => ({ ...row, ...partVerdicts(row) })) };
}
