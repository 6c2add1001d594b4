// Touchstone reader on hostile and broken input: every refusal is a TouchstoneError that names the line and what
// was expected, and nothing takes more than linear time. Rules cited are those of the Touchstone File Format
// Specification, Version 2.0 (IBIS Open Forum, 2009; from memory).
import { describe, expect, it } from "vitest";
import { parseTouchstone, TouchstoneError, type ParseOptions } from "@/engine/touchstone";
import { prepareSystem } from "@/engine/system";
import { EngineInputError } from "@/engine/types";

function refusal(text: string, opts: ParseOptions): TouchstoneError {
  try {
    parseTouchstone(text, opts);
  } catch (e) {
    expect(e).toBeInstanceOf(TouchstoneError);
    return e as TouchstoneError;
  }
  throw new Error("expected a TouchstoneError, but the text was accepted");
}

function expectRefusal(text: string, name: string, line: number | null, message: RegExp, opts: ParseOptions = {}): void {
  const e = refusal(text, { name, ...opts });
  expect(e.message).toMatch(message);
  expect(e.line).toBe(line);
  expect(e.where).toBe(line === null ? name : `${name}:${line}`);
}

/** Seeded generator (Marsaglia xorshift32), so that the random inputs are the same on every run. */
function xorshift(seed: number): () => number {
  let x = seed >>> 0 || 1;
  return () => {
    x ^= x << 13;
    x >>>= 0;
    x ^= x >>> 17;
    x ^= x << 5;
    x >>>= 0;
    return x;
  };
}

const H2 = "# GHz S RI R 50\n";

