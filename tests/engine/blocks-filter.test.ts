import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { evaluateBlock, lowpassPrototype, filterSParameters } from "@/engine/blocks";
import { EngineInputError, type BlockSpec } from "@/engine/types";
import { abs, entry, reciprocityError, unitarityError } from "./blocks-helpers";

const filter = (params: Record<string, unknown>, freqs: Float64Array) =>
  evaluateBlock({ id: "F1", kind: "filter", params } as BlockSpec, freqs, 50);

/** Chebyshev polynomial T_N(x) for real x (common practice: cos(N acos x) inside, cosh(N acosh |x|) outside) */
function chebyshevT(n: number, x: number): number {
  if (Math.abs(x) <= 1) return Math.cos(n * Math.acos(x));
  const v = Math.cosh(n * Math.acosh(Math.abs(x)));
  return x < 0 && n % 2 === 1 ? -v : v;
}

/**
 * Power loss ratio of the prototypes at prototype frequency Ω (Pozar, Microwave Engineering, 4th ed.,
 * sec. 8.3: maximally flat P_LR = 1 + Ω^(2N); equal ripple P_LR = 1 + k² T_N²(Ω), k² = 10^(ripple/10) − 1).
 */
function powerLossRatio(family: "butterworth" | "chebyshev", n: number, rippleDb: number, w: number): number {
  if (family === "butterworth") return 1 + Math.pow(w, 2 * n);
  const k2 = Math.pow(10, rippleDb / 10) - 1;
  return 1 + k2 * chebyshevT(n, w) ** 2;
}

describe("lowpassPrototype()", () => {
  it("Butterworth g-values match Pozar 4th ed. Table 8.3 (maximally flat, g0 = 1, ωc = 1; values from memory)", () => {
    const table: Record<number, number[]> = {
      1: [2.0, 1.0],
      2: [1.4142, 1.4142, 1.0],
      3: [1.0, 2.0, 1.0, 1.0],
      4: [0.7654, 1.8478, 1.8478, 0.7654, 1.0],
      5: [0.618, 1.618, 2.0, 1.618, 0.618, 1.0],
      6: [0.5176, 1.4142, 1.9318, 1.9318, 1.4142, 0.5176, 1.0],
    };
    for (const [n, gs] of Object.entries(table)) {
      const g = lowpassPrototype("butterworth", Number(n));
      expect(g[0]).toBe(1);
      // tables print 4 decimals (some truncated rather than rounded): within 1e-4
      gs.forEach((v, k) => expect(Math.abs(g[k + 1] - v)).toBeLessThanOrEqual(1e-4));
    }
  });

  it("Chebyshev 0.5 dB and 3 dB g-values match Pozar 4th ed. Table 8.4 / Matthaei, Young and Jones (1964) Table 4.05-2 (values from memory)", () => {
    // The published tables were computed with 17.37 for 40/ln 10 and rounded to 4 decimals, hence 5e-4 relative.
    const half: Record<number, number[]> = {
      1: [0.6986, 1.0],
      2: [1.4029, 0.7071, 1.9841],
      3: [1.5963, 1.0967, 1.5963, 1.0],
      4: [1.6703, 1.1926, 2.3661, 0.8419, 1.9841],
      5: [1.7058, 1.2296, 2.5408, 1.2296, 1.7058, 1.0],
    };
    const three: Record<number, number[]> = {
      1: [1.9953, 1.0],
      2: [3.1013, 0.5339, 5.8095],
      3: [3.3487, 0.7117, 3.3487, 1.0],
      4: [3.4389, 0.7483, 4.3471, 0.592, 5.8095],
      5: [3.4817, 0.7618, 4.5381, 0.7618, 3.4817, 1.0],
    };
    for (const [ripple, table] of [
      [0.5, half],
      [3, three],
    ] as const) {
      for (const [n, gs] of Object.entries(table)) {
        const g = lowpassPrototype("chebyshev", Number(n), ripple);
        gs.forEach((v, k) => expect(Math.abs(g[k + 1] - v) / v).toBeLessThan(5e-4));
      }
    }
  });

  it("refuses orders outside 1…15 and a ripple ≤ 0", () => {
    expect(() => lowpassPrototype("butterworth", 0)).toThrow(EngineInputError);
    expect(() => lowpassPrototype("butterworth", 16)).toThrow(EngineInputError);
    expect(() => lowpassPrototype("chebyshev", 3, 0)).toThrow(EngineInputError);
  });
});

