import { beforeAll, describe, expect, it } from "vitest";
import {
  evaluateQuantity,
  loadExpressions,
  quantityForParam,
  reevaluateExpressions,
  resolveVariables,
  validateVariableName,
} from "@/lib/browser/expressions";
import type { Scenario } from "@/engine/types";
import type { ParamInfo } from "@/engine/blocks/params";
import { readParamInput, valueToText } from "@/lib/browser/param-input";

// mathjs loads on demand (tests/unit/expressions-loading.test.ts covers the time before)
beforeAll(() => loadExpressions());

function value(text: string, q: Parameters<typeof evaluateQuantity>[1], scope?: Map<string, unknown>): number | [number, number] {
  const r = evaluateQuantity(text, q, scope);
  if (!r.ok) throw new Error(r.error);
  return r.value;
}

describe("evaluateQuantity with units", () => {
  it('reads "2.45 GHz" as 2.45e9 Hz', () => {
    // SI prefix giga = 1e9 (BIPM, SI Brochure, 9th ed., table 7)
    expect(value("2.45 GHz", "Hz")).toBeCloseTo(2.45e9, 0);
    expect(value("915 MHz", "Hz")).toBeCloseTo(915e6, 0);
  });

  it('gives 0.36 dB for "0.12 dB/m * 3 m"', () => {
    // loss per length times length (common practice): 0.12 · 3 = 0.36
    expect(value("0.12 dB/m * 3 m", "dB")).toBeCloseTo(0.36, 12);
  });

  it("converts lengths to metres and angles to degrees", () => {
    // centi = 1e-2 (SI Brochure, 9th ed., table 7); 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959)
    expect(value("30 cm", "m")).toBeCloseTo(0.3, 15);
    expect(value("1 ft", "m")).toBeCloseTo(0.3048, 15);
    // 1 rad = 180/π degrees (definition)
    expect(value("0.5 rad", "deg")).toBeCloseTo((0.5 * 180) / Math.PI, 12);
  });

  it("takes a plain number in the field's unit", () => {
    expect(value("6", "dB")).toBe(6);
    expect(value("0.25", "m")).toBe(0.25);
  });

  it("converts a power in W to dBm", () => {
    // P[dBm] = 10·log10(P / 1 mW) (common practice): 1 W = 30 dBm, 2 W ≈ 33.0103 dBm
    expect(value("1 W", "dBm")).toBeCloseTo(30, 12);
    expect(value("2 W", "dBm")).toBeCloseTo(33.0103, 4);
    expect(value("27 dBm", "dBm")).toBe(27);
  });

  it("accepts Ω and complex impedances", () => {
    expect(value("1 kΩ", "ohm")).toBeCloseTo(1000, 9);
    expect(value("25 - 10i", "impedance")).toEqual([25, -10]);
    expect(value("75", "impedance")).toBe(75);
    // a real impedance shows its unit, Ω (SI unit of impedance, BIPM SI Brochure 9th ed. Table 4)
    expect(evaluateQuantity("75", "impedance")).toMatchObject({ ok: true, display: "75 Ω" });
  });

  it("refuses a value in the wrong unit with a message naming what was expected", () => {
    const r = evaluateQuantity("3 m", "Hz");
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.error).toMatch(/frequency/);
    // dB and dBm are different quantities
    expect(evaluateQuantity("3 dBm", "dB").ok).toBe(false);
    // an integer field refuses fractions
    expect(evaluateQuantity("2.5", "integer").ok).toBe(false);
    expect(evaluateQuantity("", "dB").ok).toBe(false);
    expect(evaluateQuantity("2 +", "dB").ok).toBe(false);
    expect(evaluateQuantity("1/0", "dB").ok).toBe(false);
  });

  it("does not let expressions reach the parser or create units", () => {
    expect(evaluateQuantity('evaluate("1+1")', "number").ok).toBe(false);
    expect(evaluateQuantity('createUnit("foo")', "number").ok).toBe(false);
    expect(evaluateQuantity('import({})', "number").ok).toBe(false);
  });
});

