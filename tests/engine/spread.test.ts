/**
 * The spread analysis (engine/spread, docs/checks.md "Spread analysis"): spreads in the scenario, the
 * seeded generator, yields against closed forms, envelopes against the mismatch-uncertainty limits and
 * the arcsine distribution, reproducibility, the worst sample as a scenario, progress and cancellation,
 * and the `portolan spread` command. References outside the project: closed forms derived beside each
 * test, scipy 1.10 / numpy 1.24 of Debian's /usr/bin/python3 (Wilson interval, Spearman ρ, percentiles,
 * Kolmogorov–Smirnov tests of the generator).
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, describe, expect, it } from "vitest";
import { evaluateRule } from "../../engine/checks/rules";
import { parseScenario } from "../../engine/scenario/parse-scenario";
import { createRandom, runSpread, sampleScenario, spearman, quantileSorted, wilsonInterval } from "../../engine/spread";
import { prepareSystem, solveScenario } from "../../engine/system";
import { EngineInputError, type RuleSpec, type Scenario } from "../../engine/types";
import { runPythonJson } from "./reference/python";

const ROOT = fileURLToPath(new URL("../../", import.meta.url));
const CLI = join(ROOT, "dist", "portolan.mjs");
const work = mkdtempSync(join(tmpdir(), "portolan-spread-"));
afterAll(() => rmSync(work, { recursive: true, force: true }));

const IL_RULE: RuleSpec = { kind: "insertion_loss", id: "il", from: "A", to: "B", band: [1e9, 2e9], max_db: 3.5 };

/** A 3 dB attenuator between ports A and B, its loss spread as given. */
function padScenario(spread: unknown = { loss_db: { plus_minus: 1 } }): Scenario {
  return parseScenario({
    format: "portolan.scenario/1",
    name: "pad",
    z0: 50,
    frequency: { start: 1e9, stop: 2e9, points: 3 },
    blocks: [{ id: "PAD", kind: "attenuator", params: { loss_db: 3 }, spread }],
    links: [],
    ports: [
      { name: "A", at: "PAD:1" },
      { name: "B", at: "PAD:2" },
    ],
    rules: [IL_RULE],
  });
}

describe("spreads in the scenario", () => {
  const refused = (spread: unknown, kind = "attenuator", params: Record<string, unknown> = { loss_db: 3 }) => {
    try {
      parseScenario({ ...padScenario(), blocks: [{ id: "PAD", kind, params, spread }] });
    } catch (err) {
      expect(err).toBeInstanceOf(EngineInputError);
      return (err as Error).message;
    }
    throw new Error("accepted");
  };

  it("refuses an unknown parameter, a negative spread, both kinds, neither, and a parameter at ∞", () => {
    expect(refused({ gain_db: { sigma: 1 } })).toMatch(/^blocks\[0\]\.spread\.gain_db: unknown parameter "gain_db".*loss_db/);
    expect(refused({ loss_db: { plus_minus: -1 } })).toBe("blocks[0].spread.loss_db.plus_minus: a spread cannot be negative, got -1");
    expect(refused({ loss_db: { plus_minus: 1, sigma: 1 } })).toBe("blocks[0].spread.loss_db: give plus_minus (uniform) or sigma (normal), not both");
    expect(refused({ loss_db: {} })).toMatch(/^blocks\[0\]\.spread\.loss_db: expected \{ "plus_minus": x \}/);
    expect(refused({ loss_db: { sigma: 1, mean: 2 } })).toMatch(/^blocks\[0\]\.spread\.loss_db\.mean: unknown field/);
    expect(refused({ isolation_db: { sigma: 1 } }, "isolator", { insertion_loss_db: 0.5, isolation_db: null })).toMatch(/^blocks\[0\]\.spread\.isolation_db: .*finite value/);
    expect(refused({ throws: { sigma: 1 } }, "switch", { throws: 2, insertion_loss_db: 0.5, isolation_db: 30 })).toMatch(/not a number/);
  });

  it("takes mag_db and phase_deg on a part, nothing else", () => {
    const part = (spread: unknown) => ({ id: "P", kind: "touchstone", ports: 2, data: "# GHz S MA R 50\n1 0.5 0 0.7 0 0.7 0 0.5 0\n2 0.5 0 0.7 0 0.7 0 0.5 0\n", spread });
    const base = padScenario();
    expect(() => parseScenario({ ...base, blocks: [part({ mag_db: { sigma: 0.2 }, phase_deg: { plus_minus: 180 } })], ports: [{ name: "A", at: "P:1" }, { name: "B", at: "P:2" }] })).not.toThrow();
    expect(() => parseScenario({ ...base, blocks: [part({ gain_db: { sigma: 0.2 } })], ports: [{ name: "A", at: "P:1" }, { name: "B", at: "P:2" }] })).toThrow(/blocks\[0\]\.spread\.gain_db: unknown spread parameter.*mag_db and phase_deg/);
  });

  it("leaves solve and check on the nominal values", () => {
    const sol = solveScenario(padScenario());
    // |S21| of a 3 dB pad: 10^(−3/20) (definition of the dB)
    expect(Math.hypot(sol.s.data[4], sol.s.data[5])).toBeCloseTo(10 ** (-3 / 20), 12);
  });
});

