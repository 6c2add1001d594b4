// Measured active parts: a part is active when its scenario block says `active: true` or, with no flag, when its
// data shows more than 1 dB of gain. Active parts are not reported as "active although it should be passive";
// every active 2-port block and the composite between every two system ports get the stability check
// (Rollett K, Rollett 1962; |Δ|; μ and μ′, Edwards and Sinsky, IEEE T-MTT 40(12), 1992), and a potentially
// unstable one fails, so that `portolan check` exits 1.
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { main } from "@/engine/cli";
import { dataQuality } from "@/engine/checks/data-quality";
import { runAllChecks } from "@/engine/checks/run-all";
import { stabilityCheck, stabilityOfStack } from "@/engine/checks/stability";
import { solveSystem } from "@/engine/network";
import { parseScenario } from "@/engine/scenario";
import { gainActivity, prepareSystem } from "@/engine/system";
import { EngineInputError, type Scenario } from "@/engine/types";
import { rng, runPython } from "./network-helpers";

/**
 * A 2-port amplifier as a 1.1 file in RI: S11 = S22 = 0.3, S21 = 10 (20 dB), S12 = 0.218, all real, so that
 * Δ = S11·S22 − S12·S21 = 0.09 − 2.18 = −2.09 by hand: |Δ| = 2.09, and K = (1 − 0.09 − 0.09 + 2.09²)/(2·2.18)
 * = 5.1881/4.36 = 1.18993… > 1. K alone would call it stable; |Δ| > 1 makes it potentially unstable (Rollett's
 * condition needs both K > 1 and |Δ| < 1; Pozar, Microwave Engineering 4th ed., eq. 12.12–12.13).
 */
const AMP = ["! measured amplifier", "# GHz S RI R 50", ...[1, 1.5, 2].map((f) => `${f} 0.3 0 10 0 0.218 0 0.3 0`)].join("\n") + "\n";

function ampScenario(extra: Partial<Scenario["blocks"][number]> = {}): Scenario {
  return {
    format: "portolan.scenario/1",
    name: "measured amplifier",
    z0: 50,
    frequency: { start: 1e9, stop: 2e9, points: 3 },
    blocks: [
      { id: "PAD", kind: "attenuator", params: { loss_db: 1 } },
      { id: "LNA", kind: "touchstone", file: "lna.s2p", ...extra },
    ],
    links: [["PAD:2", "LNA:1"]],
    ports: [{ name: "IN", at: "PAD:1" }, { name: "OUT", at: "LNA:2" }],
  };
}
const parts = { "lna.s2p": AMP };

