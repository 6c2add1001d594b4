// Touchstone writer: layouts of the Touchstone File Format Specification, Version 2.0 (IBIS Open Forum, 2009; from
// memory), round trips through the reader, and files that the reference library scikit-rf 0.15.4 reads back.
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { parseTouchstone, writeTouchstone, TouchstoneError, type DataFormat, type FrequencyUnit } from "@/engine/touchstone";
import { z0Vector } from "@/engine/renorm";
import type { SData } from "@/engine/types";
import { interleave, requireSkrf, runSkrf, type Cplx } from "../fixtures/touchstone/skrf";

const DIR = join(process.cwd(), "tests/fixtures/touchstone");
const TMP = mkdtempSync(join(tmpdir(), "portolan-touchstone-write-"));

/** Largest |a − b| / max(|b|, floor) over complex entries. */
function worstComplexError(a: Float64Array, b: Float64Array, floor: number): number {
  expect(a.length).toBe(b.length);
  let worst = 0;
  for (let i = 0; i < a.length; i += 2) {
    const err = Math.hypot(a[i] - b[i], a[i + 1] - b[i + 1]) / Math.max(Math.hypot(b[i], b[i + 1]), floor);
    if (!(err <= worst)) worst = err;
  }
  return worst;
}

function randomS(n: number, nf: number, seed: number): { frequencies: Float64Array; s: SData } {
  let x = seed;
  const rnd = () => {
    x = (x * 1103515245 + 12345) % 2147483648;
    return x / 2147483648;
  };
  const data = new Float64Array(2 * nf * n * n);
  for (let i = 0; i < data.length; i++) data[i] = (rnd() - 0.5) * 1.2;
  const frequencies = new Float64Array(nf);
  for (let k = 0; k < nf; k++) frequencies[k] = 1.234567e9 + k * 12.5e6;
  return { frequencies, s: { n, nf, data } };
}

