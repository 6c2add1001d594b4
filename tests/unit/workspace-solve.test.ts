import { describe, expect, it } from "vitest";
import type { Scenario } from "@/engine/types";
import { parseTouchstone } from "@/engine/touchstone";
import { runSolve } from "@/lib/browser/solve";
import { writeCompositeTouchstone } from "@/engine/touchstone";
import { elementAt, groupDelay, magnitudeDb, solutionToCsv } from "@/lib/domain/results/results-math";
import { addBlock, addLink, setSystemPort } from "@/lib/browser/scenario-model";
import { scenarioForEngine } from "@/lib/domain/scenarios/for-engine";

const C0 = 299_792_458; // m/s, exact (SI Brochure, 9th ed., 2.3.1)

function base(): Scenario {
  return { format: "portolan.scenario/1", name: "Bench", z0: 50, frequency: { start: 2.3e9, stop: 2.6e9, points: 31 }, blocks: [], links: [], ports: [] };
}

function must<T extends { ok: boolean }>(r: T): Extract<T, { ok: true }> {
  if (!r.ok) throw new Error(JSON.stringify(r));
  return r as Extract<T, { ok: true }>;
}

/** TX – PAD1 – PAD2 – RX, both pads 3 dB, built with the editing model as the chart would. */
function twoPads(): Scenario {
  let s = base();
  s = addBlock(s, "attenuator", { x: 0, y: 0 }).scenario;
  s = addBlock(s, "attenuator", { x: 200, y: 0 }).scenario;
  s = must(addLink(s, "PAD1:2", "PAD2:1")).scenario;
  s = must(setSystemPort(s, "PAD1:1", { name: "TX" })).scenario;
  s = must(setSystemPort(s, "PAD2:2", { name: "RX" })).scenario;
  return s;
}

describe("runSolve (what the engine worker runs)", () => {
  it("of two 3 dB pads gives 6 dB between the system ports", () => {
    // matched attenuators in cascade add in dB (common practice): 3 + 3 = 6 dB, |S11| = 0
    const r = must(runSolve({ seq: 7, scenario: scenarioForEngine(twoPads()), parts: {} }));
    expect(r.seq).toBe(7);
    expect(r.view.ports).toEqual(["TX", "RX"]);
    const s21 = magnitudeDb(r.view.s, 1, 0);
    for (const v of s21) expect(v).toBeCloseTo(-6, 10);
    const [re, im] = elementAt(r.view.s, 0, 0, 0);
    expect(Math.hypot(re, im)).toBeLessThan(1e-12);
    expect(r.unterminated).toEqual([]);
  });

  it("gives the group delay of a line as length/(vf·c0)", () => {
    // matched line S21 = e^(−jθ), θ = 2πf·L/(vf·c0) (docs/blocks.md; Pozar, 4th ed., ch. 2) ⇒ τ = L/(vf·c0) (common practice)
    let s = base();
    s = addBlock(s, "line", { x: 0, y: 0 }).scenario;
    s = { ...s, blocks: [{ ...s.blocks[0], params: { length_m: 0.5, velocity_factor: 0.66 } }] };
    s = must(setSystemPort(s, "LINE1:1", { name: "A" })).scenario;
    s = must(setSystemPort(s, "LINE1:2", { name: "B" })).scenario;
    const r = must(runSolve({ seq: 1, scenario: scenarioForEngine(s), parts: {} }));
    const tau = groupDelay(r.view.frequencies, r.view.s, 1, 0);
    for (const t of tau) expect(t / (0.5 / (0.66 * C0))).toBeCloseTo(1, 9);
  });

  it("lists unlinked block ports as unterminated", () => {
    let s = base();
    s = addBlock(s, "attenuator", { x: 0, y: 0 }).scenario;
    s = must(setSystemPort(s, "PAD1:1", { name: "TX" })).scenario;
    const r = must(runSolve({ seq: 1, scenario: scenarioForEngine(s), parts: {} }));
    expect(r.unterminated).toEqual(["PAD1:2"]);
  });

  it("returns engine errors as messages instead of throwing", () => {
    const s = twoPads();
    const broken = { ...s, blocks: s.blocks.map((b) => (b.id === "PAD1" ? { ...b, params: { loss_db: -2 } } : b)) };
    const r = runSolve({ seq: 3, scenario: broken, parts: {} });
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.seq).toBe(3);
      expect(r.error).toMatch(/loss_db/);
      expect(r.error.startsWith("PAD1 (blocks[0]")).toBe(true);
    }
  });

  it("reads a part from the texts passed by file name", () => {
    // a 2-port with S21 = S12 = 0.5 (−6.0206 dB) given as Touchstone 1.1 RI data
    const text = "# GHz S RI R 50\n2.0 0 0 0.5 0 0.5 0 0 0\n3.0 0 0 0.5 0 0.5 0 0 0\n";
    let s = base();
    s = addBlock(s, "touchstone", { x: 0, y: 0 }, { id: "p", name: "Pad", fileName: "pad.s2p", ports: 2 }).scenario;
    const id = s.blocks[0].id;
    s = must(setSystemPort(s, `${id}:1`, { name: "IN" })).scenario;
    s = must(setSystemPort(s, `${id}:2`, { name: "OUT" })).scenario;
    const r = must(runSolve({ seq: 1, scenario: scenarioForEngine(s), parts: { "parts/pad.s2p": text } }));
    expect(magnitudeDb(r.view.s, 1, 0)[0]).toBeCloseTo(20 * Math.log10(0.5), 10);
  });
});

describe("downloads of a solved scenario", () => {
  it("writes a composite Touchstone file that reads back to the same S", () => {
    const r = must(runSolve({ seq: 1, scenario: scenarioForEngine(twoPads()), parts: {} }));
    const text = writeCompositeTouchstone(r.view, { scenarioName: "Bench" });
    const back = parseTouchstone(text, { name: "bench.s2p" });
    expect(back.ports).toBe(2);
    expect(back.frequencies.length).toBe(31);
    for (let k = 0; k < 31; k++) {
      const [a, b] = elementAt(back.s, k, 1, 0);
      const [c, d] = elementAt(r.view.s, k, 1, 0);
      expect(a).toBeCloseTo(c, 10);
      expect(b).toBeCloseTo(d, 10);
    }
  });

  it("writes per-port references (Touchstone 2.0) when system port Z0s differ", () => {
    let s = twoPads();
    s = must(setSystemPort(s, "PAD2:2", { name: "RX", z0: 75 })).scenario;
    const r = must(runSolve({ seq: 1, scenario: scenarioForEngine(s), parts: {} }));
    expect(r.view.portZ0).toEqual([50, 75]);
    const text = writeCompositeTouchstone(r.view, { scenarioName: "Bench" });
    expect(text).toMatch(/\[Version\] 2\.0/);
    expect(text).toMatch(/\[Reference\]/);
    // 50 Ω pad into a 75 Ω reference: Γ = (50 − 75)/(50 + 75) = −0.2 seen at RX (Pozar, 4th ed., eq. 2.35)
    const [re] = elementAt(r.view.s, 0, 1, 1);
    expect(re).toBeCloseTo(-0.2, 10);
  });

  it("writes the CSV with one row per plan frequency", () => {
    const r = must(runSolve({ seq: 1, scenario: scenarioForEngine(twoPads()), parts: {} }));
    const lines = solutionToCsv(r.view).trim().split("\n");
    expect(lines).toHaveLength(32);
    expect(Number(lines[1].split(",")[5])).toBeCloseTo(-6, 6);
  });
});