describe("the seeded generator (xoshiro128**, Marsaglia polar)", () => {
  it("gives uniform and normal samples that pass scipy's Kolmogorov–Smirnov test", () => {
    const r = createRandom(20261204);
    const u = Array.from({ length: 5000 }, () => r.uniform());
    const g = Array.from({ length: 5000 }, () => r.normal());
    const p = runPythonJson<{ u: number; g: number }>(
      "import json, sys\nfrom scipy import stats\nd = json.load(sys.stdin)\nprint(json.dumps({'u': stats.kstest(d['u'], 'uniform').pvalue, 'g': stats.kstest(d['g'], 'norm').pvalue}))",
      { u, g },
    );
    // a fixed seed: the p-values are fixed numbers; a broken generator gives p far below 1e-3
    expect(p.u).toBeGreaterThan(1e-3);
    expect(p.g).toBeGreaterThan(1e-3);
    expect(Math.min(...u)).toBeGreaterThanOrEqual(0);
    expect(Math.max(...u)).toBeLessThan(1);
  });

  it("repeats a seed and differs between seeds", () => {
    const a = createRandom(7);
    const b = createRandom(7);
    const c = createRandom(8);
    const sa = Array.from({ length: 8 }, () => a.nextUint32());
    expect(Array.from({ length: 8 }, () => b.nextUint32())).toEqual(sa);
    expect(Array.from({ length: 8 }, () => c.nextUint32())).not.toEqual(sa);
  });
});

describe("statistics against scipy and numpy", () => {
  it("Wilson interval, Spearman ρ (with ties) and type-7 percentiles", () => {
    const x = [3, 1, 4, 1, 5, 9, 2, 6, 5, 3, 5, 8, 9, 7, 9];
    const y = [2, 7, 1, 8, 2, 8, 1, 8, 2, 8, 4, 5, 9, 0, 4];
    const ref = runPythonJson<{ w: [number, number]; w0: [number, number]; rho: number; q: number[] }>(
      [
        "import json, sys, numpy as np",
        "from scipy import stats",
        "d = json.load(sys.stdin)",
        "w = stats.binomtest(75, 100).proportion_ci(method='wilson')",
        "w0 = stats.binomtest(0, 40).proportion_ci(method='wilson')",
        "print(json.dumps({'w': [w.low, w.high], 'w0': [w0.low, w0.high], 'rho': stats.spearmanr(d['x'], d['y']).correlation, 'q': list(np.percentile(d['x'], [5, 50, 95]))}))",
      ].join("\n"),
      { x, y },
    );
    const w = wilsonInterval(75, 100);
    expect(w.low).toBeCloseTo(ref.w[0], 12);
    expect(w.high).toBeCloseTo(ref.w[1], 12);
    const w0 = wilsonInterval(0, 40);
    expect(w0.low).toBeCloseTo(ref.w0[0], 12);
    expect(w0.high).toBeCloseTo(ref.w0[1], 12);
    expect(spearman(x, y)).toBeCloseTo(ref.rho, 12);
    const sorted = Float64Array.from(x).sort();
    [0.05, 0.5, 0.95].forEach((q, i) => expect(quantileSorted(sorted, q)).toBeCloseTo(ref.q[i], 12));
  });
});

