// Line-up along a path (engine/lineup): cascade gain, noise figure, compression and intercept points on
// matched stages against hand values (common practice), and the actual waves on a mismatched chain.
import { describe, expect, it } from "vitest";
import { computeBundleResults } from "@/engine/bundle";
import { renderReportHtml } from "@/lib/server/bundle/report-html";
import { driveCheck, evaluateRules, lineup, noiseFigure, prepareSystem, runAllChecks, solveSystem, stateSweep, systemNoise, type Scenario } from "@/engine";

const lin = (d: number): number => 10 ** (d / 10);

function chain(extra: Partial<Scenario> = {}, a1: Record<string, unknown> = {}): Scenario {
  return {
    format: "portolan.scenario/1",
    name: "line-up",
    z0: 50,
    frequency: { list: [1e9, 1.5e9, 2e9] },
    blocks: [
      { id: "A1", kind: "amplifier", params: { gain_db: 15, reverse_isolation_db: null, noise_figure_db: 1.5, ...a1 }, oip3_dbm: 30, p1db_out_dbm: 18 },
      { id: "PAD", kind: "attenuator", params: { loss_db: 3 } },
      { id: "A2", kind: "amplifier", params: { gain_db: 20, reverse_isolation_db: null, noise_figure_db: 6 }, oip3_dbm: 35, p1db_out_dbm: 24 },
    ],
    links: [
      ["A1:2", "PAD:1"],
      ["PAD:2", "A2:1"],
    ],
    ports: [
      { name: "IN", at: "A1:1" },
      { name: "OUT", at: "A2:2" },
    ],
    ...extra,
  };
}

