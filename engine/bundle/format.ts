/**
 * The bundle format ("portolan.bundle/1"): file layout, manifest schema, limits and the error type that
 * every refusal of a bundle raises.
 */
import { createHash } from "node:crypto";
import { z } from "zod";
import { ruleSetHashInput, type EffectiveRuleSet } from "../checks/rule-set";

/** Format name written into every manifest. */
export const BUNDLE_FORMAT = "portolan.bundle/1";

/** Fixed paths inside a bundle. Parts live under `parts/`, named as the scenario's blocks name them. */
export const BUNDLE_PATHS = {
  manifest: "manifest.json",
  scenario: "scenario.json",
  composite: "results/composite", // + ".sNp"
  checksJson: "results/checks.json",
  checksCsv: "results/checks.csv",
  report: "report.html",
} as const;

/** Limits applied when a bundle is opened (the zip's central directory first, then while inflating). */
export type BundleLimits = {
  /** most entries (files and folders) in the zip */
  maxEntries: number;
  /** most bytes of all entries once inflated */
  maxTotalBytes: number;
  /** largest inflated/compressed ratio of one entry (checked for entries above `ratioFloorBytes`) */
  maxRatio: number;
  /** entries smaller than this are not ratio-checked: they cannot be bombs within the total limit */
  ratioFloorBytes: number;
};

export const DEFAULT_BUNDLE_LIMITS: BundleLimits = {
  maxEntries: 200,
  maxTotalBytes: 50 * 1024 * 1024,
  maxRatio: 100,
  ratioFloorBytes: 64 * 1024,
};

/** Why a bundle is refused: "too_large" (HTTP 413 in the app) or "invalid" (HTTP 422). */
export type BundleErrorKind = "too_large" | "invalid";

/** A refused bundle: the message names the entry at fault when there is one. */
export class BundleError extends Error {
  readonly kind: BundleErrorKind;
  /** the zip entry at fault, when there is one */
  readonly entry: string | null;
  constructor(kind: BundleErrorKind, message: string, entry: string | null = null) {
    super(message);
    this.name = "BundleError";
    this.kind = kind;
    this.entry = entry;
  }
}

const sha256Hex = z.string().regex(/^[0-9a-f]{64}$/, "expected a SHA-256 in lower-case hex");

export const BundleManifestSchema = z.object({
  format: z.literal(BUNDLE_FORMAT),
  app: z.object({ name: z.string(), version: z.string() }),
  created_at: z.string(),
  created_by: z.object({ name: z.string(), email: z.string() }).nullable(),
  project: z.object({ id: z.string(), name: z.string() }),
  scenario: z.object({ id: z.string(), name: z.string() }),
  revision: z.object({ id: z.string(), number: z.number().int(), content_hash: z.string() }),
  /** the switch setting the verdicts were judged in (block, throws, selected throw); absent in older bundles */
  switch_states: z.array(z.object({ block: z.string(), label: z.string().optional(), throws: z.number().int(), state: z.number().int() })).optional(),
  /** every other file of the bundle: its SHA-256 (hex, of the file's bytes) and size */
  files: z.record(z.string(), z.object({ sha256: sha256Hex, bytes: z.number().int().nonnegative() })),
});

/** manifest.json of a bundle. */
export type BundleManifest = z.infer<typeof BundleManifestSchema>;

/** The manifest without `files`, which is computed from the bundle's contents when it is written. */
export type BundleIdentity = Omit<BundleManifest, "files" | "format">;

/**
 * SHA-256 of bytes or UTF-8 text, lower-case hex (FIPS 180-4).
 *
 * @param data - file contents
 * @returns 64 hex digits
 * @example sha256("abc") // "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"
 */
export function sha256(data: string | Uint8Array): string {
  return createHash("sha256").update(data).digest("hex");
}

/**
 * Refuses an entry name that could escape the folder it is unpacked into, or that a bundle never holds:
 * absolute paths, backslashes, drive letters, `.`/`..` or empty segments, control characters.
 *
 * @param name - the entry name as stored in the zip
 * @throws BundleError ("invalid") naming the entry
 * @example checkEntryName("parts/ant.s1p"); // ok
 * checkEntryName("../x"); // throws
 */
export function checkEntryName(name: string): void {
  const refuse = (why: string) => {
    throw new BundleError("invalid", `Entry "${name}" is refused: ${why}.`, name);
  };
  if (name.length === 0) refuse("it has no name");
  if (name.length > 300) refuse("its name is longer than 300 characters");
  if (/[\u0000-\u001f\u007f]/.test(name)) refuse("its name holds control characters");
  if (name.includes("\\")) refuse("its name holds a backslash");
  if (name.startsWith("/")) refuse("it is an absolute path");
  if (/^[A-Za-z]:/.test(name)) refuse("it starts with a drive letter");
  const segments = name.replace(/\/$/, "").split("/");
  if (segments.some((s) => s === "..")) refuse("its path climbs out of the bundle (..)");
  if (segments.some((s) => s === "" || s === ".")) refuse("its path has an empty or '.' segment");
}

// The bundle's canonical JSON is the engine's one (RFC 8785), the same the app hashes revisions with.
import { canonicalJson } from "../canonical-json";

export { canonicalJson };

/**
 * The identity of an effective rule set: SHA-256 (hex) of the canonical JSON of what judges
 * (ruleSetHashInput: ids, sources, rules, opt-outs). Equal for equal rules whatever their key order;
 * different for any change of a limit, band, port or source. Stored with every check run and bundle.
 *
 * @example hashRuleSet(effectiveRuleSet(projectRules, scenario)) // "3f0c…"
 */
export function hashRuleSet(set: EffectiveRuleSet): string {
  return sha256(canonicalJson(ruleSetHashInput(set)));
}
