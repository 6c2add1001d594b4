/**
 * Reading the Touchstone data of `touchstone` blocks, inline or from files, with a cache keyed by the
 * text, so that preparing the same scenario again (a state sweep, an edit elsewhere on the chart) does
 * not parse its parts again.
 */
import { parseTouchstone, type TouchstoneData } from "../touchstone";
import { EngineInputError, type BlockSpec } from "../types";

/** Where part files come from: a reader of paths relative to the scenario file, and/or texts by file name. */
export type PartSource = {
  /** reads a part file given its path relative to the scenario file; throws when it cannot */
  readFile?: (relPath: string) => string;
  /** Touchstone texts by file name (as written in the block's `file`); win over `readFile` */
  parts?: Record<string, string>;
};

/** Default memory cap of the parsed-part cache: 256 MiB (a server sets its own with setPartCacheLimit). */
export const DEFAULT_PART_CACHE_BYTES = 256 * 1024 ** 2;

type CacheEntry = { data: TouchstoneData; bytes: number };
// Map keeps insertion order: the first key is the least recently used (a hit moves its entry to the end)
const cache = new Map<string, CacheEntry>();
let cacheBytes = 0;
let cacheLimit = DEFAULT_PART_CACHE_BYTES;

function cacheKey(text: string, ports: number | undefined, name: string): string {
  // the text is the content key (the Map hashes it); the name picks the port count of a v1.1 file (".s3p")
  return `${ports ?? ""}\u0000${name}\u0000${text}`;
}

/** What an entry holds: its key (UTF-16, 2 bytes a character) and the typed arrays of the parsed data. */
function entryBytes(key: string, data: TouchstoneData): number {
  return 2 * key.length + data.s.data.byteLength + data.frequencies.byteLength;
}

function evictTo(limit: number): void {
  while (cacheBytes > limit && cache.size > 0) {
    const [key, entry] = cache.entries().next().value as [string, CacheEntry];
    cache.delete(key);
    cacheBytes -= entry.bytes;
  }
}

/**
 * Parses Touchstone text, returning a cached result when the same text (and port hint) was parsed
 * before. The cache is least-recently-used within a byte cap (setPartCacheLimit): a part larger than the
 * cap is parsed but not kept. The result is shared: callers must not write into it.
 *
 * @param text - Touchstone 1.1 or 2.0 text
 * @param name - file name used for the port count of v1.1 files (".s2p") and in error messages
 * @param ports - port count hint for inline v1.1 text
 * @returns the parsed data (frequencies in Hz, S with the file's own references)
 * @example
 * const part = parseTouchstoneCached("# GHz S RI R 50\n1 0.1 0 0.9 0 0.9 0 0.1 0\n", "pad.s2p");
 * part.ports; // 2
 */
export function parseTouchstoneCached(text: string, name: string, ports?: number): TouchstoneData {
  const key = cacheKey(text, ports, name);
  const hit = cache.get(key);
  if (hit) {
    // refresh its place so that the most recently used parts stay
    cache.delete(key);
    cache.set(key, hit);
    return hit.data;
  }
  const parsed = parseTouchstone(text, { name, ports });
  const bytes = entryBytes(key, parsed);
  if (bytes <= cacheLimit) {
    evictTo(cacheLimit - bytes);
    cache.set(key, { data: parsed, bytes });
    cacheBytes += bytes;
  }
  return parsed;
}

/** Empties the part cache (tests, or a server freeing memory). */
export function clearPartCache(): void {
  cache.clear();
  cacheBytes = 0;
}

/**
 * Sets the byte cap of the part cache, evicting the least recently used parts until it holds.
 *
 * @param bytes - the cap (0 keeps nothing)
 * @example setPartCacheLimit(64 * 1024 ** 2);
 */
export function setPartCacheLimit(bytes: number): void {
  cacheLimit = Math.max(0, bytes);
  evictTo(cacheLimit);
}

/** What the part cache holds now: entries and bytes (as counted by the cap), and the cap. */
export function partCacheStats(): { entries: number; bytes: number; limitBytes: number } {
  return { entries: cache.size, bytes: cacheBytes, limitBytes: cacheLimit };
}

