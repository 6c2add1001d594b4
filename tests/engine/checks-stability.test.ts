import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { stabilityOf, stabilityOfStack } from "@/engine/checks/stability";
import { rng, runPython } from "./network-helpers";
import {
  db20,
  dbmFromWatts,
  gammaFromReturnLoss,
  gammaFromVswr,
  mismatchLossDb,
  returnLossDb,
  vswrFromGamma,
  wattsFromDbm,
} from "@/engine/checks/conversions";

const polar = (m: number, deg: number) => [m * Math.cos((deg * Math.PI) / 180), m * Math.sin((deg * Math.PI) / 180)];
/** [S11, S12, S21, S22] from magnitude/angle pairs */
const twoPort = (s11: [number, number], s12: [number, number], s21: [number, number], s22: [number, number]) => [
  ...polar(...s11),
  ...polar(...s12),
  ...polar(...s21),
  ...polar(...s22),
];

describe("stabilityOf()", () => {
  it("matches Pozar Example 12.1 (HFET at 2 GHz): K = 0.607, |Δ| = 0.696, μ = 0.86, potentially unstable", () => {
    // Pozar, Microwave Engineering, 4th ed., Example 12.1: S11 = 0.894∠−60.6°, S21 = 3.122∠123.6°,
    // S12 = 0.020∠62.4°, S22 = 0.781∠−27.6°; the book gives |Δ| = 0.696, K = 0.607 and μ = 0.86 (from memory).
    const r = stabilityOf(twoPort([0.894, -60.6], [0.02, 62.4], [3.122, 123.6], [0.781, -27.6]));
    expect(r.k).toBeCloseTo(0.607, 3);
    expect(r.deltaMag).toBeCloseTo(0.696, 3);
    expect(r.mu).toBeCloseTo(0.86, 2);
    expect(r.unconditional).toBe(false);
  });

  it("matches Pozar Example 12.2 (GaAs FET at 4 GHz): |Δ| = 0.488, K = 1.195, unconditionally stable", () => {
    // Pozar, Microwave Engineering, 4th ed., Example 12.2: S11 = 0.72∠−116°, S21 = 2.60∠76°, S12 = 0.03∠57°,
    // S22 = 0.73∠−54°; the book gives Δ = 0.488∠−162° and K = 1.195 (from memory).
    const r = stabilityOf(twoPort([0.72, -116], [0.03, 57], [2.6, 76], [0.73, -54]));
    expect(r.k).toBeCloseTo(1.195, 3);
    expect(r.deltaMag).toBeCloseTo(0.488, 3);
    expect(r.unconditional).toBe(true);
    expect(r.mu).toBeGreaterThan(1);
  });

  it("μ > 1 exactly when K > 1 and |Δ| < 1 (Edwards and Sinsky, IEEE T-MTT 1992, main theorem)", () => {
    const cpx = fc.record({ m: fc.double({ min: 0, max: 0.99, noNaN: true }), a: fc.double({ min: -180, max: 180, noNaN: true }) });
    const gain = fc.record({ m: fc.double({ min: 0.01, max: 10, noNaN: true }), a: fc.double({ min: -180, max: 180, noNaN: true }) });
    const rev = fc.record({ m: fc.double({ min: 0.001, max: 0.5, noNaN: true }), a: fc.double({ min: -180, max: 180, noNaN: true }) });
    fc.assert(
      fc.property(cpx, rev, gain, cpx, (s11, s12, s21, s22) => {
        const r = stabilityOf(twoPort([s11.m, s11.a], [s12.m, s12.a], [s21.m, s21.a], [s22.m, s22.a]));
        // Skip points within rounding of the boundary, where either test may tip either way.
        if (r.mu === null || r.k === null || Math.abs(r.mu - 1) < 1e-9 || Math.abs(r.k - 1) < 1e-9 || Math.abs(r.deltaMag - 1) < 1e-9) return;
        expect(r.mu > 1).toBe(r.k > 1 && r.deltaMag < 1);
        // μ' > 1 is the same condition seen from the source side (same paper).
        expect((r.muPrime as number) > 1).toBe(r.mu > 1);
      }),
      { numRuns: 2000 },
    );
  });

  it("Rollett K agrees with scikit-rf 0.15.4 Network.stability on random two-ports", () => {
    const r = rng(4242);
    const nf = 100;
    const data: number[] = [];
    for (let k = 0; k < nf; k++) {
      // |S11|, |S22| < 1, gains up to 20 dB, reverse leakage down to −40 dB, random phases
      const mags = [0.95 * r(), 0.01 + 0.3 * r(), 0.5 + 9.5 * r(), 0.95 * r()];
      for (const m of mags) data.push(...polar(m, 360 * r() - 180));
    }
    const ref = runPython<number[]>(
      [
        "import skrf as rf",
        "s = cx(data['s']).reshape(-1, 2, 2)",
        "n = rf.Network(frequency=rf.Frequency.from_f(np.arange(1, s.shape[0] + 1), unit='GHz'), s=s, z0=50)",
        "print(json.dumps(np.real(n.stability).tolist()))",
      ].join("\n"),
      { s: data },
    );
    for (let k = 0; k < nf; k++) {
      const mine = stabilityOf(data.slice(8 * k, 8 * k + 8)).k as number;
      expect(Math.abs(mine - ref[k])).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(ref[k])));
    }
  });

  it("a unilateral matched amplifier (S12 = 0) is unconditionally stable with K reported as unbounded", () => {
    // K = ∞ for S12·S21 = 0 (Pozar 4th ed. eq. 12.12 denominator); |S11|, |S22| < 1 then decide (common practice).
    const r = stabilityOf(twoPort([0.1, 0], [0, 0], [10, 0], [0.2, 0]));
    expect(r.k).toBeNull();
    expect(r.unconditional).toBe(true);
  });

  it("stabilityOfStack() fails on the potentially unstable points and keeps JSON-safe figures", () => {
    const data = Float64Array.from([
      ...twoPort([0.72, -116], [0.03, 57], [2.6, 76], [0.73, -54]),
      ...twoPort([0.894, -60.6], [0.02, 62.4], [3.122, 123.6], [0.781, -27.6]),
    ]);
    const r = stabilityOfStack("AMP", { n: 2, nf: 2, data }, [4e9, 2e9]);
    // Pozar Ex. 12.1 (2 GHz) is potentially unstable: it oscillates with some passive terminations, so it fails
    expect(r.verdict).toBe("fail");
    expect(r.conditionalHz).toEqual([2e9]);
    expect(r.minK).toBeCloseTo(0.607, 3);
    expect(r.minKHz).toBe(2e9);
    expect(JSON.parse(JSON.stringify(r))).toEqual(r);
  });
});