describe("parseTouchstone() refuses broken data with the line and what was expected", () => {
  it("names a short 2-port line and the 9 values it needs (1.1: one line per 2-port frequency)", () => {
    expectRefusal(`${H2}1 0 0 0 0 0 0 0 0\n2 0 0 0 0 0 0 0\n`, "amp.s2p", 3, /2-port data line needs 9 values .* found 8/);
  });

  it("names a 1-port line with an extra value", () => {
    expectRefusal(`${H2}1 0.1 0.2 0.3\n`, "a.s1p", 2, /1-port data line needs 3 values .* found 4/);
  });

  it("reports a file truncated in the middle of a 3-port frequency, with the line where that frequency began", () => {
    const text = `${H2}1 0 0 0 0 0 0\n  0 0 0 0 0 0\n  0 0 0 0 0 0\n2 0 0 0 0 0 0\n  0 0 0 0 0 0\n`;
    expectRefusal(text, "x.s3p", 6, /file ends in the middle of the data of the frequency on line 5: 13 of 19 values/);
  });

  it("reports a 3-port row that lost a pair on the next line, where the following row would start mid-line", () => {
    // 1.1 rule: each matrix row of a 3-port or larger starts on a new line, so line 4 (one pair finishing row 2,
    // then two pairs of row 3) is where the lost pair shows.
    const text = `${H2}1 0 0 0 0 0 0\n  0 0 0 0\n  0 0 0 0 0 0\n2 0 0 0 0 0 0\n  0 0 0 0 0 0\n  0 0 0 0 0 0\n`;
    expectRefusal(text, "x.s3p", 4, /row 3 of the matrix of the frequency on line 2 starts in the middle of this line/);
  });

  it("accepts whole matrix rows sharing a line, and reads them into the right rows", () => {
    // A line that starts and ends on row boundaries cannot shift values between rows, so the reader accepts it
    // (some writers put a whole 4-port matrix row pair on one line); S31 must come out as written.
    const row = (r: number) => Array.from({ length: 4 }, (_, c) => `${r}${c + 1} 0`).join(" ");
    const text = `${H2}1 ${row(1)}\n${row(2)} ${row(3)}\n${row(4)}\n`;
    const t = parseTouchstone(text, { name: "x.s4p" });
    expect(t.s.data[2 * (2 * 4 + 0)]).toBe(31); // S31, row-major
    expect(t.s.data[2 * (3 * 4 + 3)]).toBe(44);
  });

  it("refuses an odd number of values on a 1.1 line of a 4-port (values come in pairs)", () => {
    expectRefusal(`${H2}1 0 0 0 0 0 0 0\n`, "x.s4p", 2, /7 values after the frequency: values come in pairs/);
  });

  it.each([
    ["NaN", /"NaN" is not a finite number/],
    ["Infinity", /"Infinity" is not a finite number/],
    ["-inf", /"-inf" is not a finite number/],
    ["1e999", /"1e999" is not a finite number/],
    ["0x10", /"0x10" is not a finite number/],
    ["1,5", /"1,5" is not a finite number/],
    ["1.2.3", /"1.2.3" is not a finite number/],
    ["--1", /"--1" is not a finite number/],
    ["1e", /"1e" is not a finite number/],
  ])("refuses the number %s with its line", (tok, msg) => {
    expectRefusal(`${H2}1 0.1 0.2\n2 ${tok} 0.2\n`, "a.s1p", 3, msg);
  });

  it("refuses frequencies that do not increase (1.1 1-port, and a 2.0 2-port where no noise rule applies)", () => {
    expectRefusal(`${H2}1 0 0\n3 0 0\n2 0 0\n`, "a.s1p", 4, /frequency 2 GHz does not increase on the previous one \(line 3\)/);
    expectRefusal(`${H2}1 0 0\n1 0 0\n`, "a.s1p", 3, /does not increase/);
    const v2 =
      "[Version] 2.0\n# GHz S RI R 50\n[Number of Ports] 2\n[Two-Port Data Order] 12_21\n[Number of Frequencies] 2\n[Network Data]\n" +
      "2 0 0 0 0 0 0 0 0\n1 0 0 0 0 0 0 0 0\n[End]\n";
    expectRefusal(v2, "a.ts", 8, /does not increase/);
  });

  it("refuses 1.1 noise lines that do not have 5 values", () => {
    expectRefusal(`${H2}1 0 0 0 0 0 0 0 0\n2 0 0 0 0 0 0 0 0\n1 1 0.5 10\n`, "a.s2p", 4, /noise data line needs 5 values/);
  });

  it("refuses a port count above maxPorts (64 by default) before reading any data", () => {
    expectRefusal(`${H2}1 0 0\n`, "big.s100000p", null, /100000 ports, more than the limit of 64 ports \(maxPorts\)/);
    expectRefusal(
      "[Version] 2.0\n# GHz S RI R 50\n[Number of Ports] 999999999\n",
      "big.ts",
      3,
      /\[Number of Ports\] gives 999999999 ports, more than the limit of 64/,
    );
    expectRefusal(`${H2}1 0 0\n`, "big.s8p", null, /limit of 4 ports/, { maxPorts: 4 });
  });

  it("refuses binary content: NUL bytes, control characters and invalid UTF-8 (U+FFFD)", () => {
    expectRefusal(`${H2}1 0 0\n2 0\u0000 0\n`, "a.s1p", 3, /binary data \(character U\+0000 at column 4\)/);
    expectRefusal(`! ok\n${H2}1 0 \uFFFD0\n`, "a.s1p", 3, /binary data \(character U\+FFFD/);
    expectRefusal(`\u0007${H2}`, "a.s1p", 1, /binary data/);
  });

  it("refuses data without an option line", () => {
    expectRefusal("! no option line\n1 0.5 0\n", "a.s1p", 2, /missing option line: expected "# <unit> <parameter> <format> R <ohms>"/);
    expectRefusal("[Version] 2.0\n[Number of Ports] 1\n[Number of Frequencies] 1\n[Network Data]\n1 0 0\n[End]\n", "a.ts", 4, /missing option line/);
  });

  it("refuses more or fewer frequencies than [Number of Frequencies] (Touchstone 2.0)", () => {
    const head = "[Version] 2.0\n# GHz S RI R 50\n[Number of Ports] 1\n[Number of Frequencies] 2\n[Network Data]\n";
    expectRefusal(`${head}1 0 0\n[End]\n`, "a.ts", 7, /\[Number of Frequencies\] on line 4 announces 2 frequencies, but 1 were found/);
    expectRefusal(`${head}1 0 0\n2 0 0\n3 0 0\n[End]\n`, "a.ts", 8, /more frequencies than the 2 announced by \[Number of Frequencies\] on line 4/);
    expectRefusal(`${head}1 0 0\n`, "a.ts", 6, /announces 2 frequencies, but 1 were found/);
  });

  it("refuses G and H data, mixed-mode data and unknown keywords clearly", () => {
    expectRefusal("# GHz H RI R 50\n1 0 0\n", "a.s1p", 1, /H-parameter data is not supported: only S, Y and Z/);
    expectRefusal("# G\n1 0 0\n", "a.s1p", 1, /G-parameter data is not supported/);
    expectRefusal(
      "[Version] 2.0\n# GHz S RI R 50\n[Number of Ports] 4\n[Number of Frequencies] 1\n[Mixed-Mode Order] D2,1 D1,1 C2,1 C1,1\n",
      "a.ts",
      5,
      /mixed-mode data \(\[Mixed-Mode Order\]\) is not supported/,
    );
    expectRefusal("[Version] 2.0\n# GHz S RI R 50\n[Number of Pins] 4\n", "a.ts", 3, /unknown keyword \[number of pins\]/);
    expectRefusal(`${H2}[Number of Ports] 1\n1 0 0\n`, "a.s1p", 2, /no "\[Version\] 2.0" line before it/);
    expectRefusal("# GHz S RI Q 50\n", "a.s1p", 1, /unknown option "Q"/);
  });

  it("needs [Two-Port Data Order] in a 2.0 2-port file, since 12_21 and 21_12 swap S12 and S21", () => {
    expectRefusal(
      "[Version] 2.0\n# GHz S RI R 50\n[Number of Ports] 2\n[Number of Frequencies] 1\n[Network Data]\n1 0 0 0 0 0 0 0 0\n[End]\n",
      "a.ts",
      5,
      /needs \[Two-Port Data Order\] 12_21 or 21_12/,
    );
  });

  it("refuses [Reference] with too few or too many values, and non-positive ones", () => {
    const head = "[Version] 2.0\n# GHz S RI R 50\n[Number of Ports] 3\n[Number of Frequencies] 1\n";
    expectRefusal(`${head}[Reference] 50 75\n[Network Data]\n`, "a.ts", 6, /\[Reference\] on line 5 needs 3 values, one per port/);
    expectRefusal(`${head}[Reference] 50 75 50 50\n`, "a.ts", 5, /more than 3 values/);
    expectRefusal(`${head}[Reference] 50 -75 50\n`, "a.ts", 5, /must be positive/);
  });

  it("says when the port count cannot be known for 1.1 data", () => {
    expectRefusal(`${H2}1 0 0\n`, "part.txt", 2, /cannot tell the port count/);
  });

  it("refuses texts above maxBytes without reading them", () => {
    expectRefusal(`${H2}1 0 0\n`.padEnd(2000, " "), "a.s1p", null, /larger than the limit of 1000 bytes/, { maxBytes: 1000 });
    // multi-byte characters count as UTF-8 bytes
    expectRefusal(`! ${"Ω".repeat(600)}\n${H2}1 0 0\n`, "a.s1p", null, /larger than the limit of 1000 bytes/, { maxBytes: 1000 });
  });
});

describe("parseTouchstone() never hangs", () => {
  it("refuses 200 000 random bytes (as Latin-1 and as UTF-8) quickly, naming a line", { timeout: 20_000 }, () => {
    const next = xorshift(12345);
    const bytes = new Uint8Array(200_000);
    for (let i = 0; i < bytes.length; i++) bytes[i] = next() & 0xff;
    for (const text of [new TextDecoder("latin1").decode(bytes), new TextDecoder("utf-8").decode(bytes)]) {
      const t0 = performance.now();
      const e = refusal(text, { name: "junk.s2p" });
      expect(e.line).toBeGreaterThanOrEqual(1);
      expect(performance.now() - t0).toBeLessThan(5000);
    }
  });

  it("refuses 200 000 random printable characters (no binary bytes) quickly, naming a line", { timeout: 20_000 }, () => {
    const next = xorshift(777);
    const alphabet = "0123456789.eE+- \t\n!#[]RISMAZYDBGHzk";
    let text = "";
    for (let i = 0; i < 200_000; i++) text += alphabet[next() % alphabet.length];
    for (const name of ["junk.s1p", "junk.s2p", "junk.s7p", "junk.ts"]) {
      const t0 = performance.now();
      const e = refusal(text, { name });
      expect(e.line).toBeGreaterThanOrEqual(1);
      expect(performance.now() - t0).toBeLessThan(5000);
    }
  });

  it("handles a single 5-million-character token and a 5-million-character line in linear time", { timeout: 30_000 }, () => {
    const t0 = performance.now();
    expectRefusal(`${H2}1 ${"1".repeat(5_000_000)}x 0\n`, "a.s1p", 2, /is not a finite number/);
    expectRefusal(`${H2}${"1 0 0 ".repeat(800_000)}\n`, "a.s1p", 2, /1-port data line needs 3 values .* found 2400000/);
    expectRefusal(`[${"[".repeat(5_000_000)}\n`, "a.ts", 1, /has no closing "\]"/);
    expect(performance.now() - t0).toBeLessThan(10_000);
  });

  it("reads a 4-port file of 20 000 frequencies (about 10 MB) in a few seconds", { timeout: 60_000 }, () => {
    const rows: string[] = [H2];
    const row = " 0.123456789012 -0.234567890123".repeat(4);
    for (let k = 1; k <= 20_000; k++) rows.push(`${k}${row}\n${row}\n${row}\n${row}\n`);
    const text = rows.join("");
    expect(text.length).toBeGreaterThan(9e6);
    const t0 = performance.now();
    const t = parseTouchstone(text, { name: "big.s4p" });
    expect(performance.now() - t0).toBeLessThan(15_000);
    expect([t.s.n, t.s.nf]).toEqual([4, 20_000]);
    expect(t.s.data[t.s.data.length - 1]).toBe(-0.234567890123);
  });
});

describe("parseTouchstone() keeps its promise of finite values and distinct frequencies", () => {
  it("refuses a dB magnitude that overflows (1 7000 0: 10^(7000/20) is beyond the largest double)", () => {
    // IEEE 754 binary64 tops out near 1.8e308, so any magnitude above about 6165 dB overflows.
    expectRefusal(`# GHz S DB R 50\n1 -3 0\n2 7000 0\n`, "amp.s1p", 3, /magnitude 7000 dB is too large: 10\^\(7000\/20\) overflows \(value 2 on the line\)/);
    // the angle position of a pair may hold any finite number of degrees
    expect(parseTouchstone(`# GHz S DB R 50\n1 -3 7000\n`, { name: "a.s1p" }).s.data.every(Number.isFinite)).toBe(true);
  });

  it("refuses a dB magnitude that overflows on a continuation line of a 3-port, naming that line", () => {
    const text = `# GHz S DB R 50\n1 -3 0 -3 0 -3 0\n-3 0 -3 0 7000 0\n-3 0 -3 0 -3 0\n`;
    expectRefusal(text, "x.s3p", 3, /magnitude 7000 dB is too large: .*\(value 5 on the line\)/);
  });

  it("refuses a frequency that overflows once scaled to hertz (1e300 GHz)", () => {
    expectRefusal(`${H2}1 0.1 0\n1e300 0.1 0\n`, "a.s1p", 3, /frequency 1e300 GHz is too large: it overflows when converted to hertz/);
  });

  it("refuses two different frequency texts that are one double in hertz, in a 1-port and in a 1.1 2-port (not read as noise)", () => {
    // "1" and "1.00000000000000001" GHz are different decimals but the same binary64 value (the spacing of doubles
    // near 1e9 is 2^-23 ≈ 1.2e-7 Hz).
    expectRefusal(`${H2}1 0.1 0\n1.00000000000000001 0.1 0\n`, "a.s1p", 3, /different texts but the same frequency once converted to hertz \(1000000000 Hz\)/);
    const two = `${H2}1 0 0 0 0 0 0 0 0\n1.00000000000000001 0 0 0 0 0 0 0 0\n`;
    expectRefusal(two, "a.s2p", 3, /different texts but the same frequency/);
    // in MHz the same pair of texts collapses only after scaling: 1000.0000000000001 MHz vs 1000 MHz
    expectRefusal(`# MHz S RI R 50\n1000 0.1 0\n1000.00000000000001 0.1 0\n`, "a.s1p", 3, /same frequency once converted to hertz/);
  });

  it("still reads a 1.1 2-port whose frequency steps back as the start of noise data", () => {
    const t = parseTouchstone(`${H2}1 0 0 0 0 0 0 0 0\n2 0 0 0 0 0 0 0 0\n1 1.5 0.5 30 0.3\n`, { name: "a.s2p" });
    expect(t.s.nf).toBe(2);
  });

  it("refuses a short matrix row followed by a long one in 1.1 files of 3 and 4 ports (value count unchanged)", () => {
    // Touchstone 1.1, 3 or more ports: each matrix row starts on a new line. Row 1 below has 2 pairs instead of 3
    // and row 2 has 4: the 19 values add up, so only the row rule can catch it.
    const three = `${H2}1 11 0 12 0\n13 0 21 0 22 0 23 0\n31 0 32 0 33 0\n`;
    expectRefusal(three, "x.s3p", 3, /row 2 of the matrix of the frequency on line 2 starts in the middle of this line/);
    // 4 ports, rows wrapped at four pairs: row 2 short (3 pairs), row 3 long (5 pairs); caught on row 3's line.
    const r = (a: number) => `${a} 0`;
    const four = `${H2}1 ${r(11)} ${r(12)} ${r(13)} ${r(14)}\n${r(21)} ${r(22)} ${r(23)}\n${r(24)} ${r(31)} ${r(32)} ${r(33)} ${r(34)}\n${r(41)} ${r(42)} ${r(43)} ${r(44)}\n`;
    expectRefusal(four, "x.s4p", 4, /row 3 of the matrix of the frequency on line 2 starts in the middle of this line/);
  });

  it("reaches a scenario as an EngineInputError with file:line", () => {
    const scenario = {
      format: "portolan.scenario/1" as const,
      name: "hostile",
      z0: 50,
      frequency: { list: [1e9] },
      blocks: [{ id: "P", kind: "touchstone" as const, file: "amp.s1p" }],
      links: [],
      ports: [{ name: "A", at: "P:1" }],
    };
    try {
      prepareSystem(scenario, { parts: { "amp.s1p": "# GHz S DB R 50\n1 7000 0\n" } });
      throw new Error("accepted");
    } catch (e) {
      expect(e).toBeInstanceOf(EngineInputError);
      expect((e as EngineInputError).where).toBe("amp.s1p:2");
    }
  });
});