describe("runSpread", () => {
  it("3 dB ± 1 dB uniform under a 3.5 dB insertion-loss rule: yield 0.75 inside the Wilson interval", async () => {
    // P(loss ≤ 3.5) for loss uniform on [2, 4] is (3.5 − 2)/2 = 0.75 (closed form)
    const r = await runSpread(padScenario(), { samples: 20000, seed: 11 });
    const il = r.rules[0];
    expect(il).toMatchObject({ id: "il", total: 20000 });
    expect(il.low).toBeLessThanOrEqual(0.75);
    expect(il.high).toBeGreaterThanOrEqual(0.75);
    // a 95% interval of 20000 samples is about ±0.006 wide: it excludes 0.70 and 0.80
    expect(il.high - il.low).toBeLessThan(0.015);
    // the only parameter decides the margin completely and against it: ρ = −1
    expect(il.sensitivity).toEqual([{ name: "PAD.loss_db", rho: expect.closeTo(-1, 12) }]);
    // the worst sample is near the top of the range, its margin 3.5 − loss
    expect(il.worst!.values["PAD.loss_db"]).toBeGreaterThan(3.99);
    expect(il.worst!.margin).toBeCloseTo(3.5 - il.worst!.values["PAD.loss_db"], 9);
    // percentiles of a uniform on [2, 4]: 2.1, 3, 3.9 (closed form), within sampling error
    const env = r.envelopes[0];
    expect(env.p5[0]).toBeCloseTo(2.1, 1);
    expect(env.p50[1]).toBeCloseTo(3, 1);
    expect(env.p95[2]).toBeCloseTo(3.9, 1);
    expect(env.nominal).toEqual([3, 3, 3].map((v) => expect.closeTo(v, 9)));
  });

  it("a part's mag_db spread on all its data gives the same yield as the built-in pad's", async () => {
    // inline 3 dB matched pad: |S21| = 10^(−3/20) = 0.707946; mag_db uniform ± 1 dB → loss uniform on [2, 4]
    const scenario = parseScenario({
      ...padScenario(),
      blocks: [{ id: "PART", kind: "touchstone", ports: 2, data: "# GHz S MA R 50\n1 0 0 0.707945784384 0 0.707945784384 0 0 0\n2 0 0 0.707945784384 0 0.707945784384 0 0 0\n", spread: { mag_db: { plus_minus: 1 }, phase_deg: { plus_minus: 180 } } }],
      ports: [
        { name: "A", at: "PART:1" },
        { name: "B", at: "PART:2" },
      ],
    });
    const r = await runSpread(scenario, { samples: 20000, seed: 11 });
    const il = r.rules[0];
    expect(il.low).toBeLessThanOrEqual(0.75);
    expect(il.high).toBeGreaterThanOrEqual(0.75);
    // the phase of a lone matched pad changes no magnitude: it ranks below the magnitude offset
    expect(il.sensitivity[0].name).toBe("PART.mag_db");
    expect(il.sensitivity[0].rho).toBeCloseTo(1, 12);
    expect(Math.abs(il.sensitivity[1].rho ?? 0)).toBeLessThan(0.05);

    // the worst sample as a scenario of its own (inline data on the plan) solves to the worst margin
    const sys = prepareSystem(scenario);
    const worst = sampleScenario(sys, il.worst!.values);
    const reread = parseScenario(JSON.parse(JSON.stringify(worst)));
    expect(reread.blocks[0].spread).toBeUndefined();
    const margin = evaluateRule(solveScenario(reread), IL_RULE, 0).margin;
    expect(margin).toBeCloseTo(il.worst!.margin, 9);
  });

  it("the worst sample of a built-in block opens as a scenario with the sampled value", async () => {
    const scenario = padScenario({ loss_db: { sigma: 0.5 } });
    const r = await runSpread(scenario, { samples: 500, seed: 5 });
    const worst = sampleScenario(prepareSystem(scenario), r.rules[0].worst!.values);
    expect(worst.blocks[0].params).toEqual({ loss_db: r.rules[0].worst!.values["PAD.loss_db"] });
    expect(evaluateRule(solveScenario(parseScenario(worst)), IL_RULE, 0).margin).toBeCloseTo(r.rules[0].worst!.margin, 9);
  });

  it("two reflections with unknown relative phase through a lossless line: mismatch limits and arcsine percentiles", async () => {
    // System ports of 150 Ω and 100 Ω on a 50 Ω lossless line: reflections |Γ1| = 100/200 = 0.5 and
    // |Γ2| = 50/150 = 1/3 at the two ends; a phase shifter of unknown phase (uniform ± 180°) stands for
    // the unknown electrical length. With lossless steps (power waves, real references) and θ the
    // one-way phase (line + shifter):
    //   |S21|² = (1 − |Γ1|²)(1 − |Γ2|²) / |1 − Γ1Γ2 e^(−2jθ)|²
    // so IL(dB) = IL0 + 10·log10(1 + ρ² − 2ρ·cos φ), with IL0 = −10·log10((1 − |Γ1|²)(1 − |Γ2|²)),
    // ρ = |Γ1||Γ2| and φ = 2θ + arg(Γ1Γ2) (common practice: the mismatch-uncertainty term). It lies in
    // IL0 ± 20·log10(1 ± ρ) for every φ. With θ uniform over a full turn, φ is uniform modulo 2π, and
    // cos φ has the arcsine distribution on [−1, 1]: P(cos φ ≤ c) = 1 − arccos(c)/π. IL decreases as
    // cos φ grows, so its p-quantile is at cos φ = c_(1−p), where 1 − arccos(c)/π = 1 − p, i.e.
    // c_(1−p) = cos(π p):
    //   IL_p = IL0 + 10·log10(1 + ρ² − 2ρ·cos(π p)).
    const g1 = 0.5;
    const g2 = 1 / 3;
    const rho = g1 * g2;
    const il0 = -10 * Math.log10((1 - g1 * g1) * (1 - g2 * g2));
    const ilAt = (p: number) => il0 + 10 * Math.log10(1 + rho * rho - 2 * rho * Math.cos(Math.PI * Math.min(1, Math.max(0, p))));
    const scenario = parseScenario({
      format: "portolan.scenario/1",
      name: "two reflections",
      z0: 50,
      frequency: { start: 1e9, stop: 2e9, points: 11 },
      blocks: [
        { id: "TL", kind: "line", params: { length_m: 0.37 } },
        { id: "PHI", kind: "phase_shifter", params: { phase_deg: 0 }, spread: { phase_deg: { plus_minus: 180 } } },
      ],
      links: [["TL:2", "PHI:1"]],
      ports: [
        { name: "A", at: "TL:1", z0: 150 },
        { name: "B", at: "PHI:2", z0: 100 },
      ],
      rules: [{ ...IL_RULE, max_db: 2 }],
    });
    const N = 20000;
    const r = await runSpread(scenario, { samples: N, seed: 2026 });
    const env = r.envelopes[0];
    expect(env.frequencies).toHaveLength(11);
    for (let k = 0; k < 11; k++) {
      for (const v of [env.p5[k], env.p50[k], env.p95[k]]) {
        expect(v).toBeGreaterThanOrEqual(il0 + 20 * Math.log10(1 - rho) - 1e-9);
        expect(v).toBeLessThanOrEqual(il0 + 20 * Math.log10(1 + rho) + 1e-9);
      }
      // a sample p-quantile lies between the true quantiles at p ∓ 4 standard errors √(p(1−p)/N)
      // (normal approximation of the binomial count below it; common practice)
      ([[0.05, env.p5[k]], [0.5, env.p50[k]], [0.95, env.p95[k]]] as const).forEach(([p, v]) => {
        const e = 4 * Math.sqrt((p * (1 - p)) / N);
        expect(v).toBeGreaterThanOrEqual(ilAt(p - e) - 1e-9);
        expect(v).toBeLessThanOrEqual(ilAt(p + e) + 1e-9);
      });
    }
    // and the quantiles do differ from the uniform's: the median sits at IL0 + 10·log10(1 + ρ²), not mid-range
    expect(env.p50[0]).toBeCloseTo(il0 + 10 * Math.log10(1 + rho * rho), 2);
  });

  it("drive and match rules through a pad of spread loss: closed-form margins and yields", async () => {
    // 7 dBm into a pad of loss L (uniform 2…4 dB) ending in a load of 20 dB return loss rated 5 dBm:
    // incident power at the load 7 − L dBm, margin 5 − (7 − L) = L − 2 ≥ 0 always (yield 1); the return
    // loss seen at A is 20 + 2L dB (the reflection crosses the pad twice), ≥ 26 dB iff L ≥ 3: yield 0.5
    // (common practice: matched pad, definition of return loss).
    const scenario = parseScenario({
      ...padScenario(),
      blocks: [
        { id: "PAD", kind: "attenuator", params: { loss_db: 3 }, spread: { loss_db: { plus_minus: 1 } } },
        { id: "LD", kind: "load", params: { return_loss_db: 20 }, rating_dbm: 5 },
      ],
      links: [["PAD:2", "LD:1"]],
      ports: [{ name: "A", at: "PAD:1" }],
      rules: [
        { kind: "drive", id: "drive", sources: [{ port: "A", dbm: 7 }] },
        { kind: "match", id: "match", port: "A", band: [1e9, 2e9], min_return_loss_db: 26 },
      ],
    });
    const r = await runSpread(scenario, { samples: 20000, seed: 3 });
    const [drive, match] = r.rules;
    expect(drive).toMatchObject({ passed: 20000, yield: 1, high: 1 });
    expect(drive.worst!.margin).toBeCloseTo(drive.worst!.values["PAD.loss_db"] - 2, 9);
    expect(match.low).toBeLessThanOrEqual(0.5);
    expect(match.high).toBeGreaterThanOrEqual(0.5);
    expect(match.worst!.margin).toBeCloseTo(20 + 2 * match.worst!.values["PAD.loss_db"] - 26, 9);
    // the drive rule has no band trace: one envelope, the match rule's
    expect(r.envelopes.map((e) => e.rule)).toEqual(["match"]);
  });

  it("same seed, same result; another seed, other samples", async () => {
    const scenario = padScenario({ loss_db: { sigma: 0.4 } });
    const a = await runSpread(scenario, { samples: 300, seed: 42 });
    const b = await runSpread(scenario, { samples: 300, seed: 42 });
    const c = await runSpread(scenario, { samples: 300, seed: 43 });
    expect(b).toEqual(a);
    expect(c.rules[0].worst!.values).not.toEqual(a.rules[0].worst!.values);
    expect(c.envelopes[0].p50).not.toEqual(a.envelopes[0].p50);
  });

  it("reports progress up to 1 and stops when the signal aborts", async () => {
    const seen: number[] = [];
    await runSpread(padScenario(), { samples: 2000, seed: 1, batchMs: 1, onProgress: (f) => seen.push(f) });
    expect(seen.length).toBeGreaterThan(1);
    expect(seen[seen.length - 1]).toBe(1);
    expect([...seen].sort((x, y) => x - y)).toEqual(seen);

    const controller = new AbortController();
    let calls = 0;
    const run = runSpread(padScenario(), {
      samples: 200000,
      seed: 1,
      batchMs: 1,
      signal: controller.signal,
      onProgress: () => {
        if (++calls === 2) controller.abort(new Error("cancelled by the user"));
      },
    });
    await expect(run).rejects.toThrow("cancelled by the user");
    expect(calls).toBe(2);
  });

  it("refuses a scenario without spreads or without rules, and bad sample counts", async () => {
    await expect(runSpread(padScenario({}), { samples: 10, seed: 1 })).rejects.toThrow(/no block has a spread/);
    await expect(runSpread({ ...padScenario(), rules: [] }, { samples: 10, seed: 1 })).rejects.toThrow(/no rules/);
    await expect(runSpread(padScenario(), { samples: 0, seed: 1 })).rejects.toThrow(/^samples: /);
    await expect(runSpread(padScenario(), { samples: 10, seed: 1.5 })).rejects.toThrow(/^seed: /);
  });
});

