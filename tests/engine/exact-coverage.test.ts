// Exact frequencies: the Touchstone reader converts decimal text to hertz with one correctly rounded step, and
// coverage, data points and band edges are compared with the engine's one relative tolerance (1e-12).
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { bandIndices } from "@/engine/checks/band";
import { interpolateS } from "@/engine/interp";
import { FREQUENCY_TOLERANCE, sameFrequency, withinRange } from "@/engine/scenario";
import { prepareSystem, solveScenario } from "@/engine/system";
import { parseTouchstone, writeTouchstone } from "@/engine/touchstone";
import { compareDecimal, scaleDecimal } from "@/engine/touchstone/numbers";
import type { Scenario } from "@/engine/types";

/**
 * Reference conversion by BigInt arithmetic, a route independent of Number(string): value = D · 10^E is formed as
 * an exact rational, scaled by 2^s to at least 66 significant bits, and the quotient (with a sticky bit for the
 * remainder) is rounded to 53 bits by Number(BigInt), which ECMA-262 defines as round-to-nearest-even of the
 * exact integer (§ 21.1.1.1 Number ( value ), "the Number value for ℝ(prim)"). Valid for normal results.
 */
function referenceHz(digits: string, exp10: number): number {
  const d = BigInt(digits);
  if (d === 0n) return 0;
  if (exp10 >= 0) return Number(d * 10n ** BigInt(exp10));
  const p = 10n ** BigInt(-exp10);
  // enough bits that the quotient carries ≥ 66 significant bits
  const s = Math.max(0, 66 + p.toString(2).length - d.toString(2).length);
  const num = d << BigInt(s);
  const q = num / p;
  const sticky = num % p === 0n ? 0n : 1n;
  // 2q + sticky lies on the same side of every 53-bit rounding boundary as the exact 2·D·2^s/p
  return Number(2n * q + sticky) / 2 ** (s + 1);
}

const UNIT_EXP = { Hz: 0, kHz: 3, MHz: 6, GHz: 9 } as const;
type Unit = keyof typeof UNIT_EXP;

describe("scaleDecimal() and the reader's frequencies", () => {
  it("reads the everyday values that a product gets wrong to the plan's own doubles", () => {
    // The issue's list: 2.01, 2.03, 2.11, 4.1 GHz land one ulp low and 1.07, 2.14 GHz one ulp high as x · 1e9
    // (IEEE 754 double products, checked here so that the test shows why it exists).
    const cases: [string, number][] = [["2.01", 2.01e9], ["2.03", 2.03e9], ["2.11", 2.11e9], ["4.1", 4.1e9], ["1.07", 1.07e9], ["2.14", 2.14e9]];
    for (const [text, hz] of cases) {
      expect(Number(text) * 1e9).not.toBe(hz);
      expect(scaleDecimal(text, 9)).toBe(hz);
      const t = parseTouchstone(`# GHz S RI R 50\n${text} 0.1 0\n`, { name: "p.s1p" });
      expect(t.frequencies[0]).toBe(hz);
    }
  });

  it("round-trips every decimal of up to 17 significant digits in Hz, kHz, MHz and GHz to the correctly rounded hertz value", () => {
    const unit = fc.constantFrom<Unit>("Hz", "kHz", "MHz", "GHz");
    const digits = fc
      .tuple(fc.integer({ min: 1, max: 9 }), fc.array(fc.integer({ min: 0, max: 9 }), { minLength: 0, maxLength: 16 }))
      .map(([lead, rest]) => `${lead}${rest.join("")}`);
    // written as digits with a point somewhere, or in exponent form; values from about 1e-3 Hz to 1e15 Hz
    const form = fc.record({ digits, point: fc.integer({ min: 0, max: 17 }), exp: fc.integer({ min: -12, max: 6 }), expForm: fc.boolean(), unit });
    fc.assert(
      fc.property(form, ({ digits: ds, point, exp, expForm, unit: u }) => {
        const p = Math.min(point, ds.length);
        // the decimal's value is ds · 10^(exp − (ds.length − p))
        const intPart = ds.slice(0, p) || "0";
        const frac = ds.slice(p);
        const text = expForm ? `${intPart}${frac ? `.${frac}` : ""}e${exp}` : shiftText(ds, p, exp);
        const exact = referenceHz(ds, exp - frac.length + UNIT_EXP[u]);
        expect(scaleDecimal(text, UNIT_EXP[u])).toBe(exact);
        const t = parseTouchstone(`# ${u} S RI R 50\n${text} 0.5 0\n`, { name: "p.s1p" });
        expect(t.frequencies[0]).toBe(exact);
      }),
      { numRuns: 3000 },
    );
  });

  it("reads back, in every unit, exactly the frequencies that Portolan itself wrote", () => {
    // writeTouchstone prints the shortest text that reads back to the same double in the chosen unit.
    const plan = Float64Array.from([2.01e9, 2.03e9, 2.11e9, 4.1e9, 4.100000001e9, 12.345678901e9]);
    const s = { n: 1, nf: plan.length, data: new Float64Array(2 * plan.length).fill(0.1) };
    for (const unit of ["Hz", "kHz", "MHz", "GHz"] as const) {
      const t = parseTouchstone(writeTouchstone({ frequencies: plan, s, z0: 50 }, { unit }), { name: "w.s1p" });
      expect(Array.from(t.frequencies)).toEqual(Array.from(plan));
    }
  });

  it("compareDecimal() orders texts exactly, beyond what doubles tell apart", () => {
    expect(compareDecimal("1.00000000000000002", "1.00000000000000001")).toBe(1);
    expect(compareDecimal("2.50", "25e-1")).toBe(0);
    expect(compareDecimal("0.19", "0.2")).toBe(-1);
    expect(compareDecimal("-3", "-2.9999")).toBe(-1);
    expect(compareDecimal("0.0", "-0")).toBe(0);
    expect(compareDecimal("100", "99.9999999999999999999")).toBe(1);
  });
});