describe("line-up", () => {
  it("matched stages: gains, Friis noise figures, cascade OIP3/IIP3 and P1dB (hand values, common practice), levels and headroom", () => {
    const r = lineup(prepareSystem(chain()), { from: "IN", to: "OUT", inputDbm: -30 });
    expect(r.path.source).toBe("leak-trace");
    expect(r.stages.map((s) => [s.block, s.inPort, s.outPort])).toEqual([
      ["A1", 1, 2],
      ["PAD", 1, 2],
      ["A2", 1, 2],
    ]);
    const F1 = lin(1.5);
    // Friis (Pozar, Microwave Engineering, 4th ed., ch. 10, from memory): F = F1 + (F2 − 1)/G1 + (F3 − 1)/(G1·G2)
    const nfHand = [F1, F1 + (lin(3) - 1) / lin(15), F1 + (lin(3) - 1) / lin(15) + (lin(6) - 1) / lin(12)].map((f) => 10 * Math.log10(f));
    for (let k = 0; k < 3; k++) {
      expect(r.gainDb[k]).toBeCloseTo(32, 10);
      expect(r.stages.map((s) => s.gainDb[k])).toEqual([expect.closeTo(15, 10), expect.closeTo(-3, 10), expect.closeTo(20, 10)]);
      expect(r.stages.map((s) => s.cumulativeGainDb[k])).toEqual([expect.closeTo(15, 10), expect.closeTo(12, 10), expect.closeTo(32, 10)]);
      r.stages.forEach((s, x) => expect(s.cumulativeNfDb[k]).toBeCloseTo(nfHand[x], 9));
      expect(r.nfDb[k]).toBeCloseTo(nfHand[2], 9);
      // 1/OIP3 = 1/(OIP3_1·G_pad·G_2) + 1/OIP3_2 in mW: 30 dBm·(−3 dB)·(20 dB) = 47 dBm against 35 dBm → 34.7343 dBm
      expect(r.stages[0].cumulativeOip3Dbm[k]).toBeCloseTo(30, 10);
      expect(r.stages[0].cumulativeIip3Dbm[k]).toBeCloseTo(15, 10);
      expect(r.stages[1].cumulativeOip3Dbm[k]).toBeCloseTo(27, 10); // a linear pad passes the intercept through its loss
      expect(r.stages[2].cumulativeOip3Dbm[k]).toBeCloseTo(34.7343, 4);
      expect(r.stages[2].cumulativeIip3Dbm[k]).toBeCloseTo(2.7343, 4);
      // the same for P1dB: 18 dBm → 35 dBm against 24 dBm → 23.6680 dBm out, −8.3320 dBm in
      expect(r.stages[2].cumulativeOp1dbDbm[k]).toBeCloseTo(23.668, 3);
      expect(r.stages[2].cumulativeIp1dbDbm[k]).toBeCloseTo(-8.332, 3);
      expect(r.stages.map((s) => s.levelOutDbm![k])).toEqual([expect.closeTo(-15, 10), expect.closeTo(-18, 10), expect.closeTo(2, 10)]);
      expect(r.stages[2].headroomDb![k]).toBeCloseTo(22, 10);
      expect(r.stages[1].headroomDb).toBeNull();
    }
    expect(r.warnings.filter((w) => w.includes("P1dB"))).toEqual([]);
    const hot = lineup(prepareSystem(chain()), { from: "IN", to: "OUT", inputDbm: 0 });
    expect(hot.stages[2].headroomDb![0]).toBeCloseTo(-8, 10);
    expect(hot.warnings.some((w) => w.startsWith("A2: the output level passes its P1dB (24 dBm) by 8.00 dB"))).toBe(true);
  });

  it("a mismatched first stage: stage gain is the actual |b_out|²/|a_in|², the total is |S21|² of the composite, and the given path agrees with the traced one", () => {
    const sys = prepareSystem(chain({}, { output_return_loss_db: 6, input_return_loss_db: 10 }));
    const PAD2 = { ...chain(), blocks: chain().blocks.map((b) => (b.id === "PAD" ? { ...b, kind: "touchstone" as const, params: undefined, file: "pad.s2p", data: "# GHz S RI R 50\n1 0.3 0 0.7 0 0.7 0 0.3 0\n2 0.3 0 0.7 0 0.7 0 0.3 0\n" } : b)) };
    for (const s of [sys, prepareSystem(PAD2)]) {
      const sol = solveSystem(s);
      const traced = lineup(s, { from: "IN", to: "OUT" });
      const given = lineup(s, { from: "IN", to: "OUT", blocks: ["A1", "PAD", "A2"] });
      expect(given.stages.map((x) => x.block)).toEqual(traced.stages.map((x) => x.block));
      for (let k = 0; k < 3; k++) {
        const s21 = Math.hypot(sol.s.data[8 * k + 4], sol.s.data[8 * k + 5]);
        expect(traced.gainDb[k]).toBeCloseTo(20 * Math.log10(s21), 10);
        expect(traced.stages[2].cumulativeGainDb[k]).toBeCloseTo(20 * Math.log10(s21), 10);
        // the stage gains telescope along the links: their sum is the cumulative gain
        const sum = traced.stages.reduce((acc, x) => acc + x.gainDb[k], 0);
        expect(sum).toBeCloseTo(traced.stages[2].cumulativeGainDb[k], 9);
        expect(given.nfDb[k]).toBeCloseTo(traced.nfDb[k], 12);
      }
    }
    expect(() => lineup(sys, { from: "IN", to: "OUT", blocks: ["A1", "A2"] })).toThrow(/no link from A1 to A2/);
    expect(() => lineup(sys, { from: "IN", to: "OUT", blocks: ["PAD", "A2"] })).toThrow(/PAD is not connected to system port IN/);
  });

  it("the drive check warns where the outgoing level passes a block's P1dB, and only there", () => {
    const sol = solveSystem(prepareSystem(chain()));
    const cold = driveCheck(sol, { sources: [{ port: "IN", dbm: -30 }] });
    expect(cold.verdict).toBe("pass");
    expect(cold.compression.map((c) => [c.block, c.port, +c.outDbm.toFixed(9)])).toEqual([
      ["A1", 2, -15],
      ["A2", 2, 2],
    ]);
    const hot = driveCheck(sol, { sources: [{ port: "IN", dbm: 0 }] });
    expect(hot.verdict).toBe("warn");
    expect(hot.compression.find((c) => c.block === "A2")!.marginDb).toBeCloseTo(24 - 32, 9);
    expect(hot.compression.find((c) => c.block === "A1")!.marginDb).toBeCloseTo(18 - 15, 9);
    expect(hot.messages.filter((m) => m.includes("past its P1dB"))).toEqual([expect.stringMatching(/^A2:2 puts out 32\.00 dBm .* past its P1dB \(24 dBm\) by 8\.00 dB/)]);
  });

  it("rules: noise_figure, gain (min and max) and headroom on the chain, and in run-all", () => {
    const sc = chain({
      rules: [
        { kind: "noise_figure", id: "nf", from: "IN", to: "OUT", band: [1e9, 2e9], max_db: 2.5 },
        { kind: "gain", id: "g-lo", from: "IN", to: "OUT", band: [1e9, 2e9], min_db: 30 },
        { kind: "gain", id: "g-hi", from: "IN", to: "OUT", band: [1e9, 2e9], min_db: 25, max_db: 31 },
        { kind: "headroom", id: "hr", from: "IN", to: "OUT", input_dbm: -20, min_db: 10 },
      ],
    });
    const sys = prepareSystem(sc);
    const sol = solveSystem(sys);
    const [nf, gLo, gHi, hr] = evaluateRules(sol);
    const F = 10 * Math.log10(lin(1.5) + (lin(3) - 1) / lin(15) + (lin(6) - 1) / lin(12));
    expect(nf.worst).toBeCloseTo(F, 9);
    expect(nf.margin).toBeCloseTo(2.5 - F, 9);
    expect(nf.verdict).toBe("pass");
    expect([gLo.verdict, gLo.margin]).toEqual(["pass", expect.closeTo(2, 9)]);
    expect([gHi.verdict, gHi.limit, gHi.margin]).toEqual(["fail", 31, expect.closeTo(-1, 9)]);
    // −20 dBm in: A1 puts out −5 dBm (18 dBm P1dB: 23 dB), A2 12 dBm (24 dBm: 12 dB)
    expect([hr.verdict, hr.direction, hr.worst, hr.margin]).toEqual(["pass", "A2", expect.closeTo(12, 9), expect.closeTo(2, 9)]);
    const all = runAllChecks(sc, sys, sol);
    expect(all.checks.filter((c) => c.name.startsWith("rule:")).map((c) => [c.name, c.verdict])).toEqual([
      ["rule:nf", "pass"],
      ["rule:g-lo", "pass"],
      ["rule:g-hi", "fail"],
      ["rule:hr", "pass"],
    ]);
  });

  it("state sweep: a noise-figure rule follows each switch combination (against preparing each state from the scenario)", () => {
    const sw = (id: string) => ({ id, kind: "switch" as const, params: { throws: 2, insertion_loss_db: 0.5, isolation_db: 40 } });
    const sc: Scenario = {
      format: "portolan.scenario/1",
      name: "sweep",
      z0: 50,
      frequency: { list: [1e9, 2e9] },
      blocks: [sw("SW1"), { id: "PAD", kind: "attenuator", params: { loss_db: 6 } }, sw("SW2"), { id: "LNA", kind: "amplifier", params: { gain_db: 20, reverse_isolation_db: 30, noise_figure_db: 1 } }],
      links: [
        ["SW1:2", "SW2:2"],
        ["SW1:3", "PAD:1"],
        ["PAD:2", "SW2:3"],
        ["SW2:1", "LNA:1"],
      ],
      ports: [
        { name: "IN", at: "SW1:1" },
        { name: "OUT", at: "LNA:2" },
      ],
      rules: [{ kind: "noise_figure", id: "nf", from: "IN", to: "OUT", band: [1e9, 2e9], max_db: 3 }],
    };
    const sweep = stateSweep(prepareSystem(sc));
    expect(sweep.rows.map((r) => r.verdict)).toEqual(["pass", "fail", "fail", "fail"]);
    for (const row of sweep.rows) {
      const fixed = { ...sc, blocks: sc.blocks.map((b) => (b.id === "SW1" ? { ...b, state: row.states[0] } : b.id === "SW2" ? { ...b, state: row.states[1] } : b)) };
      const f = noiseFigure(systemNoise(prepareSystem(fixed)), 0, 1).map((x) => 10 * Math.log10(x));
      expect(row.cells[0].worst).toBeCloseTo(Math.max(...f), 9);
    }
    // matched absorptive switches at 290 K: 0.5 dB + 0.5 dB of loss before a 1 dB amplifier (F = L1·L2·F)
    expect(sweep.rows[0].cells[0].worst).toBeCloseTo(2, 1);
  });

  it("bundles carry the line-up of every noise, gain and headroom rule, and report.html shows it", () => {
    const sc = chain({
      rules: [
        { kind: "isolation", id: "iso", from: "IN", to: "OUT", band: [1e9, 2e9], min_db: -100 },
        { kind: "noise_figure", id: "nf", from: "IN", to: "OUT", band: [1e9, 2e9], max_db: 2.5 },
        { kind: "headroom", id: "hr", from: "IN", to: "OUT", input_dbm: -20, min_db: 10 },
      ],
    });
    const results = computeBundleResults(sc, {});
    const lineups = results.checks.lineups!;
    expect(lineups.map((l) => [l.rule, l.lineup?.inputDbm])).toEqual([
      ["nf", null],
      ["hr", -20],
    ]);
    const direct = lineup(prepareSystem(sc), { from: "IN", to: "OUT", inputDbm: -20 });
    expect(lineups[1].lineup!.nfDb).toEqual(direct.nfDb);
    expect(lineups[1].lineup!.stages[2].headroomDb).toEqual(direct.stages[2].headroomDb);
    const html = renderReportHtml({
      identity: {
        app: { name: "portolan", version: "test" },
        project: { id: "p", name: "P" },
        scenario: { id: "s", name: sc.name },
        revision: { id: "r", number: 1, content_hash: "0".repeat(64) },
        created_at: "2026-12-04T00:00:00Z",
        created_by: null,
      } as unknown as Parameters<typeof renderReportHtml>[0]["identity"],
      results,
      files: [],
    });
    expect(html).toContain("<h2>Line-ups of the noise, gain and headroom rules</h2>");
    expect(html).toContain("<h3>hr: IN → OUT</h3>");
    expect(html).toMatch(/Path: <span class="mono">A1 1→2 → PAD 1→2 → A2 1→2<\/span>; figures at 1\.5 GHz for −?-?20\.00 dBm in/);
    // no such rules: no section, and checks.json keeps its earlier shape
    const plain = computeBundleResults(chain(), {});
    expect("lineups" in plain.checks).toBe(false);
  });
});