describe("VSWR, return loss and mismatch loss conversions (common practice)", () => {
  it("|Γ| = 1/3 is VSWR 2, 9.54 dB return loss and 0.512 dB mismatch loss", () => {
    // VSWR = (1+|Γ|)/(1−|Γ|), RL = −20·log10|Γ|, ML = −10·log10(1−|Γ|²) (common practice).
    expect(vswrFromGamma(1 / 3)).toBeCloseTo(2, 12);
    expect(returnLossDb(1 / 3)).toBeCloseTo(9.5424, 4);
    expect(mismatchLossDb(1 / 3)).toBeCloseTo(0.5115, 4);
  });

  it("VSWR 1.5 is |Γ| = 0.2, 13.98 dB return loss, 0.177 dB mismatch loss", () => {
    // Standard VSWR table values (common practice).
    const g = gammaFromVswr(1.5);
    expect(g).toBeCloseTo(0.2, 14);
    expect(returnLossDb(g)).toBeCloseTo(13.979, 3);
    expect(mismatchLossDb(g)).toBeCloseTo(0.1773, 4);
  });

  it("round-trips return loss and VSWR, and treats full reflection as infinite VSWR", () => {
    expect(gammaFromReturnLoss(20)).toBeCloseTo(0.1, 14);
    expect(returnLossDb(gammaFromReturnLoss(17.3))).toBeCloseTo(17.3, 12);
    expect(gammaFromVswr(vswrFromGamma(0.37))).toBeCloseTo(0.37, 14);
    expect(vswrFromGamma(1)).toBe(Infinity);
    expect(() => gammaFromVswr(0.5)).toThrow(RangeError);
  });

  it("dBm and dB helpers: 30 dBm is 1 W, zero magnitude stays finite", () => {
    // 0 dBm = 1 mW (common practice).
    expect(wattsFromDbm(30)).toBeCloseTo(1, 14);
    expect(wattsFromDbm(0)).toBeCloseTo(1e-3, 17);
    expect(dbmFromWatts(0.5)).toBeCloseTo(26.9897, 4);
    expect(db20(0)).toBe(-400);
    expect(db20(0.5)).toBeCloseTo(-6.0206, 4);
  });
});