/**
 * The key under which a supplied text of a pinned part version is looked up (and the path a bundle stores
 * it at): `file` itself for version 1 (or none), else `v<N>/` before the file's last segment, e.g.
 * `parts/amp.s2p` version 2 → `parts/v2/amp.s2p` (docs/scenario-format.md#part-versions).
 *
 * @param file - the block's `file`
 * @param version - the block's `part_version` (absent = 1)
 * @returns the key
 * @example pinnedPartPath("parts/amp.s2p", 2) // "parts/v2/amp.s2p"
 */
export function pinnedPartPath(file: string, version?: number): string {
  if (version === undefined || version <= 1) return file;
  const slash = file.lastIndexOf("/");
  return `${file.slice(0, slash + 1)}v${version}/${file.slice(slash + 1)}`;
}

/**
 * The file and version a key of pinnedPartPath names (the inverse): `parts/v2/amp.s2p` → `parts/amp.s2p`, 2.
 *
 * @param key - a key as pinnedPartPath writes it
 * @returns the block's `file` and version (1 when the key has no `v<N>/` segment)
 * @example parsePinnedPartPath("parts/v3/amp.s2p") // { file: "parts/amp.s2p", version: 3 }
 */
export function parsePinnedPartPath(key: string): { file: string; version: number } {
  const m = /^(.*\/)?v([1-9][0-9]*)\/([^/]+)$/.exec(key);
  if (!m || Number(m[2]) < 2) return { file: key, version: 1 };
  return { file: `${m[1] ?? ""}${m[3]}`, version: Number(m[2]) };
}

/**
 * The Touchstone text of a `touchstone` block: its inline `data`, else the supplied
 * `parts[pinnedPartPath(file, part_version)]`, else `readFile(file)` (a file on disk has no versions).
 *
 * @param block - the block spec (kind "touchstone")
 * @param where - JSON path of the block, e.g. `blocks[3]`, for error messages
 * @param source - where files come from
 * @returns the text and the name to report it by, or null when the block names a file but no source is given
 * @throws EngineInputError when the block has neither `data` nor `file`, or the file cannot be read
 * @example
 * partText({ id: "ANT", kind: "touchstone", file: "ant.s1p" }, "blocks[2]", { parts: { "ant.s1p": text } });
 */
export function partText(block: BlockSpec, where: string, source: PartSource): { text: string; name: string } | null {
  if (block.data !== undefined) return { text: block.data, name: block.file ?? `${block.id}${block.ports ? `.s${block.ports}p` : ""}` };
  if (block.file === undefined) throw new EngineInputError(where, "a touchstone block needs `file` or inline `data`");
  const key = pinnedPartPath(block.file, block.part_version);
  const inline = source.parts?.[key];
  if (inline !== undefined) return { text: inline, name: key };
  if (!source.readFile) return null;
  try {
    return { text: source.readFile(block.file), name: block.file };
  } catch (err) {
    const reason = err instanceof Error ? err.message : String(err);
    throw new EngineInputError(`${where}.file`, `cannot read part file "${block.file}": ${reason}`);
  }
}

/**
 * Reads and parses the part of a `touchstone` block (cached), turning Touchstone errors into
 * EngineInputError that name the block and the file line.
 *
 * @param block - the block spec (kind "touchstone")
 * @param where - JSON path of the block, e.g. `blocks[3]`
 * @param source - where files come from
 * @returns the parsed part, or null when it names a file and no source can read it
 * @example
 * loadPart(scenario.blocks[2], "blocks[2]", { readFile: (p) => readFileSync(join(dir, p), "utf8") });
 */
export function loadPart(block: BlockSpec, where: string, source: PartSource): TouchstoneData | null {
  const found = partText(block, where, source);
  if (!found) return null;
  try {
    return parseTouchstoneCached(found.text, found.name, block.ports);
  } catch (err) {
    if (err instanceof EngineInputError) throw new EngineInputError(err.where, `${err.message.slice(err.where.length + 2)} (block ${block.id})`);
    const reason = err instanceof Error ? err.message : String(err);
    throw new EngineInputError(block.data !== undefined ? `${where}.data` : `${where}.file`, `${reason} (block ${block.id})`);
  }
}
