import { apiRoute, json, readBodyBytes } from "@/lib/server/api";
import { BUNDLE_UPLOAD_MAX_BYTES, importBundle } from "@/lib/server/bundle/import";
import { AppError } from "@/lib/base/errors";

type Params = { projectId: string };

/** Room for the multipart boundaries and headers around the file. */
const MULTIPART_OVERHEAD_BYTES = 64 * 1024;

const tooLarge = () => new AppError("payload_too_large", 413, `The bundle is larger than the upload limit of ${BUNDLE_UPLOAD_MAX_BYTES / (1024 * 1024)} MB.`);

/**
 * POST multipart/form-data { file: bundle.zip } → 201 { scenario, revision, parts, manifest, contentHashMatches }
 * (engineers, owners). Refusals name the entry at fault: 413 for size limits (upload, inflated total, ratio,
 * entry count), 422 for anything else (not a zip, unsafe names, no manifest, hash mismatch, bad scenario or
 * part); nothing is written unless the whole bundle is valid.
 */
export const POST = apiRoute<Params>(async (ctx) => {
  const type = ctx.request.headers.get("content-type") ?? "";
  if (!type.toLowerCase().startsWith("multipart/form-data")) {
    throw new AppError("unsupported_media_type", 415, "Upload the bundle as multipart/form-data with a field named file.");
  }
  const user = await ctx.requireUser();
  const body = await readBodyBytes(ctx.request, BUNDLE_UPLOAD_MAX_BYTES + MULTIPART_OVERHEAD_BYTES, tooLarge);
  let form: FormData;
  try {
    form = await new Response(new Blob([new Uint8Array(body)]), { headers: { "content-type": type } }).formData();
  } catch {
    throw new AppError("bad_request", 400, "The upload could not be read as a form.");
  }
  const file = form.get("file");
  if (!(file instanceof Blob)) throw new AppError("validation_failed", 400, "Choose a bundle (.zip) to import.", { file: "Choose a bundle file." });
  if (file.size > BUNDLE_UPLOAD_MAX_BYTES) throw tooLarge();
  const result = await importBundle({ actor: user, projectId: ctx.params.projectId, bytes: new Uint8Array(await file.arrayBuffer()) });
  return json(result, { status: 201 });
});
