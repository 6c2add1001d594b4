// Interpolation of part data onto a frequency plan: linear in real and imaginary parts, as the reference library
// scikit-rf 0.15.4 does by default (Network.interpolate, coords='cart', scipy interp1d kind='linear').
import { join } from "node:path";
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { interpolateS } from "@/engine/interp";
import { formatCheckTable } from "@/engine/checks/cli-check";
import { runAllChecks } from "@/engine/checks/run-all";
import { solveSystem } from "@/engine/network";
import { prepareSystem } from "@/engine/system";
import { parseTouchstone } from "@/engine/touchstone";
import { EngineInputError, type SData } from "@/engine/types";
import { interleave, requireSkrf, runSkrf, type Cplx } from "../fixtures/touchstone/skrf";

const f = (...v: number[]) => Float64Array.from(v);

/** 1-port data with S = (k + 1) + j·(k + 1)² at the k-th frequency, so that the segments have different slopes. */
function ramp(freqs: Float64Array): SData {
  const data = new Float64Array(2 * freqs.length);
  for (let k = 0; k < freqs.length; k++) {
    data[2 * k] = k + 1;
    data[2 * k + 1] = (k + 1) ** 2;
  }
  return { n: 1, nf: freqs.length, data };
}

describe("interpolateS()", () => {
  const from = f(1e9, 1.5e9, 2.5e9, 4e9);
  const s = ramp(from);

  it("returns the data exactly at the data frequencies", () => {
    const r = interpolateS(s, from, from, { name: "ANT" });
    expect(r.s.data).toEqual(s.data);
    expect(r.extrapolated).toEqual({ below: 0, above: 0 });
  });

  it("is linear between neighbours: (1 − w)·S(f0) + w·S(f1), w = (f − f0)/(f1 − f0) (common practice)", () => {
    const r = interpolateS(s, from, f(1.25e9, 2e9, 3.5e9), { name: "ANT" });
    // 1.25 GHz: halfway between points 1 and 2 → (1.5, 2.5); 2 GHz: halfway between 2 and 3 → (2.5, 6.5);
    // 3.5 GHz: two thirds from 3 to 4 → (3 + 2/3, 9 + 7·2/3)
    expect(r.s.data[0]).toBeCloseTo(1.5, 15);
    expect(r.s.data[1]).toBeCloseTo(2.5, 15);
    expect(r.s.data[2]).toBeCloseTo(2.5, 15);
    expect(r.s.data[3]).toBeCloseTo(6.5, 15);
    expect(r.s.data[4]).toBeCloseTo(3 + 2 / 3, 14);
    expect(r.s.data[5]).toBeCloseTo(9 + 14 / 3, 14);
  });

  it("handles plans that step back (binary search) with the same values as sorted plans", () => {
    const plan = f(3.9e9, 1.1e9, 2.6e9, 1e9, 4e9, 1.7e9);
    const sorted = Float64Array.from(plan).sort();
    const a = interpolateS(s, from, plan, { name: "P" }).s.data;
    const b = interpolateS(s, from, sorted, { name: "P" }).s.data;
    for (let i = 0; i < plan.length; i++) {
      const j = sorted.indexOf(plan[i]);
      expect([a[2 * i], a[2 * i + 1]]).toEqual([b[2 * j], b[2 * j + 1]]);
    }
  });

  it("refuses plan points outside the data, naming the part, the plan range and the data range", () => {
    let err: unknown;
    try {
      interpolateS(s, from, f(0.8e9, 2e9, 4.5e9, 5e9), { name: "LNA-2" });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(EngineInputError);
    const msg = (err as Error).message;
    expect(msg).toContain("LNA-2");
    expect(msg).toContain("800 MHz to 5 GHz");
    expect(msg).toContain("1 GHz to 4 GHz");
    expect(msg).toContain("plan points: 1 below, 2 above");
    expect(() => interpolateS(s, from, f(4.5e9), { name: "X", extrapolate: "error" })).toThrow(EngineInputError);
  });

  it("holds the edge values when asked and counts the held points, so that the caller can warn", () => {
    const r = interpolateS(s, from, f(0.5e9, 0.9e9, 2e9, 4.1e9, 9e9, 10e9), { name: "ANT", extrapolate: "hold" });
    expect(r.extrapolated).toEqual({ below: 2, above: 3 });
    expect(Array.from(r.s.data.subarray(0, 4))).toEqual([1, 1, 1, 1]);
    expect(Array.from(r.s.data.subarray(6, 12))).toEqual([4, 16, 4, 16, 4, 16]);
  });

  it("works on n-ports entry by entry and on one-point data (held)", () => {
    const two: SData = { n: 2, nf: 2, data: f(0, 0, 1, 0, 1, 0, 0, 0, 0.2, 0, 0.5, -0.5, 0.5, -0.5, 0.2, 0) };
    const r = interpolateS(two, f(1, 3), f(2), { name: "T" });
    expect(Array.from(r.s.data)).toEqual([0.1, 0, 0.75, -0.25, 0.75, -0.25, 0.1, 0]);
    const one = interpolateS(ramp(f(5)), f(5), f(4, 5, 6), { name: "ONE", extrapolate: "hold" });
    expect(Array.from(one.s.data)).toEqual([1, 1, 1, 1, 1, 1]);
    expect(one.extrapolated).toEqual({ below: 1, above: 1 });
  });

  it("refuses data whose frequencies do not increase", () => {
    expect(() => interpolateS(ramp(f(1, 1)), f(1, 1), f(1), { name: "BAD" })).toThrow(/strictly increasing/);
  });

  it("costs O(nf + m): 200 000 plan points over 100 000 data points of a 4-port in a few seconds at most", () => {
    const nf = 100_000;
    const from = new Float64Array(nf);
    for (let k = 0; k < nf; k++) from[k] = 1e9 + k * 1e4;
    const s: SData = { n: 4, nf, data: new Float64Array(2 * 16 * nf).fill(0.25) };
    const plan = new Float64Array(200_000);
    for (let i = 0; i < plan.length; i++) plan[i] = 1e9 + i * 4.99e3;
    const t0 = performance.now();
    interpolateS(s, from, plan, { name: "BIG" });
    // a quadratic search would take minutes here; the bound leaves room for a busy shared machine
    expect(performance.now() - t0).toBeLessThan(5000);
  });

  it("matches scikit-rf 0.15.4 Network.interpolate (linear, cartesian) on a 4-port fixture to 1e-12", () => {
    requireSkrf();
    const path = join(process.cwd(), "tests/fixtures/touchstone/4port_ri.s4p");
    const t = parseTouchstone(readFileSync(path, "utf8"), { name: "4port_ri.s4p" });
    const lo = t.frequencies[0];
    const hi = t.frequencies[t.frequencies.length - 1];
    const plan = new Float64Array(37);
    for (let i = 0; i < plan.length; i++) plan[i] = lo + ((hi - lo) * i) / (plan.length - 1);
    const [ref] = runSkrf<{ f: number[]; s: Cplx }>([{ kind: "interp", path, f: Array.from(plan) }]);
    const got = interpolateS(t.s, t.frequencies, plan, { name: "4port" }).s.data;
    const want = interleave(ref.s);
    let worst = 0;
    for (let i = 0; i < got.length; i++) worst = Math.max(worst, Math.abs(got[i] - want[i]));
    expect(worst).toBeLessThan(1e-12);
  });
});

describe("the note beside interpolated part data", () => {
  const scenario = (data: string, plan: number[]) => ({
    format: "portolan.scenario/1" as const,
    name: "note",
    z0: 50,
    frequency: { list: plan },
    blocks: [{ id: "ANT", kind: "touchstone" as const, ports: 1, data }],
    links: [],
    ports: [{ name: "A", at: "ANT:1" }],
  });

  it("states the method (linear in re/im, after renormalising to the system Z0) and how many plan points it touched", () => {
    const sys = prepareSystem(scenario("# GHz S RI R 75\n1 0.2 0\n2 0.4 0\n", [1e9, 1.25e9, 1.5e9, 2e9]));
    expect(sys.notes).toEqual([
      "block ANT: part data interpolated onto 2 of 4 plan points, linearly in real and imaginary parts, after renormalising its data from 75 Ω to the system Z0 (50 Ω)",
    ]);
    expect(sys.warnings).toEqual([]);
    const same = prepareSystem(scenario("# GHz S RI R 50\n1 0.2 0\n2 0.4 0\n", [1.5e9]));
    expect(same.notes).toEqual(["block ANT: part data interpolated onto 1 of 1 plan points, linearly in real and imaginary parts, its data is already referenced to the system Z0 (50 Ω)"]);
  });

  it("is absent when every plan point is a data point (within the 1e-12 frequency tolerance)", () => {
    expect(prepareSystem(scenario("# GHz S RI R 50\n1 0.2 0\n2.14 0.3 0\n3 0.4 0\n", [2.14 * 1e9, 3e9])).notes).toEqual([]);
  });

  it("is printed by portolan check under Notes", () => {
    const sc = scenario("# GHz S RI R 50\n1 0.2 0\n2 0.4 0\n", [1.5e9]);
    const sys = prepareSystem(sc);
    const table = formatCheckTable(runAllChecks(sc, sys, solveSystem(sys)));
    expect(table).toMatch(/\nNotes:\n {2}block ANT: part data interpolated onto 1 of 1 plan points, linearly in real and imaginary parts/);
  });
});
