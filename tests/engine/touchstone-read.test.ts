// Touchstone reader: every dialect of the Touchstone File Format Specification, Version 2.0 (IBIS Open Forum, 2009;
// section names from memory), compared with the reference library scikit-rf 0.15.4 reading the same data.
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { parseTouchstone, type TouchstoneData } from "@/engine/touchstone";
import { interleave, requireSkrf, runSkrf, type Cplx } from "../fixtures/touchstone/skrf";

const DIR = join(process.cwd(), "tests/fixtures/touchstone");
const read = (file: string): string => readFileSync(join(DIR, file), "utf8");
const parseFixture = (file: string): TouchstoneData => parseTouchstone(read(file), { name: file });
const TMP = mkdtempSync(join(tmpdir(), "portolan-touchstone-"));

/**
 * A copy that scikit-rf 0.15.4's reader can take: it reads the option line by position (unit, parameter, format,
 * R, value) and knows only [Version], [Number of Ports], [Number of Frequencies], [Network Data] and [End], with
 * [Reference] values on one line. Only header lines change; the data lines are kept as they are.
 */
function skrfCopy(file: string, text: string): string {
  const out: string[] = [];
  let skip: "none" | "info" | "reference" | "noise" = "none";
  for (const raw of text.split("\n")) {
    const line = raw.split("!")[0].trim().toLowerCase();
    if (skip === "info") {
      if (line.startsWith("[end information]")) skip = "none";
      continue;
    }
    if (skip === "reference") {
      if (line === "" || !line.startsWith("[")) continue;
      skip = "none";
    }
    if (skip === "noise") {
      if (!line.startsWith("[end]")) continue;
      skip = "none";
    }
    if (line.startsWith("#")) {
      const t = line.slice(1).trim().split(/\s+/).filter(Boolean);
      const unit = t.find((x) => ["hz", "khz", "mhz", "ghz"].includes(x)) ?? "ghz";
      const param = t.find((x) => ["s", "y", "z"].includes(x)) ?? "s";
      const fmt = t.find((x) => ["ri", "ma", "db"].includes(x)) ?? "ma";
      const r = t.indexOf("r") >= 0 ? t[t.indexOf("r") + 1] : "50";
      out.push(`# ${unit} ${param} ${fmt} r ${r}`);
      continue;
    }
    if (line.startsWith("[begin information]")) {
      skip = "info";
      continue;
    }
    if (line.startsWith("[reference]")) {
      skip = "reference";
      continue;
    }
    if (line.startsWith("[noise data]")) {
      skip = "noise";
      continue;
    }
    if (/^\[(two-port data order|number of noise frequencies|matrix format)\]/.test(line)) continue;
    out.push(raw);
  }
  const path = join(TMP, file);
  writeFileSync(path, out.join("\n"));
  return path;
}

function expectClose(actual: Float64Array, expected: Float64Array, tol: number): void {
  expect(actual.length).toBe(expected.length);
  let worst = 0;
  for (let i = 0; i < actual.length; i++) {
    const err = Math.abs(actual[i] - expected[i]) / Math.max(1, Math.abs(expected[i]));
    if (!(err <= worst)) worst = err;
  }
  expect(worst).toBeLessThanOrEqual(tol);
}

/** Swaps S12 and S21 at every frequency of a 2-port stack. */
function transpose2(data: Float64Array): Float64Array {
  const out = new Float64Array(data);
  for (let o = 0; o < data.length; o += 8) {
    out[o + 2] = data[o + 4];
    out[o + 3] = data[o + 5];
    out[o + 4] = data[o + 2];
    out[o + 5] = data[o + 3];
  }
  return out;
}

type SkrfRead = { f: number[]; s: Cplx };