describe("writeTouchstone() layouts", () => {
  it("writes a 1.1 2-port as N11 N21 N12 N22 on one line after '# GHz S RI R 50'", () => {
    const s: SData = { n: 2, nf: 1, data: new Float64Array([0.11, 0, 0.12, 0, 0.21, 0, 0.22, 0]) };
    const text = writeTouchstone({ frequencies: new Float64Array([2.4e9]), s, z0: 50, comments: ["made by a test"] });
    // Touchstone 2.0 spec, 1.1 rules: 2-port data order N11 N21 N12 N22 (from memory; also scikit-rf 0.15.4 reads it so)
    expect(text).toBe("! made by a test\n# GHz S RI R 50\n2.4 0.11 0 0.21 0 0.12 0 0.22 0\n");
  });

  it("wraps rows of 3 or more ports at four pairs, each row on a new line", () => {
    const { frequencies, s } = randomS(6, 2, 7);
    const lines = writeTouchstone({ frequencies, s, z0: 50 }).trimEnd().split("\n");
    // option line + 2 frequencies × 6 rows × 2 lines (4 pairs, then 2 pairs)
    expect(lines.length).toBe(1 + 2 * 6 * 2);
    expect(lines[1].trim().split(/\s+/).length).toBe(1 + 8);
    expect(lines[2].trim().split(/\s+/).length).toBe(4);
  });

  it("writes 2.0 with [Reference] when the ports' references differ, and [End]", () => {
    const { frequencies, s } = randomS(2, 3, 3);
    const text = writeTouchstone({ frequencies, s, z0: z0Vector([50, 75], 2) });
    expect(text).toMatch(/^\[Version\] 2\.0\n# GHz S RI R 50\n\[Number of Ports\] 2\n\[Two-Port Data Order\] 21_12\n\[Number of Frequencies\] 3\n\[Reference\] 50 75\n\[Network Data\]\n/);
    expect(text.endsWith("[End]\n")).toBe(true);
    const back = parseTouchstone(text, { name: "x.ts" });
    expect(Array.from(back.z0)).toEqual([50, 0, 75, 0]);
    expect(worstComplexError(back.s.data, s.data, 1e-3)).toBeLessThan(1e-11);
  });

  it("refuses what Touchstone cannot hold: complex references, per-port references in 1.1, NaN, non-increasing frequencies", () => {
    const { frequencies, s } = randomS(2, 2, 1);
    expect(() => writeTouchstone({ frequencies, s, z0: z0Vector([[50, 5], [50, 0]], 2) })).toThrow(/complex reference impedance/);
    expect(() => writeTouchstone({ frequencies, s, z0: z0Vector([50, 75], 2) }, { version: "1.1" })).toThrow(/write version 2\.0/);
    const bad = { n: 2, nf: 2, data: new Float64Array(s.data) };
    bad.data[5] = NaN;
    expect(() => writeTouchstone({ frequencies, s: bad, z0: 50 })).toThrow(TouchstoneError);
    expect(() => writeTouchstone({ frequencies: new Float64Array([2e9, 1e9]), s, z0: 50 })).toThrow(/frequencies must increase/);
  });
});

describe("round trips", () => {
  const formats: DataFormat[] = ["RI", "MA", "DB"];
  const units: FrequencyUnit[] = ["Hz", "kHz", "MHz", "GHz"];

  it("parse(write(x)) equals x within 10^(1 − digits) relative, for every format, unit, version and digits", () => {
    for (const n of [1, 2, 3, 5]) {
      const { frequencies, s } = randomS(n, 4, 11 * n);
      for (const format of formats) {
        for (const unit of units) {
          for (const version of ["1.1", "2.0"] as const) {
            for (const digits of [6, 12, 15]) {
              const text = writeTouchstone({ frequencies, s, z0: 50 }, { format, unit, version, digits });
              const back = parseTouchstone(text, { name: `x.s${n}p` });
              expect(back.version).toBe(version);
              expect(back.sourceFormat).toBe(format);
              expect(back.sourceUnit).toBe(unit);
              // frequencies are written as the shortest text of f/unit, so they come back to the last bit or one ulp
              for (let k = 0; k < frequencies.length; k++) {
                expect(Math.abs(back.frequencies[k] - frequencies[k])).toBeLessThanOrEqual(frequencies[k] * 2.3e-16);
              }
              expect(worstComplexError(back.s.data, s.data, 1e-6)).toBeLessThanOrEqual(10 ** (1 - digits));
            }
          }
        }
      }
    }
  });

  it("parse(write(x)) keeps x for arbitrary S values, zeros and tiny magnitudes included (fast-check)", () => {
    const value = fc.oneof(fc.double({ min: -2, max: 2, noNaN: true }), fc.constant(0), fc.double({ min: -1e-30, max: 1e-30, noNaN: true }));
    fc.assert(
      fc.property(fc.array(value, { minLength: 8, maxLength: 8 }), fc.constantFrom<DataFormat>("RI", "MA", "DB"), (vals, format) => {
        const s: SData = { n: 2, nf: 1, data: Float64Array.from(vals) };
        const back = parseTouchstone(writeTouchstone({ frequencies: new Float64Array([1e9]), s, z0: 50 }, { format }), { name: "p.s2p" });
        // relative to the largest entry: a 0 written as −1000 dB comes back as 1e−50
        let scale = 1e-300;
        for (let i = 0; i < 8; i += 2) scale = Math.max(scale, Math.hypot(vals[i], vals[i + 1]));
        for (let i = 0; i < 8; i += 2) {
          const err = Math.hypot(back.s.data[i] - vals[i], back.s.data[i + 1] - vals[i + 1]);
          const mag = Math.hypot(vals[i], vals[i + 1]);
          if (!(err <= 1e-11 * Math.max(mag, 1e-40 * scale) + 1e-49)) return false;
        }
        return true;
      }),
      { numRuns: 300 },
    );
  });

  it("write(parse(text)) reproduces every fixture's values to the precision printed in it", () => {
    const fixtures = ["oneport_ri_ghz.s1p", "twoport_ma_mhz.s2p", "twoport_db_khz.s2p", "twoport_ri_hz.s2p", "3port_ma.s3p", "4port_ri.s4p", "6port_db.s6p", "v2_threeport_full.s3p", "v2_fiveport_wrapped.s5p"];
    for (const file of fixtures) {
      const first = parseTouchstone(readFileSync(join(DIR, file), "utf8"), { name: file });
      const text = writeTouchstone(
        { frequencies: first.frequencies, s: first.s, z0: first.z0 },
        { format: first.sourceFormat, unit: first.sourceUnit, version: first.version },
      );
      const again = parseTouchstone(text, { name: file });
      expect(again.frequencies).toEqual(first.frequencies);
      // the fixtures print 10 significant digits (generate.py); 12 are written back
      expect(worstComplexError(again.s.data, first.s.data, 1e-9)).toBeLessThan(1e-11);
      // and, for the 1.1 files, the written numbers are those of the file, token for token, up to trailing zeros
      // (the 2.0 fixtures hold keyword arguments and free text that this token count would mix in)
      const nums = (t: string) =>
        t.split("\n").map((l) => l.split("!")[0].trim()).filter((l) => l && !l.startsWith("#") && !l.startsWith("[")).join(" ").split(/\s+/).map(Number);
      const a = nums(readFileSync(join(DIR, file), "utf8"));
      const b = nums(text);
      if (!file.startsWith("v2_")) {
        expect(b.length).toBe(a.length);
        for (let i = 0; i < a.length; i++) expect(Math.abs(b[i] - a[i])).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(a[i])));
      }
    }
  });

  it("writes files that scikit-rf 0.15.4 reads to the same S, in 1.1 and 2.0", () => {
    requireSkrf();
    const jobs: object[] = [];
    const expected: Float64Array[] = [];
    for (const [n, format, version] of [
      [1, "DB", "1.1"],
      [2, "MA", "1.1"],
      // scikit-rf 0.15.4 does not know [Two-Port Data Order], so its 2.0 check uses a 3-port
      [3, "RI", "2.0"],
      [4, "RI", "1.1"],
      [7, "MA", "1.1"],
    ] as const) {
      const { frequencies, s } = randomS(n, 5, 100 + n);
      const text = writeTouchstone({ frequencies, s, z0: 50 }, { format, version, unit: "MHz" });
      const path = join(TMP, version === "2.0" ? `w${n}.ts` : `w${n}.s${n}p`);
      writeFileSync(path, text);
      jobs.push({ kind: "read", path });
      expected.push(s.data);
    }
    const refs = runSkrf<{ f: number[]; s: Cplx }>(jobs);
    refs.forEach((r, i) => expect(worstComplexError(interleave(r.s), expected[i], 1e-6)).toBeLessThan(1e-11));
  });
});