describe("filter block response", () => {
  it("Butterworth low-pass is 3.01 dB down at the cutoff and follows P_LR = 1 + (f/fc)^(2N) (Pozar sec. 8.3)", () => {
    const fc = 1e9;
    const freqs = new Float64Array([0, 0.3e9, 0.9e9, 1e9, 1.1e9, 2e9, 10e9]);
    for (const order of [1, 2, 3, 5, 8]) {
      const { s } = filter({ response: "lowpass", family: "butterworth", order, cutoff_hz: fc }, freqs);
      freqs.forEach((f, k) => {
        const s21 = abs(entry(s, k, 2, 1)) ** 2;
        expect(s21).toBeCloseTo(1 / powerLossRatio("butterworth", order, 0, f / fc), 12);
      });
      expect(10 * Math.log10(abs(entry(s, 3, 2, 1)) ** 2)).toBeCloseTo(-3.0103, 4);
    }
  });

  it("Pozar Example 8.3 (from memory): a maximally flat low-pass with fc = 2 GHz needs N = 5 for ≥ 15 dB at 3 GHz", () => {
    const freqs = new Float64Array([3e9]);
    const il = (order: number) => -20 * Math.log10(abs(entry(filter({ response: "lowpass", family: "butterworth", order, cutoff_hz: 2e9 }, freqs).s, 0, 2, 1)));
    expect(il(4)).toBeLessThan(15);
    expect(il(5)).toBeGreaterThanOrEqual(15);
  });

  it("Chebyshev loss at the band edge equals ripple_db, odd and even orders, and follows 1 + k²T_N²(Ω) everywhere", () => {
    const fc = 2e9;
    for (const ripple of [0.01, 0.5, 1, 3]) {
      for (const order of [1, 2, 3, 4, 5, 6, 9]) {
        const freqs = new Float64Array([0, 0.5e9, 1.3e9, 1.9e9, fc, 2.2e9, 4e9]);
        const { s } = filter({ response: "lowpass", family: "chebyshev", order, ripple_db: ripple, cutoff_hz: fc }, freqs);
        freqs.forEach((f, k) => {
          const s21 = abs(entry(s, k, 2, 1)) ** 2;
          expect(Math.abs(s21 * powerLossRatio("chebyshev", order, ripple, f / fc) - 1)).toBeLessThan(1e-11);
        });
        expect(-10 * Math.log10(abs(entry(s, 4, 2, 1)) ** 2)).toBeCloseTo(ripple, 10);
      }
    }
  });

  it("even-order Chebyshev: the ideal transformer keeps the equal ripple with both ports at Z0 (loss at DC = ripple_db)", () => {
    const { s } = filter({ response: "lowpass", family: "chebyshev", order: 4, ripple_db: 0.5, cutoff_hz: 1e9 }, new Float64Array([0]));
    // T_N(0) = ±1 for even N: the DC loss is the full ripple (Pozar sec. 8.3)
    expect(-10 * Math.log10(abs(entry(s, 0, 2, 1)) ** 2)).toBeCloseTo(0.5, 12);
  });

  it("high-pass, band-pass and band-stop follow the frequency transformations of Pozar sec. 8.4", () => {
    const cases: { params: Record<string, unknown>; omega: (f: number) => number }[] = [
      { params: { response: "highpass", cutoff_hz: 1e9 }, omega: (f) => -1e9 / f },
      { params: { response: "bandpass", center_hz: 2.4e9, bandwidth_hz: 0.2e9 }, omega: (f) => (f / 2.4e9 - 2.4e9 / f) / (0.2 / 2.4) },
      { params: { response: "bandstop", center_hz: 2.4e9, bandwidth_hz: 0.5e9 }, omega: (f) => -(0.5 / 2.4) / (f / 2.4e9 - 2.4e9 / f) },
    ];
    const freqs = new Float64Array([0.3e9, 0.8e9, 1e9, 1.5e9, 2.2e9, 2.35e9, 2.45e9, 2.6e9, 3.5e9]);
    for (const { params, omega } of cases) {
      for (const family of ["butterworth", "chebyshev"] as const) {
        const order = 5;
        const { s } = filter({ ...params, family, order, ...(family === "chebyshev" ? { ripple_db: 1 } : {}) }, freqs);
        freqs.forEach((f, k) => {
          const s21 = abs(entry(s, k, 2, 1)) ** 2;
          expect(Math.abs(s21 * powerLossRatio(family, order, 1, omega(f)) - 1)).toBeLessThan(1e-9);
        });
        expect(unitarityError(s)).toBeLessThan(1e-12);
        expect(reciprocityError(s)).toBe(0);
      }
    }
  });

  it("band-pass edges f1, f2 (f0 = √(f1 f2), f2 − f1 = bandwidth) are 3.01 dB down for Butterworth and ripple_db down for Chebyshev", () => {
    const f0 = 2.45e9;
    const bw = 0.1e9;
    const d = bw / f0;
    const edge = Math.sqrt(1 + (d * d) / 4);
    const f1 = f0 * (edge - d / 2);
    const f2 = f0 * (edge + d / 2);
    expect(f2 - f1).toBeCloseTo(bw, 0);
    const freqs = new Float64Array([f1, f2]);
    const bwt = filter({ response: "bandpass", family: "butterworth", order: 4, center_hz: f0, bandwidth_hz: bw }, freqs).s;
    const ch = filter({ response: "bandpass", family: "chebyshev", order: 4, ripple_db: 0.2, center_hz: f0, bandwidth_hz: bw }, freqs).s;
    for (const k of [0, 1]) {
      expect(-10 * Math.log10(abs(entry(bwt, k, 2, 1)) ** 2)).toBeCloseTo(3.0103, 4);
      expect(-10 * Math.log10(abs(entry(ch, k, 2, 1)) ** 2)).toBeCloseTo(0.2, 9);
    }
  });

  it("gives the limits, not NaN, where Ω is infinite (high-pass at DC, band-stop at its centre)", () => {
    const hp = filter({ response: "highpass", family: "chebyshev", order: 4, cutoff_hz: 1e9 }, new Float64Array([0])).s;
    expect(Array.from(hp.data)).toEqual([1, 0, 0, 0, 0, 0, -1, 0]);
    const bs = filter({ response: "bandstop", family: "butterworth", order: 3, center_hz: 1e9, bandwidth_hz: 1e8 }, new Float64Array([1e9])).s;
    expect(Array.from(bs.data)).toEqual([1, 0, 0, 0, 0, 0, 1, 0]);
    // and next to it, deep in the stop band, finite numbers close to that limit
    const near0 = filterSParameters({ response: "highpass", family: "chebyshev", order: 15, rippleDb: 20, cutoffHz: 1e9 }, new Float64Array([1e-3]));
    expect(Array.from(near0.data).every(Number.isFinite)).toBe(true);
    expect(abs(entry(near0, 0, 2, 1))).toBeLessThan(1e-100);
  });

  it("is lossless and reciprocal for random designs (fast-check)", () => {
    fc.assert(
      fc.property(
        fc.constantFrom("lowpass", "highpass", "bandpass", "bandstop"),
        fc.constantFrom("butterworth", "chebyshev"),
        fc.integer({ min: 1, max: 15 }),
        fc.double({ min: 0.001, max: 20, noNaN: true }),
        fc.double({ min: 1e6, max: 1e10, noNaN: true }),
        fc.double({ min: 0.01, max: 1.5, noNaN: true }),
        (response, family, order, ripple, fx, rel) => {
          const band = response === "lowpass" || response === "highpass" ? { cutoff_hz: fx } : { center_hz: fx, bandwidth_hz: rel * fx };
          const freqs = new Float64Array(41).map((_, k) => (k / 20) * fx);
          const { s } = filter({ response, family, order, ...(family === "chebyshev" ? { ripple_db: ripple } : {}), ...band }, freqs);
          expect(unitarityError(s)).toBeLessThan(1e-9);
          expect(reciprocityError(s)).toBe(0);
        },
      ),
      { numRuns: 300 },
    );
  });

  it("requires the band parameters of its response, and warns about those that do not apply", () => {
    const f = new Float64Array([1e9]);
    expect(() => filter({ response: "lowpass", family: "butterworth", order: 3 }, f)).toThrow(/block F1, parameter cutoff_hz/);
    expect(() => filter({ response: "bandpass", family: "butterworth", order: 3, center_hz: 1e9 }, f)).toThrow(/block F1, parameter bandwidth_hz/);
    expect(() => filter({ response: "notch", family: "butterworth", order: 3, cutoff_hz: 1e9 }, f)).toThrow(/block F1, parameter response/);
    expect(() => filter({ response: "lowpass", family: "butterworth", order: 16, cutoff_hz: 1e9 }, f)).toThrow(/block F1, parameter order/);
    expect(() => filter({ response: "lowpass", family: "chebyshev", order: 3, ripple_db: 0, cutoff_hz: 1e9 }, f)).toThrow(/block F1, parameter ripple_db/);
    const { warnings } = filter({ response: "lowpass", family: "butterworth", order: 3, cutoff_hz: 1e9, center_hz: 2e9, ripple_db: 1 }, f);
    expect(warnings).toEqual([
      "block F1: parameter ripple_db is ignored for family butterworth",
      "block F1: parameter center_hz is ignored for response lowpass",
    ]);
  });
});
