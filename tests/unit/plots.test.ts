import { describe, expect, it } from "vitest";
import { niceScale, ticksWithin } from "@/lib/domain/results/ticks";
import { clipLimitToPlan, limitLinesForTrace } from "@/lib/domain/results/limit-lines";
import { markerIndexInPlan, plotToCsv, smithReadout, zoomSmith, SMITH_HOME, SMITH_MAX_ZOOM } from "@/lib/domain/results/plot-data";
import type { RuleSpec } from "@/engine/types";
import { runPythonJson } from "../engine/reference/python";

/** True when `step` is 1, 2 or 5 times a power of ten (the "nice numbers" of Heckbert, Graphics Gems, 1990). */
function isOneTwoFive(step: number): boolean {
  const p = 10 ** Math.floor(Math.log10(step) + 1e-12);
  const m = step / p;
  return [1, 2, 5].some((n) => Math.abs(m - n) < 1e-9);
}

/** Every tick a whole multiple of the step (to rounding), increasing by exactly one step. */
function expectRoundTicks(ticks: number[], step: number): void {
  for (const t of ticks) expect(Math.abs(t / step - Math.round(t / step))).toBeLessThan(1e-6);
  for (let k = 1; k < ticks.length; k++) expect(ticks[k] - ticks[k - 1]).toBeCloseTo(step, 9);
}

// Ranges a results panel meets: dB of a filter, phase, nanoseconds of delay, a plan in Hz, tiny and huge spans.
const RANGES: [number, number][] = [
  [-43.2, -3.1],
  [-180, 180],
  [0.8, 2.53],
  [2.3e9, 2.6e9],
  [1e6, 6e9],
  [-0.021, -0.0003],
  [12.5, 12.5],
  [-1e-12, 3e-12],
  [-97.3, 0],
];

describe("axis ticks at round values (Heckbert, 'Nice numbers for graph labels', Graphics Gems, 1990; common practice)", () => {
  for (const [lo, hi] of RANGES) {
    for (const max of [3, 5, 7, 10]) {
      it(`niceScale(${lo}, ${hi}, ${max}) covers the range with 1-2-5 steps and at most ${max} ticks`, () => {
        const t = niceScale(lo, hi, max);
        expect(isOneTwoFive(t.step)).toBe(true);
        expectRoundTicks(t.ticks, t.step);
        expect(t.ticks.length).toBeGreaterThanOrEqual(2);
        expect(t.ticks.length).toBeLessThanOrEqual(max);
        expect(t.min).toBeLessThanOrEqual(Math.min(lo, hi));
        expect(t.max).toBeGreaterThanOrEqual(Math.max(lo, hi));
        // loose labelling: the range widens by less than one step at each end
        if (hi > lo) {
          expect(lo - t.min).toBeLessThan(t.step + 1e-9 * Math.abs(t.step));
          expect(t.max - hi).toBeLessThan(t.step + 1e-9 * Math.abs(t.step));
        }
      });
      it(`ticksWithin(${lo}, ${hi}, ${max}) stays inside the range with 1-2-5 steps`, () => {
        const t = ticksWithin(lo, hi, max);
        expect(t.ticks.length).toBeGreaterThanOrEqual(2);
        expect(t.ticks.length).toBeLessThanOrEqual(max);
        if (hi > lo) {
          for (const v of t.ticks) {
            expect(v).toBeGreaterThanOrEqual(lo - 1e-9 * Math.abs(lo));
            expect(v).toBeLessThanOrEqual(hi + 1e-9 * Math.abs(hi));
          }
          expect(isOneTwoFive(t.step)).toBe(true);
          expectRoundTicks(t.ticks, t.step);
        }
      });
    }
  }

  it("gives the textbook labels for a dB trace", () => {
    // −43.2 … −3.1 dB in at most 6 ticks: 10 dB steps from −50 to 0 (worked by hand, 1-2-5 method)
    expect(niceScale(-43.2, -3.1, 6)).toEqual({ min: -50, max: 0, step: 10, ticks: [-50, -40, -30, -20, -10, 0] });
    // with up to 10 ticks the finer 5 dB step fits: −45 … 0
    expect(niceScale(-43.2, -3.1, 10).step).toBe(5);
  });

  it("takes the finest step that fits, so a plot does not waste its labels", () => {
    // 2.3–2.6 GHz with at most 7 ticks: 50 MHz (7 ticks: 2.30 … 2.60); 20 MHz would need 16
    const t = ticksWithin(2.3e9, 2.6e9, 7);
    expect(t.step).toBe(5e7);
    expect(t.ticks).toEqual([2.3e9, 2.35e9, 2.4e9, 2.45e9, 2.5e9, 2.55e9, 2.6e9]);
  });

  it("writes decimal ticks without binary noise", () => {
    const t = niceScale(0.1, 0.7, 8);
    expect(t.ticks).toEqual([0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7]);
  });

  it("keeps dB ticks on whole dB when asked for a least step of 1", () => {
    const t = niceScale(-0.42, -0.05, 7, 1);
    expect(t.step).toBe(1);
    expect(t.ticks).toEqual([-1, 0]);
  });
});