describe("measured active parts", () => {
  it("a part whose data shows gain is active by its data, with the reason", () => {
    const sys = prepareSystem(ampScenario(), { parts });
    const lna = sys.blocks[1];
    expect(lna.active?.source).toBe("data");
    // σmax of [[0.3, 0.218], [10, 0.3]]: numpy.linalg.svd gives 10.00919194, 20·log10 of it 20.0080 dB
    expect(lna.active?.reason).toBe("its data shows gain: largest singular value 10.009 (20.01 dB) at 1 GHz");
  });

  it("the whole data decides, as in the parts library, even where the plan covers only its passive part", () => {
    // gain (|S21| = 4, 12.04 dB) only at 3 GHz; the plan stays within 1–2 GHz where |S21| = 0.5
    const text = "# GHz S RI R 50\n1 0 0 0.5 0 0.01 0 0 0\n2 0 0 0.5 0 0.01 0 0 0\n3 0 0 4 0 0.01 0 0 0\n";
    const sys = prepareSystem(ampScenario(), { parts: { "lna.s2p": text } });
    expect(sys.blocks[1].active?.reason).toBe("its data shows gain: largest singular value 4.000 (12.04 dB) at 3 GHz");
  });

  it("is not reported as active although it should be passive, and is not expected reciprocal", () => {
    const sys = prepareSystem(ampScenario(), { parts });
    const q = dataQuality(solveSystem(sys));
    expect(q.passivity).toBe("pass");
    expect(q.reciprocity).toBe("pass");
    expect(q.messages.join("\n")).not.toMatch(/although it should be passive/);
    expect(q.messages.join("\n")).toMatch(/LNA: active part \(its data shows gain/);
  });

  it("gets the stability check: |Δ| = 2.09 at every point, K = 1.18993 > 1, potentially unstable, verdict fail", () => {
    const sol = solveSystem(prepareSystem(ampScenario(), { parts }));
    const results = stabilityCheck(sol, { composite: "active" });
    expect(results.map((r) => r.subject)).toEqual(["LNA", "composite"]);
    const lna = results[0];
    for (const p of lna.points) {
      expect(p.deltaMag).toBeCloseTo(2.09, 13);
      expect(p.k).toBeCloseTo(5.1881 / 4.36, 13);
      expect(p.unconditional).toBe(false);
    }
    expect(lna.verdict).toBe("fail");
    expect(lna.maxDelta).toBeCloseTo(2.09, 13);
    expect(lna.messages[0]).toMatch(/LNA: potentially unstable .* at 3 of 3 points, .*max \|Δ\| 2\.0900/);
  });

  it("`portolan check` exits 1 on it and prints the failing stability row", async () => {
    const dir = mkdtempSync(join(tmpdir(), "portolan-active-"));
    writeFileSync(join(dir, "lna.s2p"), AMP);
    writeFileSync(join(dir, "amp.json"), JSON.stringify(ampScenario()));
    let out = "";
    const code = await main(["check", "amp.json"], { out: (t) => { out += t; }, err: () => {}, cwd: dir });
    expect(code).toBe(1);
    expect(out).toMatch(/FAIL\s+stability LNA\s+min K 1\.190, max \|Δ\| 2\.090/);
    expect(out).toMatch(/PASS\s+passivity/);
  });

  it("active: false keeps a part expected passive: its gain is a passivity warning and it gets no stability check", () => {
    const sys = prepareSystem(ampScenario({ active: false }), { parts });
    expect(sys.blocks[1].active).toBeUndefined();
    const sol = solveSystem(sys);
    const all = runAllChecks(sys.scenario, sys, sol);
    expect(all.stability).toEqual([]);
    expect(all.dataQuality.passivity).toBe("warn");
    expect(all.dataQuality.messages.join("\n")).toMatch(/LNA: S is active .* although it should be passive/);
  });

  it("active: true marks a part whose data shows no gain, with the scenario as the reason", () => {
    const passiveText = "# GHz S RI R 50\n1 0.1 0 0.5 0 0.05 0 0.1 0\n2 0.1 0 0.5 0 0.05 0 0.1 0\n";
    const sys = prepareSystem(ampScenario({ active: true }), { parts: { "lna.s2p": passiveText } });
    expect(sys.blocks[1].active).toEqual({ source: "scenario", reason: "marked active in the scenario (active: true)" });
    const r = stabilityCheck(solveSystem(sys), { composite: "active" });
    expect(r.map((x) => [x.subject, x.verdict])).toEqual([["LNA", "pass"], ["composite", "pass"]]);
  });

  it("a passive part a little above σ = 1 (calibration error) stays expected passive and warns", () => {
    // |S21| = 1.0005 is 0.004 dB of gain: far below ACTIVE_GAIN_DB = 1 dB, what an imperfect thru calibration gives.
    const thru = "# GHz S RI R 50\n1 0 0 1.0005 0 1.0005 0 0 0\n2 0 0 1.0005 0 1.0005 0 0 0\n";
    const sys = prepareSystem(ampScenario(), { parts: { "lna.s2p": thru } });
    expect(sys.blocks[1].active).toBeUndefined();
    expect(dataQuality(solveSystem(sys)).passivity).toBe("warn");
    expect(gainActivity(1.0005, 1e9)).toBeNull();
    expect(gainActivity(1.2, 1e9)?.reason).toBe("its data shows gain: largest singular value 1.200 (1.58 dB) at 1 GHz");
  });

  it("the scenario schema accepts `active` on touchstone blocks and refuses it where a built-in model says otherwise", () => {
    const sc = parseScenario({ ...ampScenario({ active: true }) }, { parts });
    expect(sc.blocks[1].active).toBe(true);
    const bad = (block: Record<string, unknown>) => () => parseScenario({ ...ampScenario(), blocks: [block, ampScenario().blocks[1]] }, { parts });
    expect(bad({ id: "PAD", kind: "attenuator", params: { loss_db: 1 }, active: true })).toThrow(/blocks\[0\]\.active: a attenuator is passive by its model/);
    expect(bad({ id: "PAD", kind: "amplifier", params: { gain_db: 10, reverse_isolation_db: 30 }, active: false })).toThrow(/blocks\[0\]\.active: an amplifier is active by its model/);
    expect(bad({ id: "PAD", kind: "attenuator", params: { loss_db: 1 }, active: "yes" })).toThrow(EngineInputError);
    // repeating the model is allowed
    expect(() => bad({ id: "PAD", kind: "amplifier", params: { gain_db: 10, reverse_isolation_db: 30 }, active: true })()).not.toThrow();
  });
});

describe("stability figures of active parts against independent references", () => {
  /** random active 2-ports: |S11|, |S22| < 0.9, |S21| up to 20 dB, |S12| from −40 to −6 dB, random phases */
  function randomAmp(seed: number, nf: number): { text: string; s: number[] } {
    const r = rng(seed);
    const lines = ["# GHz S RI R 50"];
    const s: number[] = [];
    for (let k = 0; k < nf; k++) {
      const mag = [0.9 * r(), 0.01 + 0.49 * r(), 1.2 + 8.8 * r(), 0.9 * r()]; // S11, S12, S21, S22
      const c = mag.map((m) => { const a = 2 * Math.PI * r(); return [m * Math.cos(a), m * Math.sin(a)]; });
      s.push(...c.flat());
      // Touchstone 1.1 2-port order: S11 S21 S12 S22
      lines.push(`${1 + k * 0.01} ${[c[0], c[2], c[1], c[3]].flat().map((v) => v.toPrecision(17)).join(" ")}`);
    }
    return { text: lines.join("\n") + "\n", s };
  }

  it("K matches scikit-rf 0.15.4 Network.stability; |Δ|, μ and μ′ match the Edwards–Sinsky definition solved in numpy", () => {
    const nf = 60;
    const { text } = randomAmp(9001, nf);
    const sc: Scenario = {
      format: "portolan.scenario/1",
      name: "random amplifiers",
      z0: 50,
      frequency: { list: Array.from({ length: nf }, (_, k) => (1 + k * 0.01) * 1e9) },
      blocks: [{ id: "AMP", kind: "touchstone", file: "amp.s2p" }],
      links: [],
      ports: [{ name: "A", at: "AMP:1" }, { name: "B", at: "AMP:2" }],
    };
    const sys = prepareSystem(sc, { parts: { "amp.s2p": text } });
    expect(sys.blocks[0].active?.source).toBe("data");
    const [block] = stabilityCheck(solveSystem(sys), { composite: "active" });
    // Reference: K from scikit-rf 0.15.4 (Network.stability, Rollett's formula), reading the same Touchstone text;
    // |Δ| from numpy; μ (μ′) as Edwards and Sinsky define it — the distance from the centre of the load (source)
    // plane to the nearest termination that makes |Γin| (|Γout|) = 1 — found without their closed form: along each
    // of 100 000 rays ΓL = r·e^{jθ}, |S11 − Δ·ΓL|² = |1 − S22·ΓL|² is a quadratic in r; μ is the least positive root.
    const ref = runPython<{ k: number[]; delta: number[]; mu: number[]; muPrime: number[] }>(
      [
        "import skrf as rf, tempfile, os",
        "p = os.path.join(tempfile.mkdtemp(), 'amp.s2p'); open(p, 'w').write(data['text'])",
        "n = rf.Network(p)",
        "s = n.s",
        "th = np.linspace(0, 2 * np.pi, 100000, endpoint=False); u = np.exp(1j * th)",
        "def nearest(a, d, b):",
        "    # least r > 0 with |a - d r u|^2 = |1 - b r u|^2, over all rays u",
        "    A = abs(d) ** 2 - abs(b) ** 2",
        "    B = 2 * (np.real(b * u) - np.real(np.conj(a) * d * u))",
        "    C = abs(a) ** 2 - 1",
        "    disc = np.sqrt(np.maximum(B * B - 4 * A * C, 0))",
        "    r1 = (-B - disc) / (2 * A); r2 = (-B + disc) / (2 * A)",
        "    r = np.minimum(np.where(r1 > 0, r1, np.inf), np.where(r2 > 0, r2, np.inf))",
        "    r = np.where(B * B - 4 * A * C < 0, np.inf, r)",
        "    return float(np.min(r))",
        "D = s[:, 0, 0] * s[:, 1, 1] - s[:, 0, 1] * s[:, 1, 0]",
        "mu = [nearest(s[k, 0, 0], D[k], s[k, 1, 1]) for k in range(len(D))]",
        "mup = [nearest(s[k, 1, 1], D[k], s[k, 0, 0]) for k in range(len(D))]",
        "print(json.dumps({'k': np.real(n.stability).tolist(), 'delta': np.abs(D).tolist(), 'mu': mu, 'muPrime': mup}))",
      ].join("\n"),
      { text },
    );
    let unstable = 0;
    for (let k = 0; k < nf; k++) {
      const p = block.points[k];
      expect(Math.abs((p.k as number) - ref.k[k])).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(ref.k[k])));
      expect(Math.abs(p.deltaMag - ref.delta[k])).toBeLessThanOrEqual(1e-13 * Math.max(1, ref.delta[k]));
      // the ray search samples θ every 2π/1e5, so the nearest point is found to about r·(π/1e5)²/2 ≈ 5e-10·r
      expect(Math.abs((p.mu as number) - ref.mu[k])).toBeLessThanOrEqual(1e-8 * Math.max(1, ref.mu[k]));
      expect(Math.abs((p.muPrime as number) - ref.muPrime[k])).toBeLessThanOrEqual(1e-8 * Math.max(1, ref.muPrime[k]));
      if (!p.unconditional) unstable++;
    }
    // the draw holds both kinds, so that the verdict path is exercised on real mixtures
    expect(unstable).toBeGreaterThan(0);
    expect(unstable).toBeLessThan(nf);
    expect(block.verdict).toBe("fail");
    expect(block.conditionalCount).toBe(unstable);
  });

  it("the composite between every two system ports is checked when it holds an active block, matching scikit-rf's K of the port pair (numpy slicing)", () => {
    // IN → amplifier → 3-port splitter with two outputs: three system ports, three pairs.
    const sc: Scenario = {
      format: "portolan.scenario/1",
      name: "amplifier and splitter",
      z0: 50,
      frequency: { start: 1e9, stop: 1.5e9, points: 6 },
      blocks: [
        { id: "AMP", kind: "amplifier", params: { gain_db: 15, reverse_isolation_db: 25, input_return_loss_db: 12, output_return_loss_db: 10 } },
        { id: "SPL", kind: "splitter", params: { isolation_db: 20, excess_loss_db: 0.5 } },
      ],
      links: [["AMP:2", "SPL:1"]],
      ports: [{ name: "IN", at: "AMP:1" }, { name: "O1", at: "SPL:2" }, { name: "O2", at: "SPL:3" }],
    };
    const sol = solveSystem(prepareSystem(sc));
    const r = stabilityCheck(sol, { composite: "active" });
    expect(r.map((x) => x.subject)).toEqual(["AMP", "composite IN–O1", "composite IN–O2", "composite O1–O2"]);
    const ref = runPython<number[][]>(
      [
        "import skrf as rf",
        "s = cx(data['s']).reshape(-1, 3, 3)",
        "n = rf.Network(frequency=rf.Frequency.from_f(np.arange(1, s.shape[0] + 1), unit='GHz'), s=s, z0=50)",
        "def pair(p): return rf.Network(frequency=n.frequency, s=n.s[:, p][:, :, p], z0=50)",
        "print(json.dumps([np.real(pair(p).stability).tolist() for p in ([0, 1], [0, 2], [1, 2])]))",
      ].join("\n"),
      { s: Array.from(sol.s.data) },
    );
    for (let pair = 0; pair < 3; pair++) {
      for (let k = 0; k < 6; k++) {
        const mine = r[pair + 1].points[k].k as number;
        expect(Math.abs(mine - ref[pair][k])).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(ref[pair][k])));
      }
    }
  });

  it("above 8 system ports the composite's 36 pairs keep their summary figures but no per-point figures", () => {
    // IN → amplifier → 8-throw switch, every throw a system port: 9 ports, 9·8/2 = 36 pairs.
    const sc: Scenario = {
      format: "portolan.scenario/1",
      name: "amplifier and 8-throw switch",
      z0: 50,
      frequency: { start: 1e9, stop: 1.5e9, points: 4 },
      blocks: [
        { id: "AMP", kind: "amplifier", params: { gain_db: 15, reverse_isolation_db: 25, input_return_loss_db: 12, output_return_loss_db: 10 } },
        { id: "SW", kind: "switch", params: { throws: 8, insertion_loss_db: 0.5, isolation_db: 30 }, state: 3 },
      ],
      links: [["AMP:2", "SW:1"]],
      ports: [{ name: "IN", at: "AMP:1" }, ...Array.from({ length: 8 }, (_, k) => ({ name: `T${k + 1}`, at: `SW:${k + 2}` }))],
    };
    const sol = solveSystem(prepareSystem(sc));
    const pairs = stabilityCheck(sol, { composite: "active" }).filter((r) => r.subject.startsWith("composite "));
    expect(pairs.length).toBe(36);
    const inT3 = pairs.find((r) => r.subject === "composite IN–T3")!;
    expect(inT3.points).toEqual([]);
    // the same pair with its points, built from the composite by hand: identical summary
    const n = 9, nf = 4, i = 0, j = 3;
    const data = new Float64Array(8 * nf);
    const at = [i * n + i, i * n + j, j * n + i, j * n + j];
    for (let k = 0; k < nf; k++) for (let e = 0; e < 4; e++) for (let c = 0; c < 2; c++) data[8 * k + 2 * e + c] = sol.s.data[2 * (k * n * n + at[e]) + c];
    const full = stabilityOfStack("composite IN–T3", { n: 2, nf, data }, sol.frequencies);
    expect(full.points.length).toBe(4);
    expect({ ...inT3, points: full.points, frequenciesHz: full.frequenciesHz }).toEqual(full);
  });
});