describe("project variables", () => {
  it("resolves variables that use each other, in any order", () => {
    const { scope, errors } = resolveVariables({ L2: "2 * L_feed", L_feed: "35 cm", n: 3 });
    expect(errors).toEqual({});
    expect(value("L2", "m", scope)).toBeCloseTo(0.7, 12);
    expect(value("0.12 dB/m * L_feed * n", "dB", scope)).toBeCloseTo(0.126, 12);
  });

  it("reports cycles and bad names instead of looping", () => {
    const { errors } = resolveVariables({ a: "b + 1", b: "a + 1", "bad name": 1 });
    expect(Object.keys(errors).sort()).toEqual(["a", "b", "bad name"]);
    expect(validateVariableName("m")).toMatch(/unit/);
    expect(validateVariableName("L_feed")).toBeNull();
  });

  it("re-evaluates stored expressions when a variable changes", () => {
    const scenario: Scenario = {
      format: "portolan.scenario/1",
      name: "t",
      z0: 50,
      frequency: { start: 1e9, stop: 2e9, points: 3 },
      blocks: [
        { id: "CBL", kind: "line", params: { length_m: 1 }, expr: { length_m: "L_feed" }, rating_dbm: 0 } as Scenario["blocks"][number],
      ],
      links: [],
      ports: [],
      variables: { L_feed: "2.5 m" },
    };
    const { scenario: next, errors } = reevaluateExpressions(scenario);
    expect(errors).toEqual({});
    expect(next.blocks[0].params?.length_m).toBeCloseTo(2.5, 15);
    const broken = reevaluateExpressions({ ...scenario, variables: {} });
    expect(broken.errors.CBL.length_m).toMatch(/L_feed/);
    expect(broken.scenario.blocks[0].params?.length_m).toBe(1);
  });
});

describe("quantityForParam", () => {
  it("infers the quantity from the parameter name when the catalogue gives no unit", () => {
    expect(quantityForParam("loss_db_per_m")).toBe("dB/m");
    expect(quantityForParam("loss_db")).toBe("dB");
    expect(quantityForParam("cutoff_hz")).toBe("Hz");
    expect(quantityForParam("length_m")).toBe("m");
    expect(quantityForParam("phase_deg")).toBe("deg");
    expect(quantityForParam("impedance")).toBe("impedance");
    expect(quantityForParam("order")).toBe("integer");
    expect(quantityForParam("velocity_factor")).toBe("number");
  });
});

describe("readParamInput with catalogue rules", () => {
  // Parameter declarations as engine/blocks/catalogue.ts states them (line and switch).
  const length: ParamInfo = { name: "length_m", label: "Length", unit: "m", kind: "number", required: true, min: 0, help: "" };
  const vf: ParamInfo = { name: "velocity_factor", label: "VF", unit: "", kind: "number", required: false, min: 0, minExclusive: true, max: 1, help: "" };
  const iso: ParamInfo = { name: "isolation_db", label: "Isolation", unit: "dB", kind: "number", required: true, min: 0, infinite: true, help: "" };
  const off: ParamInfo = { name: "off_state", label: "Off", unit: "", kind: "enum", required: false, options: ["absorptive", "reflective"], help: "" };

  it("evaluates, checks the range and leaves optional empty fields out", () => {
    expect(readParamInput(length, "35 cm", new Map())).toMatchObject({ ok: true, value: 0.35 });
    expect(readParamInput(length, "-1 m", new Map()).ok).toBe(false);
    expect(readParamInput(length, "", new Map()).ok).toBe(false);
    expect(readParamInput(vf, "", new Map())).toMatchObject({ ok: true, value: undefined });
    expect(readParamInput(vf, "1.2", new Map()).ok).toBe(false);
    expect(readParamInput(vf, "0", new Map()).ok).toBe(false);
  });

  it("accepts ∞ only where the catalogue allows it, and enum options only", () => {
    expect(readParamInput(iso, "∞", new Map())).toMatchObject({ ok: true, value: null });
    expect(readParamInput(length, "inf", new Map()).ok).toBe(false);
    expect(readParamInput(off, "reflective", new Map())).toMatchObject({ ok: true, value: "reflective" });
    expect(readParamInput(off, "open", new Map()).ok).toBe(false);
  });

  it("round-trips stored values to field text", () => {
    expect(valueToText([25, -10])).toBe("25 - 10i");
    expect(readParamInput({ ...length, name: "impedance", kind: "complex", unit: "Ω", min: 0 }, valueToText([25, -10]), new Map())).toMatchObject({ value: [25, -10] });
    expect(valueToText(null)).toBe("∞");
  });
});
