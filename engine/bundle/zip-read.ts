/**
 * Reads a zip archive defensively: the central directory is parsed first (entry count, declared sizes,
 * compression ratios and names are checked before anything is inflated), then each entry is inflated with
 * a hard output cap, so that a lying header cannot make it larger than declared.
 * Zip layout after PKWARE's APPNOTE.TXT (sections 4.3.7 local header, 4.3.12 central directory header,
 * 4.3.16 end of central directory record).
 */
import { crc32, inflateRawSync } from "node:zlib";
import { BundleError, checkEntryName, DEFAULT_BUNDLE_LIMITS, type BundleLimits } from "./format";

const EOCD_SIGNATURE = 0x06054b50;
const CENTRAL_SIGNATURE = 0x02014b50;
const LOCAL_SIGNATURE = 0x04034b50;

/** One entry as its central directory header declares it. */
export type ZipEntryInfo = {
  name: string;
  method: number;
  flags: number;
  crc32: number;
  compressedSize: number;
  uncompressedSize: number;
  localHeaderOffset: number;
  isDirectory: boolean;
};

function findEndOfCentralDirectory(bytes: Uint8Array, view: DataView): number {
  const lowest = Math.max(0, bytes.length - 22 - 0xffff);
  for (let at = bytes.length - 22; at >= lowest; at--) {
    if (view.getUint32(at, true) === EOCD_SIGNATURE) return at;
  }
  return -1;
}

/**
 * Lists the entries of a zip from its central directory, checking the limits and every name.
 *
 * @param bytes - the whole zip file
 * @param limits - entry count, total inflated size and ratio limits
 * @returns the entries in directory order
 * @throws BundleError "invalid" for a file that is not a zip, a bad name, a duplicate, encryption or an
 *   unknown compression method; "too_large" for too many entries, too many bytes or a suspicious ratio
 * @example listZipEntries(readFileSync("bundle.zip")).map((e) => e.name)
 */
export function listZipEntries(bytes: Uint8Array, limits: BundleLimits = DEFAULT_BUNDLE_LIMITS): ZipEntryInfo[] {
  const notZip = () => new BundleError("invalid", "The file is not a zip archive (no end-of-central-directory record found).");
  if (bytes.length < 22) throw notZip();
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const eocd = findEndOfCentralDirectory(bytes, view);
  if (eocd < 0) throw notZip();
  const total = view.getUint16(eocd + 10, true);
  const cdSize = view.getUint32(eocd + 12, true);
  const cdOffset = view.getUint32(eocd + 16, true);
  if (total === 0xffff || cdSize === 0xffffffff || cdOffset === 0xffffffff) {
    throw new BundleError("invalid", "The zip uses the ZIP64 extension, which bundles never need.");
  }
  if (view.getUint16(eocd + 4, true) !== 0 || view.getUint16(eocd + 6, true) !== 0) {
    throw new BundleError("invalid", "The zip spans several disks, which bundles never do.");
  }
  if (total > limits.maxEntries) {
    throw new BundleError("too_large", `The zip has ${total} entries; a bundle may have at most ${limits.maxEntries}.`);
  }
  if (cdOffset + cdSize > eocd) throw new BundleError("invalid", "The zip's central directory lies outside the file (truncated or corrupt zip).");
  const decoder = new TextDecoder("utf-8", { fatal: false });
  const entries: ZipEntryInfo[] = [];
  const seen = new Set<string>();
  let declaredTotal = 0;
  let at = cdOffset;
  for (let i = 0; i < total; i++) {
    if (at + 46 > cdOffset + cdSize || view.getUint32(at, true) !== CENTRAL_SIGNATURE) {
      throw new BundleError("invalid", `The zip's central directory is corrupt at entry ${i + 1}.`);
    }
    const flags = view.getUint16(at + 8, true);
    const method = view.getUint16(at + 10, true);
    const crc = view.getUint32(at + 16, true);
    const compressedSize = view.getUint32(at + 20, true);
    const uncompressedSize = view.getUint32(at + 24, true);
    const nameLength = view.getUint16(at + 28, true);
    const extraLength = view.getUint16(at + 30, true);
    const commentLength = view.getUint16(at + 32, true);
    const localHeaderOffset = view.getUint32(at + 42, true);
    if (at + 46 + nameLength > bytes.length) throw new BundleError("invalid", `The zip's central directory is corrupt at entry ${i + 1}.`);
    const name = decoder.decode(bytes.subarray(at + 46, at + 46 + nameLength));
    at += 46 + nameLength + extraLength + commentLength;
    checkEntryName(name);
    if (seen.has(name)) throw new BundleError("invalid", `Entry "${name}" appears twice in the zip.`, name);
    seen.add(name);
    if (flags & 0x1) throw new BundleError("invalid", `Entry "${name}" is encrypted; bundles are never encrypted.`, name);
    if (method !== 0 && method !== 8) throw new BundleError("invalid", `Entry "${name}" uses compression method ${method}; only stored (0) and deflate (8) are read.`, name);
    if (uncompressedSize === 0xffffffff || compressedSize === 0xffffffff) throw new BundleError("invalid", `Entry "${name}" uses ZIP64 sizes, which bundles never need.`, name);
    declaredTotal += uncompressedSize;
    if (declaredTotal > limits.maxTotalBytes) {
      throw new BundleError("too_large", `Entry "${name}" takes the bundle past ${limits.maxTotalBytes} bytes once unpacked (the zip declares at least ${declaredTotal}).`, name);
    }
    if (uncompressedSize > limits.ratioFloorBytes && uncompressedSize > limits.maxRatio * Math.max(1, compressedSize)) {
      throw new BundleError(
        "too_large",
        `Entry "${name}" would inflate ${Math.round(uncompressedSize / Math.max(1, compressedSize))} times (${compressedSize} → ${uncompressedSize} bytes); more than ${limits.maxRatio}:1 is refused.`,
        name,
      );
    }
    entries.push({ name, method, flags, crc32: crc, compressedSize, uncompressedSize, localHeaderOffset, isDirectory: name.endsWith("/") });
  }
  return entries;
}

