import { createPart, createPartVersion, listParts } from "@/db/queries/parts";
import { apiRoute, json, readBodyBytes, parseWith } from "@/lib/server/api";
import { AppError } from "@/lib/base/errors";
import { PART_MAX_BYTES, partFileNameSchema, partNameSchema } from "@/lib/base/validation/parts";
import { z } from "zod";

/** The explicit ask for a new version: the file name of the part it is a version of. */
const newVersionOfSchema = z.object({ new_version_of: partFileNameSchema });

type Params = { projectId: string };

/** Room for the multipart boundaries and the other fields around the file. */
const MULTIPART_OVERHEAD_BYTES = 64 * 1024;

const tooLarge = () =>
  new AppError("payload_too_large", 413, `The file is larger than the limit of ${PART_MAX_BYTES / (1024 * 1024)} MB for a part. Reduce the number of frequency points or split the file.`);

/** GET …/parts[?text=1] → { parts } with figures and a preview trace; `text=1` adds each Touchstone text. */
export const GET = apiRoute<Params>(async (ctx) => {
  const withText = new URL(ctx.request.url).searchParams.get("text") === "1";
  const user = await ctx.requireUser();
  return json({ parts: await listParts({ userId: user.id, projectId: ctx.params.projectId, withText }) });
});

/**
 * POST multipart/form-data { file, name? } → 201 { part } (engineers, owners).
 * 413 above 5 MB, 415 when not multipart, 422 when the file cannot be read (the message names the line),
 * 409 when the project already has a part file of that name. Nothing is written unless all is well.
 *
 * A new version of an existing part is asked for explicitly: { file, new_version_of: "<file name>" } →
 * 201 { part } with `partVersion` one above the latest; the uploaded file's own name does not matter (the
 * part keeps its file name), 404 when there is no such part, 422 when the port count differs. A name
 * clash without `new_version_of` stays a 409: nothing is replaced silently.
 */
export const POST = apiRoute<Params>(async (ctx) => {
  const type = ctx.request.headers.get("content-type") ?? "";
  if (!type.toLowerCase().startsWith("multipart/form-data")) {
    throw new AppError("unsupported_media_type", 415, "Upload the Touchstone file as multipart/form-data with a field named file.");
  }
  const user = await ctx.requireUser();
  const bytes = await readBodyBytes(ctx.request, PART_MAX_BYTES + MULTIPART_OVERHEAD_BYTES, tooLarge);
  let form: FormData;
  try {
    form = await new Response(new Blob([new Uint8Array(bytes)]), { headers: { "content-type": type } }).formData();
  } catch {
    throw new AppError("bad_request", 400, "The upload could not be read as a form.");
  }
  const file = form.get("file");
  if (!(file instanceof Blob)) throw new AppError("validation_failed", 400, "Choose a Touchstone file to upload.", { file: "Choose a Touchstone file." });
  if (file.size > PART_MAX_BYTES) throw tooLarge();
  const newVersionOf = form.get("new_version_of");
  if (newVersionOf !== null) {
    const target = parseWith(newVersionOfSchema, typeof newVersionOf === "string" ? { new_version_of: newVersionOf } : {});
    const text = new TextDecoder("utf-8", { fatal: false }).decode(await file.arrayBuffer());
    const ownName = partFileNameSchema.safeParse("name" in file && typeof file.name === "string" ? file.name : "");
    const part = await createPartVersion({ actor: user, projectId: ctx.params.projectId, fileName: target.new_version_of, text, ...(ownName.success ? { uploadedName: ownName.data } : {}) });
    return json({ part }, { status: 201 });
  }
  const fileName = parseWith(partFileNameSchema, "name" in file && typeof file.name === "string" ? file.name : "");
  const nameField = form.get("name");
  const name = parseWith(partNameSchema, typeof nameField === "string" ? nameField : "");
  const text = new TextDecoder("utf-8", { fatal: false }).decode(await file.arrayBuffer());
  const part = await createPart({ actor: user, projectId: ctx.params.projectId, name, fileName, text });
  return json({ part }, { status: 201 });
});
