/**
 * Canonical JSON (engine/canonical-json.ts) against RFC 8785, JSON Canonicalization Scheme (JCS).
 * The examples of §3.2.2 (the sample object), §3.2.3 (member sorting) and the number table of
 * Appendix B are reconstructed from memory; the number strings are cross-checked below with CPython's
 * shortest round-trip repr (Debian /usr/bin/python3), the sort order with CPython's UTF-16 encoding.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { CanonicalJsonError, canonicalJson } from "@/engine/canonical-json";
import { runPythonJson } from "./reference/python";

/** A double from its IEEE 754 bit pattern (hex, as RFC 8785 Appendix B lists them). */
function fromBits(hex: string): number {
  const view = new DataView(new ArrayBuffer(8));
  view.setBigUint64(0, BigInt(`0x${hex}`));
  return view.getFloat64(0);
}

// RFC 8785 Appendix B (from memory): IEEE 754 bit pattern → canonical text. One more row of that table
// (a negative number near −3.3e−6) could not be recalled exactly and is left out.
const NUMBERS: [string, string][] = [
  ["0000000000000000", "0"],
  ["8000000000000000", "0"], // minus zero
  ["0000000000000001", "5e-324"],
  ["8000000000000001", "-5e-324"],
  ["7fefffffffffffff", "1.7976931348623157e+308"],
  ["ffefffffffffffff", "-1.7976931348623157e+308"],
  ["4340000000000000", "9007199254740992"],
  ["c340000000000000", "-9007199254740992"],
  ["4430000000000000", "295147905179352830000"],
  ["44b52d02c7e14af5", "9.999999999999997e+22"],
  ["44b52d02c7e14af6", "1e+23"],
  ["44b52d02c7e14af7", "1.0000000000000001e+23"],
  ["444b1ae4d6e2ef4e", "999999999999999700000"],
  ["444b1ae4d6e2ef4f", "999999999999999900000"],
  ["444b1ae4d6e2ef50", "1e+21"],
  ["3eb0c6f7a0b5ed8c", "9.999999999999997e-7"],
  ["3eb0c6f7a0b5ed8d", "0.000001"],
  ["41b3de4355555553", "333333333.3333332"],
  ["41b3de4355555554", "333333333.33333325"],
  ["41b3de4355555555", "333333333.3333333"],
  ["41b3de4355555556", "333333333.3333334"],
  ["41b3de4355555557", "333333333.33333343"],
  ["43143ff3c1cb0959", "1424953923781206.2"],
];