/**
 * Inflates one entry, never producing more than its declared size (nor more than `budget` bytes), and
 * checks its CRC-32.
 *
 * @param bytes - the whole zip file
 * @param entry - an entry from listZipEntries
 * @param budget - bytes still allowed for the whole bundle
 * @returns the entry's bytes
 * @throws BundleError naming the entry when it inflates past its declared size or budget, or is corrupt
 * @example const text = new TextDecoder().decode(inflateEntry(zip, entries[0], 1 << 20));
 */
export function inflateEntry(bytes: Uint8Array, entry: ZipEntryInfo, budget: number): Uint8Array {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const at = entry.localHeaderOffset;
  if (at + 30 > bytes.length || view.getUint32(at, true) !== LOCAL_SIGNATURE) {
    throw new BundleError("invalid", `Entry "${entry.name}" has no valid local header (corrupt zip).`, entry.name);
  }
  const start = at + 30 + view.getUint16(at + 26, true) + view.getUint16(at + 28, true);
  const end = start + entry.compressedSize;
  if (end > bytes.length) throw new BundleError("invalid", `Entry "${entry.name}" runs past the end of the zip (truncated).`, entry.name);
  const raw = bytes.subarray(start, end);
  const cap = Math.min(entry.uncompressedSize, budget);
  let out: Uint8Array;
  if (entry.method === 0) {
    out = raw;
  } else {
    try {
      // the cap stops inflation itself: a bomb with a lying header fails here without allocating its size
      out = inflateRawSync(raw, { maxOutputLength: Math.max(1, cap + 1) });
    } catch (err) {
      const code = (err as { code?: string }).code;
      if (code === "ERR_BUFFER_TOO_LARGE" || err instanceof RangeError) {
        throw new BundleError("too_large", `Entry "${entry.name}" inflates to more than ${cap} bytes (its declared size or the bundle's remaining limit).`, entry.name);
      }
      throw new BundleError("invalid", `Entry "${entry.name}" cannot be inflated (corrupt data).`, entry.name);
    }
  }
  if (out.length > cap) {
    throw new BundleError("too_large", `Entry "${entry.name}" inflates to more than ${cap} bytes (its declared size or the bundle's remaining limit).`, entry.name);
  }
  if (out.length !== entry.uncompressedSize) {
    throw new BundleError("invalid", `Entry "${entry.name}" inflates to ${out.length} bytes, not the ${entry.uncompressedSize} its header declares.`, entry.name);
  }
  if (crc32(out) >>> 0 !== entry.crc32 >>> 0) throw new BundleError("invalid", `Entry "${entry.name}" fails its CRC-32 check (corrupt zip).`, entry.name);
  return out;
}

/**
 * Opens a zip within limits: lists its entries, then inflates every file entry (folders are skipped).
 *
 * @param bytes - the whole zip file
 * @param limits - see BundleLimits
 * @returns file name → bytes
 * @throws BundleError (see listZipEntries and inflateEntry)
 * @example const files = readZipSafely(readFileSync("bundle.zip")); files.get("manifest.json")
 */
export function readZipSafely(bytes: Uint8Array, limits: BundleLimits = DEFAULT_BUNDLE_LIMITS): Map<string, Uint8Array> {
  const entries = listZipEntries(bytes, limits);
  const files = new Map<string, Uint8Array>();
  let used = 0;
  for (const entry of entries) {
    if (entry.isDirectory) {
      if (entry.uncompressedSize !== 0) throw new BundleError("invalid", `Entry "${entry.name}" is a folder with contents.`, entry.name);
      continue;
    }
    const data = inflateEntry(bytes, entry, limits.maxTotalBytes - used);
    used += data.length;
    files.set(entry.name, data);
  }
  return files;
}