describe("limit lines from rules (engine/checks/rules.ts evaluateRule, docs/checks.md)", () => {
  const ports = ["TX", "RX", "ANT"];
  const TX = 0;
  const RX = 1;
  const ANT = 2;
  const iso: RuleSpec = { kind: "isolation", id: "tx-rx-iso", from: "TX", to: "RX", band: [2.4e9, 2.5e9], min_db: 45 };

  it("an isolation minimum of 45 dB is a line at −45 dB on S_RX,TX and S_TX,RX, failing above", () => {
    // isolation = −20·log10|S| ≥ 45 dB ⇔ 20·log10|S| ≤ −45 dB (definition of isolation, common practice)
    for (const pair of [[RX, TX], [TX, RX]] as [number, number][]) {
      expect(limitLinesForTrace([iso], ports, pair, "db")).toEqual([{ rule: "tx-rx-iso", kind: "isolation", band: [2.4e9, 2.5e9], db: -45, fails: "above" }]);
    }
    expect(limitLinesForTrace([{ ...iso, one_way: true }], ports, [TX, RX], "db")).toEqual([]);
    // not on other traces, nor on phase or delay
    expect(limitLinesForTrace([iso], ports, [ANT, TX], "db")).toEqual([]);
    expect(limitLinesForTrace([iso], ports, [RX, TX], "phase")).toEqual([]);
  });

  it("insertion loss at most 1.5 dB is a line at −1.5 dB on the forward trace only, failing below", () => {
    const il: RuleSpec = { kind: "insertion_loss", id: "il", from: "ANT", to: "RX", band: [2.4e9, 2.5e9], max_db: 1.5 };
    expect(limitLinesForTrace([il], ports, [RX, ANT], "db")).toEqual([{ rule: "il", kind: "insertion_loss", band: [2.4e9, 2.5e9], db: -1.5, fails: "below" }]);
    expect(limitLinesForTrace([il], ports, [ANT, RX], "db")).toEqual([]);
  });

  it("a gain window draws both edges", () => {
    const gain: RuleSpec = { kind: "gain", id: "g", from: "RX", to: "ANT", band: [1e9, 2e9], min_db: 10, max_db: 14 };
    expect(limitLinesForTrace([gain], ports, [ANT, RX], "db").map((l) => [l.db, l.fails])).toEqual([
      [10, "below"],
      [14, "above"],
    ]);
  });

  it("a match rule by VSWR 2 is a line at 20·log10(1/3) = −9.54 dB on the port's reflection", () => {
    // |Γ| = (VSWR − 1)/(VSWR + 1) = 1/3 (Pozar, 4th ed., §2.3, from memory); the stricter of RL and VSWR judges
    const match: RuleSpec = { kind: "match", id: "ant-match", port: "ANT", band: [2.4e9, 2.5e9], max_vswr: 2 };
    const [line] = limitLinesForTrace([match], ports, [ANT, ANT], "db");
    expect(line.db).toBeCloseTo(20 * Math.log10(1 / 3), 12);
    expect(line.fails).toBe("above");
    const both = limitLinesForTrace([{ ...match, min_return_loss_db: 14 }], ports, [ANT, ANT], "db");
    expect(both.map((l) => l.db)).toEqual([-14]);
    expect(limitLinesForTrace([match], ports, [TX, TX], "db")).toEqual([]);
  });

  it("names unnamed rules by their place and skips rules no trace shows", () => {
    const nf: RuleSpec = { kind: "noise_figure", from: "ANT", to: "RX", band: [2.4e9, 2.5e9], max_db: 3 };
    const unnamed: RuleSpec = { kind: "insertion_loss", from: "ANT", to: "RX", band: [2.5e9, 2.4e9], max_db: 2 };
    const lines = limitLinesForTrace([nf, unnamed], ports, [RX, ANT], "db");
    expect(lines).toEqual([{ rule: "rules[1]", kind: "insertion_loss", band: [2.4e9, 2.5e9], db: -2, fails: "below" }]);
  });

  it("clips a band to the plan, and drops one outside it", () => {
    const line = limitLinesForTrace([iso], ports, [RX, TX], "db")[0];
    expect(clipLimitToPlan(line, 2.45e9, 3e9)).toEqual({ x0: 2.45e9, x1: 2.5e9 });
    expect(clipLimitToPlan(line, 2.6e9, 3e9)).toBeNull();
  });
});