describe("portolan spread", () => {
  const file = join(work, "pad.json");
  writeFileSync(file, JSON.stringify(padScenario()));
  const cli = (...args: string[]) => {
    const run = spawnSync(process.execPath, [CLI, "spread", ...args], { cwd: ROOT, encoding: "utf8" });
    return { code: run.status, stdout: run.stdout, stderr: run.stderr };
  };

  it("prints the JSON the issue lists and exits by --min-yield", () => {
    const r = cli(file, "--samples", "4000", "--seed", "9", "--json", "--min-yield", "0.7");
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out).toMatchObject({ samples: 4000, seed: 9 });
    expect(Object.keys(out.rules[0])).toEqual(expect.arrayContaining(["id", "passed", "total", "yield", "low", "high"]));
    expect(out.rules[0].yield).toBe(out.rules[0].passed / 4000);
    expect(Object.keys(out.envelopes[0])).toEqual(expect.arrayContaining(["frequencies", "p5", "p50", "p95"]));
    // 0.75 is far above 0.7 and far below 0.8 for 4000 samples (interval ≈ ±0.013)
    expect(cli(file, "--samples", "4000", "--seed", "9", "--min-yield", "0.8").code).toBe(1);
  });

  it("writes each rule's worst sample as a scenario that solves to its margin", () => {
    const dir = join(work, "worst");
    const r = cli(file, "--samples", "300", "--seed", "4", "--json", "--save-worst", dir);
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    const worst = parseScenario(JSON.parse(readFileSync(join(dir, "worst-il.json"), "utf8")));
    expect(worst.blocks[0].params).toEqual({ loss_db: out.rules[0].worst.values["PAD.loss_db"] });
    expect(evaluateRule(solveScenario(worst), IL_RULE, 0).margin).toBeCloseTo(out.rules[0].worst.margin, 9);
  });

  it("prints a table, and exits 2 on bad input", () => {
    const t = cli(file, "--samples", "200", "--seed", "1");
    expect(t.code).toBe(0);
    expect(t.stdout).toMatch(/il \(insertion_loss\)\s+\d+\.\d% \(\d+\/200\)/);
    expect(t.stdout).toMatch(/PAD\.loss_db \(-1\.00\)/);
    for (const args of [["--samples", "10"], ["--samples", "0", "--seed", "1"], ["--samples", "10", "--seed", "1", "--min-yield", "95"], ["--samples", "10", "--seed", "1", "--bogus"]]) {
      const r = cli(file, ...args);
      expect(r.code, args.join(" ")).toBe(2);
      expect(r.stderr).not.toBe("");
    }
    const bad = join(work, "bad.json");
    writeFileSync(bad, JSON.stringify({ ...padScenario(), blocks: [{ id: "PAD", kind: "attenuator", params: { loss_db: 3 }, spread: { loss_db: { sigma: -2 } } }] }));
    const r = cli(bad, "--samples", "10", "--seed", "1");
    expect(r.code).toBe(2);
    expect(r.stderr).toBe(`${bad}: blocks[0].spread.loss_db.sigma: a spread cannot be negative, got -2\n`);
  });
});
