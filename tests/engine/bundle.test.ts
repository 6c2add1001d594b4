// Review bundles in the engine: writing, opening within limits, hostile zips, the CLI's `check bundle.zip`.
import { beforeAll, describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import {
  BUNDLE_FORMAT,
  BundleError,
  BundleIntegrityError,
  bundleFiles,
  computeBundleResults,
  makeManifest,
  openBundle,
  readZipSafely,
  reproduceBundle,
  sha256,
  writeBundleZip,
  type BundleIdentity,
  type ChecksDocument,
} from "@/engine/bundle";
import { runPythonJson } from "./reference/python";
import { writeRawZip, type RawEntry } from "./bundle-zip-helpers";

const FIXTURES = path.resolve("tests/fixtures/scenarios");
const scenarioJson = () => JSON.parse(readFileSync(path.join(FIXTURES, "telemetry-front-end.json"), "utf8")) as Record<string, unknown>;
const partsOf = () => ({ "parts/telemetry-patch.s1p": readFileSync(path.join(FIXTURES, "parts/telemetry-patch.s1p"), "utf8") });

const identity: BundleIdentity = {
  app: { name: "portolan", version: "0.1.0" },
  created_at: "2026-12-01T12:00:00.000Z",
  created_by: { name: "Rita Reviewer", email: "rita@example.test" },
  project: { id: "p1", name: "Telemetry" },
  scenario: { id: "s1", name: "Telemetry front end" },
  revision: { id: "r1", number: 3, content_hash: "0".repeat(64) },
};

let dir: string;
let zip: Uint8Array;
let zipPath: string;

beforeAll(async () => {
  dir = mkdtempSync(path.join(os.tmpdir(), "portolan-bundle-"));
  const content = scenarioJson();
  const parts = partsOf();
  zip = await writeBundleZip(identity, bundleFiles(content, parts, computeBundleResults(content, parts)));
  zipPath = path.join(dir, "telemetry.zip");
  writeFileSync(zipPath, zip);
});

/** The bundle's entries, one changed, zipped again with the original manifest. */
function rezip(change: (files: Map<string, Uint8Array>) => void): Uint8Array {
  const files = readZipSafely(zip);
  change(files);
  return writeRawZip([...files].map(([name, data]) => ({ name, data })));
}

function runCli(args: string[]): { code: number; out: string; err: string } {
  const r = spawnSync("npx", ["tsx", "engine/cli.ts", ...args], { encoding: "utf8", cwd: process.cwd(), timeout: 120_000 });
  return { code: r.status ?? -1, out: r.stdout, err: r.stderr };
}

function refusal(bytes: Uint8Array): BundleError {
  try {
    openBundle(bytes);
  } catch (err) {
    if (err instanceof BundleError) return err;
    throw err;
  }
  throw new Error("the bundle was accepted");
}

describe("SHA-256 of bundle files", () => {
  it('sha256("abc") is the published test vector', () => {
    // FIPS 180-2, Appendix B.1 (one-block message "abc")
    expect(sha256("abc")).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  });
});

describe("writing and opening a bundle", () => {
  it("Python's zipfile reads the bundle and hashlib agrees with every hash in manifest.json", () => {
    // Reference: CPython zipfile and hashlib (Debian /usr/bin/python3), independent of jszip and node:crypto
    const script = [
      "import zipfile, hashlib, json, sys",
      "z = zipfile.ZipFile(sys.argv[1])",
      "m = json.loads(z.read('manifest.json'))",
      "out = {n: hashlib.sha256(z.read(n)).hexdigest() for n in z.namelist() if n != 'manifest.json'}",
      "print(json.dumps({'names': z.namelist(), 'hashes': out, 'manifest': m}))",
    ].join("\n");
    const py = runPythonJson<{
      names: string[];
      hashes: Record<string, string>;
      manifest: { format: string; files: Record<string, { sha256: string; bytes: number }> };
    }>(script, undefined, { numpy: false, args: [zipPath] });
    expect(py.manifest.format).toBe(BUNDLE_FORMAT);
    expect(py.names.sort()).toEqual(["manifest.json", "parts/telemetry-patch.s1p", "results/checks.csv", "results/checks.json", "results/composite.s3p", "scenario.json"]);
    for (const [name, hash] of Object.entries(py.hashes)) expect(py.manifest.files[name].sha256).toBe(hash);
    // the part travels byte for byte as uploaded
    expect(openBundle(zip).parts["parts/telemetry-patch.s1p"]).toBe(partsOf()["parts/telemetry-patch.s1p"]);
  });

  it("re-running the bundle from its own files reproduces every verdict and the composite exactly", () => {
    const r = reproduceBundle(openBundle(zip));
    expect(r.error).toBeNull();
    expect(r.reproduced).toBe(true);
    expect(r.compositeMaxDiff).toBe(0);
    expect(r.items.map((i) => i.name)).toEqual(expect.arrayContaining(["overall verdict", "rule:rules[0]", "ledger:TX", "passivity", "composite"]));
  });
});

describe("portolan check <bundle.zip>", () => {
  it("reproduces the verdicts from the bundle alone and exits as `check` on the original scenario does", () => {
    const original = runCli(["check", path.join(FIXTURES, "telemetry-front-end.json")]);
    const fromBundle = runCli(["check", zipPath]);
    expect(fromBundle.out).toContain("REPRODUCED: the stored verdicts and figures come out the same; verdict FAIL");
    // the fixture has failing rules (its isolation and drive rules), so `check` exits 1 on the file and on the bundle
    expect(original.code).toBe(1);
    expect(fromBundle.code).toBe(original.code);
  });

  it("a part changed after export is reported as tampered (exit 3) naming the file", () => {
    const bad = rezip((files) => files.set("parts/telemetry-patch.s1p", Buffer.from(partsOf()["parts/telemetry-patch.s1p"].replace(/\n(\S+) /, "\n$1  "))));
    const p = path.join(dir, "tampered.zip");
    writeFileSync(p, bad);
    const r = runCli(["check", p]);
    expect(r.code).toBe(3);
    expect(r.err).toContain('TAMPERED: Entry "parts/telemetry-patch.s1p" does not match manifest.json');
  });

  it("stored verdicts that do not come out of a re-run are reported (exit 3), even with a consistent manifest", async () => {
    const files = readZipSafely(zip);
    const text = new TextDecoder().decode(files.get("results/checks.json"));
    const doc = JSON.parse(text) as { verdict: string; results: { checks: { name: string; verdict: string }[] } };
    doc.verdict = "pass";
    for (const c of doc.results.checks) c.verdict = "pass";
    const forged = new Map<string, string>();
    for (const [name, data] of files) if (name !== "manifest.json") forged.set(name, name === "results/checks.json" ? JSON.stringify(doc) : new TextDecoder().decode(data));
    const p = path.join(dir, "forged.zip");
    writeFileSync(p, await writeBundleZip(identity, forged));
    const r = runCli(["check", p]);
    expect(r.code).toBe(3);
    expect(r.out).toMatch(/DIFFERS\s+overall verdict\s+stored pass, re-run fail/);
    expect(r.out).toContain("NOT REPRODUCED");
  });

  it("re-judges with the rule set the bundle records: a loosened limit whose hash no longer matches is not reproduced (exit 3)", async () => {
    const files = readZipSafely(zip);
    const doc = JSON.parse(new TextDecoder().decode(files.get("results/checks.json"))) as ChecksDocument;
    expect(doc.rule_set.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(doc.rule_set.rules.length).toBeGreaterThan(0);
    expect(doc.rule_set.rules.every((r) => r.source === "scenario")).toBe(true); // a file read alone: its own rules
    // someone loosens a rule in checks.json (and rebuilds the manifest) to turn a verdict around
    const first = doc.rule_set.rules[0].rule as Record<string, unknown>;
    for (const key of ["min_db", "max_db", "min_return_loss_db"]) if (typeof first[key] === "number") first[key] = key === "max_db" ? 1e6 : -1e6;
    const forged = new Map<string, string>();
    for (const [name, data] of files) if (name !== "manifest.json") forged.set(name, name === "results/checks.json" ? JSON.stringify(doc) : new TextDecoder().decode(data));
    const p = path.join(dir, "loosened.zip");
    writeFileSync(p, await writeBundleZip(identity, forged));
    const r = runCli(["check", p]);
    expect(r.code).toBe(3);
    expect(r.out).toMatch(/DIFFERS\s+rule set\s+stored sha256/);
  });

  it("--help documents the exit codes of a bundle check", () => {
    const r = runCli(["check", "--help"]);
    expect(r.code).toBe(0);
    expect(r.out).toContain("portolan check <bundle.zip> [--json]");
    expect(r.out).toContain("3 tampered");
  });

  it("a file that is not a zip is bad input (exit 2) with one message", () => {
    const p = path.join(dir, "not-a.zip");
    writeFileSync(p, "just text, no zip here\n".repeat(10));
    const r = runCli(["check", p]);
    expect(r.code).toBe(2);
    expect(r.err).toContain("The file is not a zip archive");
  });
});

describe("hostile bundles are refused before use", () => {
  const manifestFor = (files: Map<string, string>) => JSON.stringify(makeManifest(identity, files));

  it("a zip bomb declaring 60 MB of zeros is refused from the central directory", () => {
    const zeros = new Uint8Array(60 * 1024 * 1024);
    const err = refusal(writeRawZip([{ name: "manifest.json", data: "{}" }, { name: "results/zeros.bin", data: zeros }]));
    expect(err.kind).toBe("too_large");
    expect(err.entry).toBe("results/zeros.bin");
    expect(err.message).toContain("past 52428800 bytes once unpacked");
  });

  it("a bomb whose header lies about its size is stopped while inflating", () => {
    const zeros = new Uint8Array(8 * 1024 * 1024);
    const err = refusal(writeRawZip([{ name: "scenario.json", data: zeros, declaredSize: 1000 }]));
    expect(err.kind).toBe("too_large");
    expect(err.message).toBe('Entry "scenario.json" inflates to more than 1000 bytes (its declared size or the bundle\'s remaining limit).');
  });

  it("an entry that would inflate more than 100:1 is refused", () => {
    const err = refusal(writeRawZip([{ name: "results/checks.csv", data: new Uint8Array(4 * 1024 * 1024) }]));
    expect(err.kind).toBe("too_large");
    expect(err.message).toMatch(/^Entry "results\/checks.csv" would inflate \d+ times .* more than 100:1 is refused\.$/);
  });

  it("more than 200 entries are refused", () => {
    const entries: RawEntry[] = Array.from({ length: 201 }, (_, i) => ({ name: `parts/p${i}.s1p`, data: "x" }));
    const err = refusal(writeRawZip(entries));
    expect(err.message).toBe("The zip has 201 entries; a bundle may have at most 200.");
  });

  it.each([
    ["../x", "its path climbs out of the bundle (..)"],
    ["parts/../../x", "its path climbs out of the bundle (..)"],
    ["/etc/x", "it is an absolute path"],
    ["parts\\x.s1p", "its name holds a backslash"],
    ["C:/x", "it starts with a drive letter"],
  ])("the entry name %s is refused", (name, why) => {
    const err = refusal(writeRawZip([{ name, data: "x" }]));
    expect(err.kind).toBe("invalid");
    expect(err.entry).toBe(name);
    expect(err.message).toBe(`Entry "${name}" is refused: ${why}.`);
  });

  it("a bundle without manifest.json is refused", () => {
    const err = refusal(writeRawZip([{ name: "scenario.json", data: "{}" }]));
    expect(err.message).toBe("The bundle has no manifest.json, so its files cannot be verified.");
  });

  it("a file the manifest does not list, or lists but lacks, is refused as tampering", () => {
    const files = new Map([["scenario.json", "{}"]]);
    const extra = refusal(writeRawZip([{ name: "manifest.json", data: manifestFor(files) }, { name: "scenario.json", data: "{}" }, { name: "parts/x.s1p", data: "!" }]));
    expect(extra).toBeInstanceOf(BundleIntegrityError);
    expect(extra.message).toBe('Entry "parts/x.s1p" is not listed in manifest.json.');
    const missing = refusal(writeRawZip([{ name: "manifest.json", data: manifestFor(new Map([...files, ["report.html", "<p>"]])) }, { name: "scenario.json", data: "{}" }]));
    expect(missing.message).toBe('manifest.json lists "report.html", which the bundle does not contain.');
  });

  it("a manifest of another format is refused naming the field", () => {
    const err = refusal(writeRawZip([{ name: "manifest.json", data: JSON.stringify({ format: "other/1" }) }]));
    expect(err.message).toMatch(/^manifest.json is not a portolan.bundle\/1 manifest: format: /);
  });

  it("a truncated zip is refused", () => {
    const err = refusal(zip.subarray(0, Math.floor(zip.length / 2)));
    expect(err.kind).toBe("invalid");
  });
});