describe("parseTouchstone() against scikit-rf 0.15.4 on the same data", () => {
  const v11 = [
    "oneport_ri_ghz.s1p",
    "twoport_ma_mhz.s2p",
    "twoport_db_khz.s2p",
    "twoport_ri_hz.s2p",
    "twoport_noise.s2p",
    "defaults.s2p",
    "3port_ma.s3p",
    "4port_ri.s4p",
    "6port_db.s6p",
  ];
  const v20 = ["v2_twoport_21_12.s2p", "v2_twoport_12_21.s2p", "v2_threeport_full.s3p", "v2_fiveport_wrapped.s5p"];

  it("reads every 1.1 and 2.0 fixture like scikit-rf 0.15.4 Network(path), to 1e-12", () => {
    requireSkrf();
    const files = [...v11, ...v20];
    // scikit-rf 0.15.4 Network(path), Touchstone.get_sparameter_arrays: it treats every 2-port as N11 N21 N12 N22.
    const refs = runSkrf<SkrfRead>(files.map((f) => ({ kind: "read", path: skrfCopy(f, read(f)) })));
    files.forEach((file, idx) => {
      const t = parseFixture(file);
      const ref = refs[idx];
      expectClose(t.frequencies, Float64Array.from(ref.f), 1e-15);
      const expected = interleave(ref.s);
      // The 12_21 file holds N11 N12 N21 N22, which scikit-rf 0.15.4 ignores; it reads it transposed.
      expectClose(t.s.data, file === "v2_twoport_12_21.s2p" ? transpose2(expected) : expected, 1e-12);
    });
  });

  it("converts Y and Z data to S like scikit-rf 0.15.4 z2s / y2s (power waves, real references)", () => {
    requireSkrf();
    // 1.1: Y and Z values are normalised to R; 2.0: they are in ohms and siemens (Touchstone 2.0, option line
    // rules, from memory; the same reading as other public readers).
    const cases = [
      { file: "zparams_ri.s2p", n: 2, order: "21_12", format: "RI", param: "Z", scale: 50, z0: [50, 50], fscale: 1e9 },
      { file: "yparams_ma.s1p", n: 1, order: "21_12", format: "MA", param: "Y", scale: 1 / 75, z0: [75], fscale: 1e6 },
      { file: "v2_zparams_ri.s2p", n: 2, order: "12_21", format: "RI", param: "Z", scale: 1, z0: [50, 75], fscale: 1e9 },
    ];
    const refs = runSkrf<SkrfRead>(cases.map((c) => ({ kind: "zy", path: join(DIR, c.file), ...c })));
    cases.forEach((c, idx) => {
      const t = parseFixture(c.file);
      expect(t.sourceParameter).toBe(c.param);
      expectClose(t.frequencies, Float64Array.from(refs[idx].f), 1e-15);
      expectClose(t.s.data, interleave(refs[idx].s), 1e-12);
      expect(Array.from(t.z0).filter((_, i) => i % 2 === 0)).toEqual(c.z0);
    });
  });
});

