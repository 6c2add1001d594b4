/** Review bundles: writing, opening within limits, verifying and re-running (server and CLI). */
export { BUNDLE_FORMAT, BUNDLE_PATHS, DEFAULT_BUNDLE_LIMITS, BundleError, BundleManifestSchema, checkEntryName, canonicalJson, sha256, hashRuleSet, type BundleLimits, type BundleManifest, type BundleIdentity, type BundleErrorKind } from "./format";
export { listZipEntries, inflateEntry, readZipSafely, type ZipEntryInfo } from "./zip-read";
export { makeManifest, writeBundleZip, openBundle, BundleIntegrityError, type OpenedBundle } from "./bundle-zip";
export { computeBundleResults, summariseSpread, compositeFile, checksCsv, bundleFiles, usedPartFiles, engineScenario, CHECKS_FORMAT, type ChecksDocument, type BundleResults, type RuleVerdict, type BundleWaiver, type BundleRuleSet, type SpreadSummary } from "./contents";
export { reproduceBundle, FIGURE_TOLERANCE_DB, COMPOSITE_TOLERANCE, type ReproduceResult, type ReproducedItem } from "./reproduce";
export { switchSettings, settingText, summariseSweep, bundleSweep, driveTables, combinationIndex, compareSettings, settingsCsvRows, SWEEP_LISTED_FAILURES, type SwitchSetting, type SweepSummary, type SweepRuleSummary, type DriveTable } from "./settings";