describe("canonicalJson (RFC 8785)", () => {
  it("writes the §3.2.2 sample object as the RFC prints it", () => {
    // RFC 8785 §3.2.2 input (from memory), parsed as JSON so that the escapes are the RFC's own
    const input = JSON.parse(
      '{"numbers": [333333333.33333329, 1E30, 4.50, 2e-3, 0.000000000000000000000000001], "string": "\\u20ac$\\u000F\\u000aA\'\\u0042\\u0022\\u005c\\\\\\"\\/", "literals": [null, true, false]}',
    );
    expect(canonicalJson(input)).toBe('{"literals":[null,true,false],"numbers":[333333333.3333333,1e+30,4.5,0.002,1e-27],"string":"€$\\u000f\\nA\'B\\"\\\\\\\\\\"/"}');
  });

  it("sorts members by UTF-16 code units, not code points (§3.2.3 example)", () => {
    const input = JSON.parse(
      '{"\\u20ac": "Euro Sign", "\\r": "Carriage Return", "\\ufb33": "Hebrew Letter Dalet With Dagesh", "1": "One", "\\ud83d\\ude00": "Emoji: Grinning Face", "\\u0080": "Control", "\\u00f6": "Latin Small Letter O With Diaeresis"}',
    );
    // integer-like keys ("1") come first in a JavaScript object's own order, so the text is what to compare
    const text = canonicalJson(input);
    const values = [...text.matchAll(/:"([^"]*)"/g)].map((m) => m[1]);
    expect(values).toEqual(["Carriage Return", "One", "Control", "Latin Small Letter O With Diaeresis", "Euro Sign", "Emoji: Grinning Face", "Hebrew Letter Dalet With Dagesh"]);
    // the same order from CPython: sort by the UTF-16BE bytes of each name
    const py = runPythonJson<string[]>(
      "import json, sys\nd = json.load(sys.stdin)\nprint(json.dumps([d[k] for k in sorted(d, key=lambda k: k.encode('utf-16-be'))]))",
      input,
      { numpy: false },
    );
    expect(values).toEqual(py);
  });

  it.each(NUMBERS)("writes the double with bits %s as %s (Appendix B, ECMAScript Number::toString)", (bits, text) => {
    expect(canonicalJson(fromBits(bits))).toBe(text);
    expect(canonicalJson([fromBits(bits)])).toBe(`[${text}]`);
  });

  it("agrees with CPython's shortest round-trip digits on every Appendix B number", () => {
    // Number::toString and repr() both print the shortest digit string that reads back to the same double
    const reprs = runPythonJson<string[]>(
      "import json, struct, sys\nprint(json.dumps([repr(struct.unpack('>d', bytes.fromhex(h))[0]) for h in json.load(sys.stdin)]))",
      NUMBERS.map(([bits]) => bits),
      { numpy: false },
    );
    const digits = (s: string) => {
      const m = /^-?(\d*)\.?(\d*)(?:e([+-]?\d+))?$/.exec(s.replace(/^-/, "")) as RegExpExecArray;
      const all = (m[1] + m[2]).replace(/^0+/, "");
      return all.replace(/0+$/, "") || "0";
    };
    NUMBERS.forEach(([, text], i) => expect(digits(text)).toBe(digits(reprs[i])));
  });

  it("refuses NaN and infinities, naming where they are (§3.2.2.3)", () => {
    expect(() => canonicalJson({ a: [1, NaN] })).toThrow(CanonicalJsonError);
    expect(() => canonicalJson({ a: [1, NaN] })).toThrow("$.a[1]: NaN is not a JSON number");
    expect(() => canonicalJson(fromBits("7ff0000000000000"))).toThrow("Infinity");
    expect(() => canonicalJson(-Infinity)).toThrow("-Infinity");
  });

  it("refuses strings and member names with a lone surrogate (§3.2.2.2)", () => {
    expect(() => canonicalJson({ name: "a\ud800b" })).toThrow("$.name: string holds a lone UTF-16 surrogate");
    expect(() => canonicalJson({ ["\udc00"]: 1 })).toThrow(CanonicalJsonError);
    expect(canonicalJson({ ok: "\ud83d\ude00" })).toBe('{"ok":"😀"}');
  });

  it("writes controls as \\u00xx in lower case and keeps other characters as they are (§3.2.2.2)", () => {
    expect(canonicalJson("\u0000\u001f\b\t\n\f\r\u2028é")).toBe('"\\u0000\\u001f\\b\\t\\n\\f\\r\u2028é"');
  });

  it("leaves out undefined members and writes undefined array items as null, as JSON.stringify does", () => {
    expect(canonicalJson({ b: undefined, a: [undefined, 1] })).toBe('{"a":[null,1]}');
  });

  it("gives the same text as the hashes of stored revisions were made with, for any JSON data", () => {
    // the canonicaliser revisions were hashed with before RFC 8785 was adopted (db/queries/revisions.ts
    // until 2026-12): sorted keys, JSON.stringify for everything else. On parsed JSON the two agree, so
    // stored content hashes stay valid.
    const before = (value: unknown): string => {
      if (value === null || typeof value !== "object") return JSON.stringify(value) ?? "null";
      if (Array.isArray(value)) return `[${value.map((v) => before(v === undefined ? null : v)).join(",")}]`;
      const entries = Object.entries(value as Record<string, unknown>)
        .filter(([, v]) => v !== undefined)
        .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
      return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${before(v)}`).join(",")}}`;
    };
    fc.assert(
      fc.property(fc.jsonValue(), (v) => {
        const parsed = JSON.parse(JSON.stringify(v)) as unknown;
        expect(canonicalJson(parsed)).toBe(before(parsed));
      }),
      { numRuns: 500 },
    );
  });

  it("is idempotent: canonical text parses back to data with the same canonical text", () => {
    fc.assert(
      fc.property(fc.jsonValue(), (v) => {
        const text = canonicalJson(v);
        expect(canonicalJson(JSON.parse(text))).toBe(text);
      }),
      { numRuns: 300 },
    );
  });
});
