import "server-only";
import { randomUUID } from "node:crypto";
import { and, asc, eq, inArray } from "drizzle-orm";
import { db, runInTransaction, type Executor } from "@/db/client";
import { parts, scenarioRevisions, scenarios, type Part } from "@/db/schema";
import { parseTouchstone, TouchstoneError, type TouchstoneData } from "@/engine/touchstone";
import { parseTouchstoneCached } from "@/engine/system";
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
  };

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
 * Touchstone texts of a project's parts keyed as blocks name them (`parts/<fileName>`). With `files`
 * (as blocks name them, see partFilesOf) only those are read: a solve never loads parts it does not use.
 */
export async function getPartTexts({ projectId, files, executor = db }: { projectId: string; files?: readonly string[]; executor?: Executor }): Promise<Record<string, string>> {
  let where = eq(parts.projectId, projectId);
  if (files) {
    const names = files.filter((f) => f.startsWith("parts/")).map((f) => f.slice("parts/".length));
    if (names.length === 0) return {};
    where = and(where, inArray(parts.fileName, names))!;
  }
  const rows = await executor.select({ fileName: parts.fileName, text: parts.text }).from(parts).where(where);
  return Object.fromEntries(rows.map((r) => [`parts/${r.fileName}`, r.text]));
}

export { partFilesOf };

/**
 * The project's parts by name; `withText` adds the Touchstone text (the workspace needs it to solve):
 * `true` for every part, or the files a scenario names (as blocks name them, see partFilesOf) for those only.
 */
export async function listParts({ userId, projectId, withText = false }: { userId: string; projectId: string; withText?: boolean | readonly string[] }): Promise<PartSummaryRow[]> {
  await authorize({ userId, projectId, action: "part.read" });
  const rows = await db.select().from(parts).where(eq(parts.projectId, projectId)).orderBy(asc(parts.name), asc(parts.fileName));
  const named = typeof withText === "boolean" ? null : new Set(withText);
  return rows.map((row) => summarise(row, named ? named.has(`parts/${row.fileName}`) : withText === true));
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
      throw new AppError("conflict", 409, `The project already has a part file named ${fileName}. Rename the file or delete the other part first.`, {
        file: `${fileName} is taken.`,
      });
    }
    const z0: [number, number][] = [];
    for (let p = 0; p < data.ports; p++) z0.push([data.z0[2 * p], data.z0[2 * p + 1]]);
    const row: Part = {
      id: randomUUID(),
      projectId,
      name: name.trim() || fileName.replace(/\.[^.]+$/, ""),
      fileName,
      text,
      sizeBytes: Buffer.byteLength(text, "utf8"),
      ports: data.ports,
      version: data.version,
      points: data.frequencies.length,
      startHz: data.frequencies[0],
      stopHz: data.frequencies[data.frequencies.length - 1],
      referenceOhms: z0,
      ...figures,
      uploadedBy: actor?.id ?? null,
      createdAt: new Date(),
    };
    await tx.insert(parts).values(row);
    await recordAudit(tx, { actor, projectId, action: "part.upload", target: fileName, detail: { partId: row.id, ports: row.ports, points: row.points } });
    return summarise(row, false);
  };
  return executor ? work(executor) : runInTransaction(work);
}

/** Names of the scenarios whose latest revision places the part file `parts/<fileName>`. */
export async function scenariosUsingPart({ projectId, fileName, executor = db }: { projectId: string; fileName: string; executor?: Executor }): Promise<string[]> {
  const rows = await executor
    .select({ name: scenarios.name, content: scenarioRevisions.content })
    .from(scenarios)
    .innerJoin(scenarioRevisions, eq(scenarioRevisions.id, scenarios.latestRevisionId))
    .where(eq(scenarios.projectId, projectId))
    .orderBy(asc(scenarios.name));
  const file = `parts/${fileName}`;
  return rows
    .filter((r) => (r.content.blocks ?? []).some((b) => b.kind === "touchstone" && b.file === file && b.data === undefined))
    .map((r) => r.name);
}

/** Deleting a part that scenarios still place: 409 with their names. */
export class PartInUseError extends AppError {
  readonly scenarios: string[];
  constructor(fileName: string, names: string[]) {
    super(
      "conflict",
      409,
      `${fileName} is used by ${names.length === 1 ? "scenario" : "scenarios"} ${names.map((n) => `“${n}”`).join(", ")}. Remove it from ${names.length === 1 ? "that scenario" : "those scenarios"} first.`,
    );
    this.scenarios = names;
  }
}

/** Delete a part (engineers, owners); refused (409) while any scenario's latest revision uses it. */
export async function deletePart({ actor, projectId, partId }: { actor: SessionUser; projectId: string; partId: string }): Promise<void> {
  await runInTransaction(async (tx) => {
    await authorize({ userId: actor.id, projectId, action: "part.delete", executor: tx });
    const [row] = await tx
      .select({ id: parts.id, fileName: parts.fileName })
      .from(parts)
      .where(and(eq(parts.id, partId), eq(parts.projectId, projectId)));
    if (!row) throw new AppError("not_found", 404, "Part not found.");
    const users = await scenariosUsingPart({ projectId, fileName: row.fileName, executor: tx });
    if (users.length > 0) throw new PartInUseError(row.fileName, users);
    await tx.delete(parts).where(eq(parts.id, partId));
    await recordAudit(tx, { actor, projectId, action: "part.delete", target: row.fileName, detail: { partId } });
  });
}
