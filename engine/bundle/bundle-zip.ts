/**
 * Writing a bundle zip (manifest with the SHA-256 of every other file) and opening one: limits, names,
 * manifest schema and hashes, in that order, before anything in it is used.
 */
import JSZip from "jszip";
import { BUNDLE_FORMAT, BUNDLE_PATHS, BundleError, BundleManifestSchema, DEFAULT_BUNDLE_LIMITS, sha256, type BundleIdentity, type BundleLimits, type BundleManifest } from "./format";
import { readZipSafely } from "./zip-read";

/**
 * The manifest of a set of files: identity plus SHA-256 and size of each file.
 *
 * @param identity - app, project, scenario, revision, who and when
 * @param files - bundle path → text (everything except manifest.json)
 * @returns the manifest object
 * @example makeManifest(identity, new Map([["scenario.json", "{}"]])).files["scenario.json"].bytes // 2
 */
export function makeManifest(identity: BundleIdentity, files: Map<string, string>): BundleManifest {
  const list: BundleManifest["files"] = {};
  for (const [path, text] of files) {
    const bytes = new TextEncoder().encode(text);
    list[path] = { sha256: sha256(bytes), bytes: bytes.length };
  }
  return { format: BUNDLE_FORMAT, ...identity, files: list };
}

/**
 * Zips a bundle: manifest.json first, then the files in the given order (deflate, no folder entries).
 *
 * @param identity - who, what and when (see BundleIdentity)
 * @param files - bundle path → text, everything except manifest.json
 * @returns the zip file's bytes
 * @example writeFileSync("bundle.zip", await writeBundleZip(identity, files));
 */
export async function writeBundleZip(identity: BundleIdentity, files: Map<string, string>): Promise<Uint8Array> {
  const manifest = makeManifest(identity, files);
  const zip = new JSZip();
  const date = new Date(identity.created_at);
  const options = { createFolders: false, date: Number.isNaN(date.getTime()) ? new Date() : date };
  zip.file(BUNDLE_PATHS.manifest, `${JSON.stringify(manifest, null, 2)}\n`, options);
  for (const [path, text] of files) zip.file(path, text, options);
  return zip.generateAsync({ type: "uint8array", compression: "DEFLATE", compressionOptions: { level: 6 }, platform: "UNIX" });
}

/** An opened, verified bundle: manifest and the text of every file it lists. */
export type OpenedBundle = {
  manifest: BundleManifest;
  /** bundle path → text, every file the manifest lists (hash verified) */
  files: Map<string, string>;
  /** the parts: "parts/x.s2p" → Touchstone text */
  parts: Record<string, string>;
  /** the scenario file's JSON value */
  scenario: unknown;
};

/** What openBundle found wrong with the contents (as opposed to a zip that cannot be opened at all). */
export class BundleIntegrityError extends BundleError {
  constructor(message: string, entry: string | null) {
    super("invalid", message, entry);
    this.name = "BundleIntegrityError";
  }
}

/**
 * Opens a bundle: zip limits and entry names (readZipSafely), then manifest.json (present, JSON, schema),
 * then every file against its SHA-256 and size; files the manifest does not list, and listed files that
 * are missing, are refused.
 *
 * @param bytes - the zip file
 * @param limits - zip limits (defaults: 200 entries, 50 MB inflated, 100:1)
 * @returns the verified bundle
 * @throws BundleError for an unreadable or refused zip or manifest; BundleIntegrityError when the files do
 *   not match the manifest (tampering)
 * @example const { manifest } = openBundle(readFileSync("bundle.zip"));
 */
export function openBundle(bytes: Uint8Array, limits: BundleLimits = DEFAULT_BUNDLE_LIMITS): OpenedBundle {
  const raw = readZipSafely(bytes, limits);
  const manifestBytes = raw.get(BUNDLE_PATHS.manifest);
  if (!manifestBytes) throw new BundleError("invalid", "The bundle has no manifest.json, so its files cannot be verified.", BUNDLE_PATHS.manifest);
  const decoder = new TextDecoder("utf-8", { fatal: true });
  const decode = (name: string, data: Uint8Array): string => {
    try {
      return decoder.decode(data);
    } catch {
      throw new BundleError("invalid", `Entry "${name}" is not UTF-8 text.`, name);
    }
  };
  let manifestJson: unknown;
  try {
    manifestJson = JSON.parse(decode(BUNDLE_PATHS.manifest, manifestBytes));
  } catch (err) {
    if (err instanceof BundleError) throw err;
    throw new BundleError("invalid", "manifest.json is not valid JSON.", BUNDLE_PATHS.manifest);
  }
  const parsed = BundleManifestSchema.safeParse(manifestJson);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const where = issue.path.length > 0 ? issue.path.map(String).join(".") : "(root)";
    throw new BundleError("invalid", `manifest.json is not a ${BUNDLE_FORMAT} manifest: ${where}: ${issue.message}.`, BUNDLE_PATHS.manifest);
  }
  const manifest = parsed.data;
  const files = new Map<string, string>();
  for (const name of raw.keys()) {
    if (name !== BUNDLE_PATHS.manifest && !(name in manifest.files)) throw new BundleIntegrityError(`Entry "${name}" is not listed in manifest.json.`, name);
  }
  for (const [name, expected] of Object.entries(manifest.files)) {
    const data = raw.get(name);
    if (!data) throw new BundleIntegrityError(`manifest.json lists "${name}", which the bundle does not contain.`, name);
    const actual = sha256(data);
    if (actual !== expected.sha256 || data.length !== expected.bytes) {
      throw new BundleIntegrityError(`Entry "${name}" does not match manifest.json (SHA-256 ${actual.slice(0, 12)}…, expected ${expected.sha256.slice(0, 12)}…): the file was changed after export.`, name);
    }
    files.set(name, decode(name, data));
  }
  const scenarioText = files.get(BUNDLE_PATHS.scenario);
  if (scenarioText === undefined) throw new BundleError("invalid", "The bundle has no scenario.json.", BUNDLE_PATHS.scenario);
  let scenario: unknown;
  try {
    scenario = JSON.parse(scenarioText);
  } catch {
    throw new BundleError("invalid", "scenario.json is not valid JSON.", BUNDLE_PATHS.scenario);
  }
  const parts: Record<string, string> = {};
  for (const [name, text] of files) if (name.startsWith("parts/")) parts[name] = text;
  return { manifest, files, parts, scenario };
}