describe("parseTouchstone() dialects", () => {
  it("reads a 1-port with comments before, between and after data lines", () => {
    const t = parseFixture("oneport_ri_ghz.s1p");
    expect(t.version).toBe("1.1");
    expect(t.ports).toBe(1);
    expect(t.s.nf).toBe(9);
    expect(t.comments).toContain("synthetic 1-port, invented values");
    expect(t.comments).toContain("trailing remark");
    expect(t.comments).toContain("a comment between data lines");
    // the first data line of the file, printed there as "1 <re> <im>"
    const first = read("oneport_ri_ghz.s1p").split("\n").find((l) => /^1 /.test(l))!.split(/\s+/).map(Number);
    expect(t.s.data[0]).toBe(first[1]);
    expect(t.s.data[1]).toBe(first[2]);
  });

  it("takes the option-line fields in any order and fills the missing ones with GHz, S, MA, R 50 (Touchstone 2.0, option line)", () => {
    const a = parseFixture("twoport_db_khz.s2p"); // "# DB kHz"
    expect([a.sourceFormat, a.sourceUnit, a.sourceParameter]).toEqual(["DB", "kHz", "S"]);
    expect(Array.from(a.z0)).toEqual([50, 0, 50, 0]);
    const b = parseFixture("twoport_ri_hz.s2p"); // "# Hz R 50 RI S"
    expect([b.sourceFormat, b.sourceUnit]).toEqual(["RI", "Hz"]);
    const c = parseFixture("defaults.s2p"); // "#"
    expect([c.sourceFormat, c.sourceUnit, c.sourceParameter]).toEqual(["MA", "GHz", "S"]);
    expect(c.frequencies[0]).toBe(2e9);
  });

  it("applies each format's definition: RI, MA (degrees) and DB (20·log10|S|, degrees)", () => {
    // Touchstone 2.0, option line: DB is 20·log10(magnitude), angles in degrees (common practice).
    const t = (fmt: string, a: number, b: number) =>
      parseTouchstone(`# GHz S ${fmt} R 50\n1 ${a} ${b}\n`, { name: "x.s1p" }).s.data;
    expect(Array.from(t("RI", 0.3, -0.4))).toEqual([0.3, -0.4]);
    const ma = t("MA", 0.5, 60);
    expect(ma[0]).toBeCloseTo(0.25, 15);
    expect(ma[1]).toBeCloseTo(0.5 * Math.sqrt(3) / 2, 15);
    const db = t("DB", -6, 90);
    expect(Math.hypot(db[0], db[1])).toBeCloseTo(10 ** (-6 / 20), 15);
    expect(db[0]).toBeCloseTo(0, 15);
  });

  it("reads a 1.1 2-port as N11 N21 N12 N22 and a 2.0 file by its [Two-Port Data Order]", () => {
    // Touchstone 2.0, [Two-Port Data Order]: 12_21 is N11 N12 N21 N22, 21_12 is N11 N21 N12 N22 (the 1.1 order).
    const line = "1 0.11 0 0.21 0 0.12 0 0.22 0";
    const s11 = parseTouchstone(`# GHz S RI R 50\n${line}\n`, { name: "a.s2p" }).s.data;
    expect([s11[0], s11[2], s11[4], s11[6]]).toEqual([0.11, 0.12, 0.21, 0.22]);
    const v2 = (order: string) =>
      parseTouchstone(
        `[Version] 2.0\n# GHz S RI R 50\n[Number of Ports] 2\n[Two-Port Data Order] ${order}\n[Number of Frequencies] 1\n[Network Data]\n${line}\n[End]\n`,
        { name: "a.ts" },
      );
    const a = v2("21_12");
    expect([a.s.data[2], a.s.data[4]]).toEqual([0.12, 0.21]);
    expect(a.twoPortOrder).toBe("21_12");
    const b = v2("12_21");
    expect([b.s.data[2], b.s.data[4]]).toEqual([0.21, 0.12]);
    expect(b.twoPortOrder).toBe("12_21");
    // and the two fixtures holding the same matrices in the two orders agree
    expect(parseFixture("v2_twoport_12_21.s2p").s.data).toEqual(parseFixture("v2_twoport_21_12.s2p").s.data);
  });

  it("fills the symmetric part of Lower and Upper matrices (Touchstone 2.0, [Matrix Format])", () => {
    const full = parseFixture("v2_threeport_full.s3p");
    expect(parseFixture("v2_threeport_lower.s3p").s.data).toEqual(full.s.data);
    expect(parseFixture("v2_threeport_upper.s3p").s.data).toEqual(full.s.data);
  });

  it("reads [Reference] values continued over several lines, one per port", () => {
    const t = parseFixture("v2_threeport_lower.s3p");
    expect(Array.from(t.z0)).toEqual([50, 0, 75, 0, 100, 0]);
    expect(t.version).toBe("2.0");
  });

  it("skips 1.1 noise data (after the frequency decreases) and 2.0 [Noise Data]", () => {
    const a = parseFixture("twoport_noise.s2p");
    expect(a.s.nf).toBe(5);
    expect(a.frequencies[4]).toBe(3e9);
    const b = parseFixture("v2_twoport_21_12.s2p");
    expect(b.s.nf).toBe(4);
  });

  it("skips a 2.0 [Begin Information] block and reads values wrapped freely across lines", () => {
    const t = parseFixture("v2_fiveport_wrapped.s5p");
    expect([t.ports, t.s.nf]).toEqual([5, 3]);
    expect(Array.from(t.frequencies)).toEqual([5e8, 7.5e8, 1e9]);
  });

  it("reads 3-, 4- and 6-port 1.1 files with rows wrapped at four pairs", () => {
    expect(parseFixture("3port_ma.s3p").s.nf).toBe(5);
    expect(parseFixture("4port_ri.s4p").s.n).toBe(4);
    const six = parseFixture("6port_db.s6p");
    expect([six.s.n, six.s.nf, six.s.data.length]).toEqual([6, 5, 2 * 5 * 36]);
  });

  it("takes the port count from the caller when the name carries none, and from R per port in a 1.1 option line", () => {
    const t = parseTouchstone("# GHz S RI R 50 75\n1 0 0 0 0 0 0 0 0\n", { ports: 2 });
    expect(Array.from(t.z0)).toEqual([50, 0, 75, 0]);
  });

  it("accepts CRLF and CR line ends and a byte-order mark", () => {
    const lf = parseTouchstone("# GHz S RI R 50\n1 0.1 0.2\n2 0.3 0.4\n", { name: "a.s1p" });
    const crlf = parseTouchstone("\uFEFF# GHz S RI R 50\r\n1 0.1 0.2\r\n2 0.3 0.4\r\n", { name: "a.s1p" });
    const cr = parseTouchstone("# GHz S RI R 50\r1 0.1 0.2\r2 0.3 0.4\r", { name: "a.s1p" });
    expect(crlf.s.data).toEqual(lf.s.data);
    expect(cr.s.data).toEqual(lf.s.data);
  });
});