describe("plot data as CSV", () => {
  it("has the frequency in Hz and one column per trace with its unit, one row per point", () => {
    const csv = plotToCsv(Float64Array.of(2.4e9, 2.45e9), [
      { label: "S21 (TX → RX)", unit: "dB", values: Float64Array.of(-45.123456789, Number.NEGATIVE_INFINITY) },
      { label: 'S11 "in", TX', unit: "dB", values: Float64Array.of(-20, Number.NaN) },
    ]);
    const lines = csv.split("\n");
    expect(lines[0]).toBe('frequency (Hz),S21 (TX → RX) (dB),"S11 ""in"", TX (dB)"');
    // RFC 4180 §2: fields holding quotes or commas are quoted, quotes doubled
    expect(lines[1]).toBe("2400000000,-45.123457,-20");
    expect(lines[2]).toBe("2450000000,-inf,");
    expect(lines[3]).toBe("");
    expect(lines).toHaveLength(4);
  });

  it("refuses a trace whose length differs from the frequencies", () => {
    expect(() => plotToCsv([1, 2], [{ label: "x", unit: "dB", values: [1] }])).toThrow(/1 values for 2 frequencies/);
  });
});

describe("Smith chart read-out", () => {
  it("matches scikit-rf's Gamma0_2_zl for z = (1 + Γ)/(1 − Γ), Z = z·Z0", () => {
    // reference: scikit-rf 0.15.4 skrf.tlineFunctions.Gamma0_2_zl (Debian python3-scikit-rf); Pozar, 4th ed., §2.4 (from memory)
    const gammas: [number, number][] = [
      [1 / 3, 0],
      [0.2, 0.3],
      [-0.5, -0.4],
      [0, 0.99],
      [-0.999, 0],
      [0.6, -0.7],
    ];
    const z0 = 75;
    const ref = runPythonJson<[number, number][]>(
      "import json,sys\nfrom skrf.tlineFunctions import Gamma0_2_zl\ng=np.array([complex(a,b) for a,b in json.load(sys.stdin)])\nz=Gamma0_2_zl(75.0,g)\nprint(json.dumps([[float(v.real),float(v.imag)] for v in np.atleast_1d(z)]))",
      gammas,
      { skrf: true },
    );
    gammas.forEach(([re, im], k) => {
      const out = smithReadout(re, im, z0);
      expect(out.resistance).toBeCloseTo(ref[k][0], 9);
      expect(out.reactance).toBeCloseTo(ref[k][1], 9);
      expect(out.r).toBeCloseTo(ref[k][0] / z0, 12);
      expect(out.x).toBeCloseTo(ref[k][1] / z0, 12);
      expect(out.magnitude).toBeCloseTo(Math.hypot(re, im), 15);
    });
  });

  it("reads the chart's landmarks: centre matched, left short, top +j1", () => {
    // Γ = 0 → z = 1; Γ = −1 → z = 0 (short); Γ = j → z = j (Pozar, 4th ed., §2.4, from memory)
    expect(smithReadout(0, 0, 50)).toMatchObject({ magnitude: 0, r: 1, x: 0, resistance: 50, reactance: 0 });
    expect(smithReadout(-1, 0, 50)).toMatchObject({ magnitude: 1, angleDeg: 180, r: 0, resistance: 0 });
    const top = smithReadout(0, 1, 50);
    expect(top.r).toBeCloseTo(0, 15);
    expect(top.x).toBeCloseTo(1, 15);
    expect(top.angleDeg).toBe(90);
    expect(smithReadout(1, 0, 50).r).toBe(Number.POSITIVE_INFINITY);
  });

  it("zooms about the pointer, which stays where it was, within the zoom limits", () => {
    const v = zoomSmith(SMITH_HOME, 4, 0.5, 0.25);
    expect(v.zoom).toBe(4);
    // the point under the pointer keeps its place in the view: (p − c)·zoom is unchanged
    expect((0.5 - v.cx) * v.zoom).toBeCloseTo((0.5 - 0) * 1, 12);
    expect((0.25 - v.cy) * v.zoom).toBeCloseTo((0.25 - 0) * 1, 12);
    expect(zoomSmith(v, 1000).zoom).toBe(SMITH_MAX_ZOOM);
    expect(zoomSmith(v, 1e-6)).toEqual({ zoom: 1, cx: 0, cy: 0 });
  });
});

describe("markers and the frequency plan", () => {
  const plan = Float64Array.from({ length: 301 }, (_, k) => 2.3e9 + k * 1e6);
  it("reads the nearest plan point inside the plan, edges included", () => {
    expect(markerIndexInPlan(plan, 2.3e9)).toBe(0);
    expect(markerIndexInPlan(plan, 2.6e9)).toBe(300);
    expect(markerIndexInPlan(plan, 2.4504e9)).toBe(150);
    expect(markerIndexInPlan(plan, 2.4506e9)).toBe(151);
  });
  it("refuses a frequency outside the plan instead of moving it to the edge", () => {
    expect(markerIndexInPlan(plan, 2.2999e9)).toBeNull();
    expect(markerIndexInPlan(plan, 3e9)).toBeNull();
    expect(markerIndexInPlan(plan, Number.NaN)).toBeNull();
    expect(markerIndexInPlan(new Float64Array(0), 2.4e9)).toBeNull();
  });
});