/** ds with the point after p digits, times 10^exp, written without an exponent. */
function shiftText(ds: string, p: number, exp: number): string {
  const at = p + exp;
  if (at <= 0) return `0.${"0".repeat(-at)}${ds}`;
  if (at >= ds.length) return ds + "0".repeat(at - ds.length);
  return `${ds.slice(0, at)}.${ds.slice(at)}`;
}

describe("coverage and band edges use one relative tolerance", () => {
  it("the issue's minimal case solves: plan [4.0e9, 4.1e9], part '# GHz S RI R 50' at 4.0 and 4.1", () => {
    const scenario: Scenario = {
      format: "portolan.scenario/1",
      name: "exact coverage",
      z0: 50,
      frequency: { list: [4.0e9, 4.1e9] },
      blocks: [{ id: "P", kind: "touchstone", ports: 1, data: "# GHz S RI R 50\n4.0 0.1 0\n4.1 0.1 0\n" }],
      links: [],
      ports: [{ name: "A", at: "P:1" }],
    };
    const sol = solveScenario(scenario);
    expect(Array.from(sol.s.data)).toEqual([0.1, 0, 0.1, 0]);
    expect(sol.warnings).toEqual([]);
  });

  it("a plan point a few ulps outside the data is covered and takes the edge value; 1e-11 outside is refused", () => {
    // 1e-12 relative, documented in engine/scenario/frequency-tolerance.ts
    const from = Float64Array.of(1e9, 2e9);
    const s = { n: 1, nf: 2, data: Float64Array.of(0.25, 0, 0.5, 0) };
    const r = interpolateS(s, from, Float64Array.of(1e9 * (1 - 4e-16), 2e9 * (1 + 4e-16)), { name: "P" });
    expect(Array.from(r.s.data)).toEqual([0.25, 0, 0.5, 0]);
    expect(() => interpolateS(s, from, Float64Array.of(2e9 * (1 + 1e-11)), { name: "P" })).toThrow(/plan points: 0 below, 1 above/);
  });

  it("a plan point within the tolerance of an inner data point takes that point's values exactly", () => {
    const from = Float64Array.of(1e9, 2.14e9, 3e9);
    const s = { n: 1, nf: 3, data: Float64Array.of(1, 0, 2, 0, 3, 0) };
    const r = interpolateS(s, from, Float64Array.of(2.14 * 1e9), { name: "P" });
    expect(r.s.data[0]).toBe(2);
  });

  it("band edges: a plan point one ulp outside a band is inside; 1e-11 outside is not", () => {
    const plan = Float64Array.of(2.4e9 * (1 - 2 ** -52), 2.44e9, 2.48e9 * (1 + 1e-11));
    expect(bandIndices(plan, [2.4e9, 2.48e9], "rules[0]")).toEqual([0, 1]);
  });

  it("sameFrequency() and withinRange() share the documented tolerance", () => {
    expect(FREQUENCY_TOLERANCE).toBe(1e-12);
    expect(sameFrequency(4.1e9, 4.1 * 1e9)).toBe(true);
    expect(sameFrequency(4.1e9, 4.1e9 * (1 + 2e-12))).toBe(false);
    expect(withinRange(1e9 * (1 - 5e-13), 1e9, 2e9)).toBe(true);
    expect(withinRange(2e9 * (1 + 2e-12), 1e9, 2e9)).toBe(false);
  });

  it("prepareSystem() uses part data as it is when its grid matches the plan within the tolerance", () => {
    const scenario: Scenario = {
      format: "portolan.scenario/1",
      name: "grid",
      z0: 50,
      frequency: { start: 2e9, stop: 2.2e9, points: 3 },
      blocks: [{ id: "P", kind: "touchstone", ports: 1, data: "# MHz S RI R 50\n2000 0.1 0\n2100 0.2 0\n2200 0.3 0\n" }],
      links: [],
      ports: [{ name: "A", at: "P:1" }],
    };
    const sys = prepareSystem(scenario);
    expect(Array.from(sys.blocks[0].s.data)).toEqual([0.1, 0, 0.2, 0, 0.3, 0]);
  });
});
