import { describe, expect, it } from "vitest";
import { runPython } from "./reference/python";
import { BLOCK_CATALOGUE, BUILT_IN_KINDS, blockPortCount, evaluateBlock, idealizeBlock, C0 } from "@/engine/blocks";
import { EngineInputError, type BlockSpec } from "@/engine/types";
import {
  abs,
  add,
  argDeg,
  c,
  cexp,
  ctanh,
  db20,
  div,
  entry,
  matrixAt,
  mul,
  near,
  polar,
  reciprocityError,
  sigmaMax,
  sigmaMaxOver,
  sub,
  tan,
  unitarityError,
  type C,
} from "./blocks-helpers";

const F = new Float64Array([1e9, 2.4e9, 5.8e9]);
const Z0 = 50;
const run = (spec: Omit<BlockSpec, "id"> & { id?: string }, freqs = F, z0 = Z0) => evaluateBlock({ id: "B1", ...spec } as BlockSpec, freqs, z0);
const amp = (db: number) => Math.pow(10, -db / 20);
const H = Math.SQRT1_2;

/** expects the whole matrix at every frequency to equal `m` (rows of [re, im]) */
function expectMatrix(s: ReturnType<typeof run>["s"], m: C[][], tol = 1e-15) {
  expect(s.n).toBe(m.length);
  for (let k = 0; k < s.nf; k++)
    for (let i = 0; i < s.n; i++)
      for (let j = 0; j < s.n; j++) {
        const got = entry(s, k, i + 1, j + 1);
        if (!near(got, m[i][j], tol)) throw new Error(`S${i + 1}${j + 1} at f${k}: got ${got}, expected ${m[i][j]}`);
      }
}

function expectInputError(fn: () => unknown, where: string | RegExp) {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(EngineInputError);
    if (typeof where === "string") expect((e as EngineInputError).where).toBe(where);
    else expect((e as EngineInputError).where).toMatch(where);
    return e as EngineInputError;
  }
  throw new Error("expected an EngineInputError");
}

describe("test helper sigmaMax()", () => {
  it("agrees with numpy.linalg.svd (numpy 1.24, Debian python3) on random complex matrices", () => {
    const mats: number[][] = [];
    let seed = 7;
    const rnd = () => ((seed = (seed * 16807) % 2147483647) / 2147483647) * 2 - 1;
    for (const n of [1, 2, 3, 5, 8]) mats.push(Array.from({ length: 2 * n * n }, rnd));
    const ref = runPython("import json,sys\nfor m in json.load(sys.stdin):\n n=int(round((len(m)/2)**0.5)); a=np.array(m[0::2])+1j*np.array(m[1::2]); print(repr(float(np.linalg.svd(a.reshape(n,n),compute_uv=False)[0])))", { input: mats })
      .trim()
      .split("\n")
      .map(Number);
    mats.forEach((m, q) => {
      const n = Math.round(Math.sqrt(m.length / 2));
      expect(sigmaMax(Float64Array.from(m), n)).toBeCloseTo(ref[q], 12);
    });
  });
});

describe("load and antenna", () => {
  it("load by impedance gives Γ = (Z − Z0)/(Z + Z0) (Pozar, Microwave Engineering, 4th ed., eq. 2.35, from memory)", () => {
    for (const z of [c(100), c(25, 25), c(0), c(50, -80), c(1e6)]) {
      const { s, traits, warnings } = run({ kind: "load", params: { impedance: [z[0], z[1]] } });
      const expected = div(sub(z, c(Z0)), add(z, c(Z0)));
      expect(near(entry(s, 1, 1, 1), expected, 1e-15)).toBe(true);
      expect(traits).toEqual({ passive: true, reciprocal: true, radiates: false });
      expect(warnings).toEqual([]);
    }
    // worked value: 100 Ω on 50 Ω reflects 1/3 (common practice)
    expect(entry(run({ kind: "load", params: { impedance: 100 } }).s, 0, 1, 1)[0]).toBeCloseTo(1 / 3, 15);
  });

  it("load and antenna by return loss give Γ = 10^(−RL/20)·e^(jφ); null return loss is matched", () => {
    const { s } = run({ kind: "load", params: { return_loss_db: 20, phase_deg: 135 } });
    expect(near(entry(s, 2, 1, 1), polar(0.1, 135), 1e-16)).toBe(true);
    const ant = run({ kind: "antenna", params: { return_loss_db: 9.5424250943932 } }); // |Γ| = 1/3, VSWR 2 (common practice)
    expect(entry(ant.s, 0, 1, 1)[0]).toBeCloseTo(1 / 3, 12);
    expect(ant.traits.radiates).toBe(true);
    expect(entry(run({ kind: "antenna", params: { return_loss_db: null } }).s, 0, 1, 1)).toEqual([0, 0]);
  });

  it("refuses both or neither description, and a negative resistance", () => {
    expectInputError(() => run({ kind: "load", params: { impedance: [50, 0], return_loss_db: 10 } }), "block B1, parameter impedance");
    expectInputError(() => run({ kind: "load", params: {} }), "block B1, parameter return_loss_db");
    expectInputError(() => run({ kind: "load", params: { impedance: [-10, 0] } }), "block B1, parameter impedance");
    expectInputError(() => run({ kind: "load", params: { impedance: [50, 0], phase_deg: 10 } }), "block B1, parameter phase_deg");
  });
});

describe("attenuator and phase shifter", () => {
  it("attenuator: S21 = S12 = 10^(−L/20), real, matched (docs/blocks.md phase conventions)", () => {
    const { s } = run({ kind: "attenuator", params: { loss_db: 6 } });
    const t = 0.501187233627272; // 10^(−6/20)
    expectMatrix(s, [
      [c(0), c(t)],
      [c(t), c(0)],
    ]);
  });

  it("phase shifter: S21 = S12 = 10^(−L/20)·e^(−jφ) (delay is a negative angle with e^(+jωt))", () => {
    const { s } = run({ kind: "phase_shifter", params: { phase_deg: 90, loss_db: 1 } });
    const t: C = [0, -amp(1)];
    expectMatrix(s, [
      [c(0), t],
      [t, c(0)],
    ]);
    expect(unitarityError(run({ kind: "phase_shifter", params: { phase_deg: 33 } }).s)).toBeLessThan(1e-15);
  });
});

describe("line", () => {
  it("matched line: S21 = e^(−jθ), θ = 2πf·length/(v·c0) (docs/blocks.md; Pozar sec. 2.1)", () => {
    const len = 0.37;
    const vf = 0.66;
    const { s } = run({ kind: "line", params: { length_m: len, velocity_factor: vf } });
    for (let k = 0; k < F.length; k++) {
      const theta = (2 * Math.PI * F[k] * len) / (vf * C0);
      expect(near(entry(s, k, 2, 1), polar(1, (-theta * 180) / Math.PI), 1e-12)).toBe(true);
      expect(abs(entry(s, k, 1, 1))).toBeLessThan(1e-16);
    }
  });

  it("matched lossy line: |S21| in dB equals loss_db_per_m · length", () => {
    const { s } = run({ kind: "line", params: { length_m: 2.5, loss_db_per_m: 0.8 } });
    expect(db20(abs(entry(s, 1, 2, 1)))).toBeCloseTo(-2, 12);
  });

  it("quarter-wave transformer: 100 Ω load through a 70.71 Ω λ/4 line gives Γin = 0 at the design frequency (Pozar sec. 2.5)", () => {
    const f0 = 2.4e9;
    const zc = Math.sqrt(50 * 100); // Pozar sec. 2.5: Z1 = √(Z0·ZL)
    const len = C0 / f0 / 4;
    const freqs = new Float64Array([f0, 1.7e9, 3.1e9]);
    const { s } = run({ kind: "line", params: { length_m: len, impedance: zc } }, freqs);
    const gl = c(1 / 3); // 100 Ω on 50 Ω
    for (let k = 0; k < freqs.length; k++) {
      // input reflection of a two-port terminated in ΓL: Γin = S11 + S12 S21 ΓL / (1 − S22 ΓL) (Pozar eq. 12.3a, from memory)
      const gin = add(entry(s, k, 1, 1), div(mul(mul(entry(s, k, 1, 2), entry(s, k, 2, 1)), gl), sub(c(1), mul(entry(s, k, 2, 2), gl))));
      // Pozar eq. 2.44 (from memory): Zin = Zc (ZL + jZc tan βl)/(Zc + jZL tan βl)
      const bl = (2 * Math.PI * freqs[k] * len) / C0;
      const zin = mul(c(zc), div(add(c(100), mul(c(0, zc), tan(bl))), add(c(zc), mul(c(0, 100), tan(bl)))));
      const expected = div(sub(zin, c(50)), add(zin, c(50)));
      expect(near(gin, expected, 1e-12)).toBe(true);
      if (k === 0) expect(abs(gin)).toBeLessThan(1e-12);
    }
  });

  it("mismatched lossy line between 50 Ω ports matches the closed forms of Pozar ch. 2 (Zin with tanh γl, eq. 2.91; voltage waves V(z) = V0(e^(−γz) + ΓL e^(γz)))", () => {
    const zc = 75;
    const len = 0.21;
    const lossDbPerM = 3;
    const vf = 0.8;
    const { s } = run({ kind: "line", params: { length_m: len, impedance: zc, loss_db_per_m: lossDbPerM, velocity_factor: vf } });
    for (let k = 0; k < F.length; k++) {
      const gamma: C = [(lossDbPerM * Math.LN10) / 20, (2 * Math.PI * F[k]) / (vf * C0)];
      const gl: C = [gamma[0] * len, gamma[1] * len];
      // port 2 matched: ZL = Z0; Zin = Zc (ZL + Zc tanh γl)/(Zc + ZL tanh γl) (Pozar eq. 2.91, from memory)
      const th = ctanh(gl);
      const zin = mul(c(zc), div(add(c(50), mul(c(zc), th)), add(c(zc), mul(c(50), th))));
      const s11 = div(sub(zin, c(50)), add(zin, c(50)));
      expect(near(entry(s, k, 1, 1), s11, 1e-12)).toBe(true);
      // S21 = b2/a1 = 2 V2 / (V1 (1 + Z0/Zin)), V1 = V0(e^(γl) + ΓL e^(−γl)), V2 = V0 (1 + ΓL), ΓL = (Z0 − Zc)/(Z0 + Zc)
      const gL = c((50 - zc) / (50 + zc));
      const v1 = add(cexp(gl), mul(gL, cexp([-gl[0], -gl[1]])));
      const v2 = add(c(1), gL);
      const s21 = div(mul(c(2), v2), mul(v1, add(c(1), div(c(50), zin))));
      expect(near(entry(s, k, 2, 1), s21, 1e-12)).toBe(true);
      expect(near(entry(s, k, 2, 2), s11, 1e-12)).toBe(true);
    }
    expect(reciprocityError(s)).toBe(0);
  });

  it("a 1000 m line with 10 dB/m loss neither overflows nor gives NaN", () => {
    const { s } = run({ kind: "line", params: { length_m: 1000, loss_db_per_m: 10, impedance: 20 } });
    for (const v of s.data) expect(Number.isFinite(v)).toBe(true);
    expect(abs(entry(s, 0, 2, 1))).toBe(0);
    // what remains is the reflection of the 20 Ω step: (20 − 50)/(20 + 50) (Pozar eq. 2.35, from memory)
    expect(entry(s, 0, 1, 1)[0]).toBeCloseTo(-3 / 7, 12);
  });

  it("lossless mismatched line is lossless and reciprocal", () => {
    const { s } = run({ kind: "line", params: { length_m: 0.123, impedance: 31 } });
    expect(unitarityError(s)).toBeLessThan(1e-14);
  });
});

describe("isolator and amplifier", () => {
  it("isolator: S21 = 10^(−IL/20), S12 = 10^(−ISO/20), S11 = S22 = −10^(−RL/20) when these are compatible", () => {
    const { s, traits, warnings } = run({ kind: "isolator", params: { insertion_loss_db: 1, isolation_db: 20, return_loss_db: 20 } });
    expect(warnings).toEqual([]);
    expectMatrix(s, [
      [c(-0.1), c(0.1)],
      [c(amp(1)), c(-0.1)],
    ]);
    expect(traits).toEqual({ passive: true, reciprocal: false, radiates: false });
  });

  it("isolator with 0 dB insertion loss and finite return loss keeps isolation and return loss, lowers S21, and says so", () => {
    const { s, warnings } = run({ kind: "isolator", params: { insertion_loss_db: 0, isolation_db: 20, return_loss_db: 20 } });
    expect(entry(s, 0, 1, 2)).toEqual([0.1, 0]);
    expect(entry(s, 0, 1, 1)).toEqual([-0.1, 0]);
    expect(abs(entry(s, 0, 2, 1))).toBeLessThan(1);
    expect(warnings.join()).toMatch(/block B1: transmission reduced by 0\.\d+ dB/);
    expect(sigmaMax(matrixAt(s, 0), 2)).toBeLessThanOrEqual(1 + 1e-12);
    expect(sigmaMax(matrixAt(s, 0), 2)).toBeGreaterThan(1 - 1e-9); // reduced no more than needed
  });

  it("amplifier: S21 = 10^(G/20), S12 = 10^(−REV/20), reflections from return losses; active and one-way", () => {
    const { s, traits } = run({ kind: "amplifier", params: { gain_db: 20, reverse_isolation_db: 30, input_return_loss_db: 10, output_return_loss_db: 14 } });
    expectMatrix(s, [
      [c(-amp(10)), c(amp(30))],
      [c(10), c(-amp(14))],
    ]);
    expect(traits).toEqual({ passive: false, reciprocal: false, radiates: false });
  });
});

describe("splitter, tee, circulator", () => {
  it("ideal splitter is (−j/√2)[[0,1,1],[1,0,0],[1,0,0]] (Pozar sec. 7.3, Wilkinson)", () => {
    const { s } = run({ kind: "splitter" });
    const t: C = [0, -H];
    expectMatrix(s, [
      [c(0), t, t],
      [t, c(0), c(0)],
      [t, c(0), c(0)],
    ]);
  });

  it("excess loss scales every transmission", () => {
    const { s } = run({ kind: "splitter", params: { excess_loss_db: 0.5 } });
    expect(db20(abs(entry(s, 0, 2, 1)))).toBeCloseTo(-0.5 + db20(H), 12);
  });

  it("finite isolation ε keeps |S23| = ε and leaves 2|S21|² = 1 − ε, the largest passive split (even/odd-mode analysis of this matrix)", () => {
    for (const iso of [10, 20, 35]) {
      const eps = amp(iso);
      const { s, warnings } = run({ kind: "splitter", params: { isolation_db: iso } });
      expect(near(entry(s, 0, 2, 3), [0, -eps], 1e-16)).toBe(true);
      expect(2 * abs(entry(s, 0, 2, 1)) ** 2).toBeCloseTo(1 - eps, 9);
      expect(warnings.length).toBe(1);
    }
  });

  it("tee is (1/3)[[−1,2,2],[2,−1,2],[2,2,−1]] and lossless (Pozar sec. 7.2 / docs/blocks.md)", () => {
    const { s } = run({ kind: "tee" });
    const a = c(-1 / 3);
    const b = c(2 / 3);
    expectMatrix(s, [
      [a, b, b],
      [b, a, b],
      [b, b, a],
    ]);
    expect(unitarityError(s)).toBeLessThan(1e-15);
  });

  it("circulator: S21 = S32 = S13 = 10^(−IL/20); reverse and reflections as entered when compatible", () => {
    const ideal = run({ kind: "circulator", params: { insertion_loss_db: 0 } }).s;
    expectMatrix(ideal, [
      [c(0), c(0), c(1)],
      [c(1), c(0), c(0)],
      [c(0), c(1), c(0)],
    ]);
    expect(unitarityError(ideal)).toBe(0);
    const { s, warnings, traits } = run({ kind: "circulator", params: { insertion_loss_db: 0.5, isolation_db: 20, return_loss_db: 20 } });
    expect(warnings).toEqual([]);
    const t = c(amp(0.5));
    expectMatrix(s, [
      [c(-0.1), c(0.1), t],
      [t, c(-0.1), c(0.1)],
      [c(0.1), t, c(-0.1)],
    ]);
    expect(traits.reciprocal).toBe(false);
  });
});

describe("coupler and hybrids", () => {
  it("ideal coupler is [[0,α,jβ,0],[α,0,0,jβ],[jβ,0,0,α],[0,jβ,α,0]], β = 10^(−C/20) (Pozar sec. 7.1), lossless", () => {
    const { s } = run({ kind: "coupler", params: { coupling_db: 10 } });
    const b = amp(10);
    const a = Math.sqrt(1 - b * b);
    expectMatrix(s, [
      [c(0), c(a), c(0, b), c(0)],
      [c(a), c(0), c(0), c(0, b)],
      [c(0, b), c(0), c(0), c(a)],
      [c(0), c(0, b), c(a), c(0)],
    ]);
    expect(unitarityError(s)).toBeLessThan(1e-15);
  });

  it("directivity D gives |S41| = β·10^(−D/20), isolation C + D (common practice), in phase with the coupled wave; coupling ratio kept", () => {
    const { s, warnings } = run({ kind: "coupler", params: { coupling_db: 20, directivity_db: 25, excess_loss_db: 0.3 } });
    const s41 = entry(s, 0, 4, 1);
    expect(db20(abs(s41))).toBeCloseTo(-45, 12);
    expect(argDeg(s41)).toBeCloseTo(90, 12);
    expect(near(entry(s, 0, 3, 2), s41, 0)).toBe(true);
    const ratio = abs(entry(s, 0, 3, 1)) / abs(entry(s, 0, 2, 1));
    expect(ratio).toBeCloseTo(amp(20) / Math.sqrt(1 - amp(40)), 14);
    expect(warnings).toEqual([]); // 0.3 dB excess loss leaves room for −45 dB leakage
  });

  it("hybrid90 is −(1/√2)[[0,j,1,0],[j,0,0,1],[1,0,0,j],[0,1,j,0]] (Pozar sec. 7.5), lossless", () => {
    const { s } = run({ kind: "hybrid90" });
    expectMatrix(s, [
      [c(0), c(0, -H), c(-H), c(0)],
      [c(0, -H), c(0), c(0), c(-H)],
      [c(-H), c(0), c(0), c(0, -H)],
      [c(0), c(-H), c(0, -H), c(0)],
    ]);
    expect(unitarityError(s)).toBeLessThan(1e-15);
    // port 2 lags port 1 by 90°, port 3 by 180° (docs/blocks.md port numbering)
    expect(argDeg(entry(s, 0, 2, 1))).toBeCloseTo(-90, 12);
    expect(Math.abs(argDeg(entry(s, 0, 3, 1)))).toBeCloseTo(180, 12);
  });

  it("hybrid180 is −(j/√2)[[0,1,1,0],[1,0,0,−1],[1,0,0,1],[0,−1,1,0]] (Pozar sec. 7.8), lossless", () => {
    const { s } = run({ kind: "hybrid180" });
    const m = c(0, -H);
    const p = c(0, H);
    expectMatrix(s, [
      [c(0), m, m, c(0)],
      [m, c(0), c(0), p],
      [m, c(0), c(0), m],
      [c(0), p, m, c(0)],
    ]);
    expect(unitarityError(s)).toBeLessThan(1e-15);
  });

  it("hybrid isolation adds |S41| = |S23| = 10^(−ISO/20) and excess loss scales the transmissions", () => {
    for (const kind of ["hybrid90", "hybrid180"] as const) {
      const { s } = run({ kind, params: { isolation_db: 30, excess_loss_db: 0.4 } });
      expect(db20(abs(entry(s, 0, 4, 1)))).toBeCloseTo(-30, 12);
      expect(db20(abs(entry(s, 0, 2, 3)))).toBeCloseTo(-30, 12);
      expect(db20(abs(entry(s, 0, 2, 1)))).toBeLessThanOrEqual(-0.4 + db20(H) + 1e-12);
      expect(sigmaMaxOver(s)).toBeLessThanOrEqual(1 + 1e-12);
    }
  });
});

describe("switch", () => {
  const sw = (params: Record<string, unknown>, state?: number) => run({ kind: "switch", params, state });

  it("state picks the throw: common to selected throw S = 10^(−IL/20) real, to the others 10^(−ISO/20)", () => {
    const { s } = sw({ throws: 4, insertion_loss_db: 0.8, isolation_db: 40 }, 3);
    expect(s.n).toBe(5);
    expect(entry(s, 0, 4, 1)).toEqual([amp(0.8), 0]);
    expect(entry(s, 0, 1, 4)).toEqual([amp(0.8), 0]);
    for (const k of [2, 3, 5]) {
      expect(db20(abs(entry(s, 0, k, 1)))).toBeCloseTo(-40, 12);
      expect(db20(abs(entry(s, 0, k, 4)))).toBeCloseTo(-40, 12); // selected throw ↔ unselected throw
      expect(abs(entry(s, 0, k, k))).toBe(0); // absorptive
    }
    expect(db20(abs(entry(s, 0, 2, 3)))).toBeCloseTo(-80, 12); // two unselected throws: twice the isolation
    expect(entry(s, 0, 1, 1)).toEqual([0, 0]);
    expect(reciprocityError(s)).toBe(0);
  });

  it("default state is throw 1 (port 2)", () => {
    const { s } = sw({ throws: 2, insertion_loss_db: 0, isolation_db: null });
    expect(entry(s, 0, 2, 1)).toEqual([1, 0]);
    expect(entry(s, 0, 3, 1)).toEqual([0, 0]);
  });

  it("reflective off state: unselected throws reflect; with 0 dB loss and ∞ isolation the switch is lossless", () => {
    const ideal = sw({ throws: 3, insertion_loss_db: 0, isolation_db: null, off_state: "reflective" }, 2);
    expect(unitarityError(ideal.s)).toBe(0);
    expect(entry(ideal.s, 0, 2, 2)).toEqual([1, 0]);
    const { s } = sw({ throws: 2, insertion_loss_db: 0.5, isolation_db: 25, off_state: "reflective" }, 1);
    expect(entry(s, 0, 3, 3)).toEqual([amp(0.5), 0]);
    expect(db20(abs(entry(s, 0, 3, 1)))).toBeCloseTo(-25, 12);
  });

  it("0 dB insertion loss with finite isolation: an SPDT's transmission drops to the passive limit t² = 1 − 2ι² (orthogonal columns of the reflective model)", () => {
    const iota = amp(20);
    const { s, warnings } = sw({ throws: 2, insertion_loss_db: 0, isolation_db: 20, off_state: "reflective" }, 1);
    // σ_max² = t² + 2ι² for this matrix (its columns are orthogonal; see engine/blocks/switch.ts)
    expect(abs(entry(s, 0, 2, 1)) ** 2).toBeCloseTo(1 - 2 * iota * iota, 9);
    expect(warnings[0]).toMatch(/^block B1: transmission reduced by 0\.\d{3} dB/);
    expect(db20(abs(entry(s, 0, 3, 1)))).toBeCloseTo(-20, 12); // isolation as entered
    const four = sw({ throws: 4, insertion_loss_db: 0, isolation_db: 20, off_state: "reflective" }, 1).s;
    expect(sigmaMax(matrixAt(four, 0), 5)).toBeGreaterThan(1 - 1e-9); // reduced no more than needed
    expect(sigmaMax(matrixAt(four, 0), 5)).toBeLessThanOrEqual(1 + 1e-12);
  });

  it("state out of range, non-integer state and state in params are errors naming the block and parameter", () => {
    const e = expectInputError(() => sw({ throws: 2, insertion_loss_db: 0.5, isolation_db: 30 }, 3), "block B1, parameter state");
    expect(e.message).toMatch(/1 to 2/);
    expectInputError(() => sw({ throws: 2, insertion_loss_db: 0.5, isolation_db: 30 }, 1.5), "block B1, parameter state");
    expectInputError(() => sw({ throws: 2, insertion_loss_db: 0.5, isolation_db: 30 }, 0), "block B1, parameter state");
    const p = expectInputError(() => sw({ throws: 2, insertion_loss_db: 0.5, isolation_db: 30, state: 2 }), "block B1, parameter state");
    expect(p.message).toMatch(/goes on the block/);
    expectInputError(() => sw({ throws: 17, insertion_loss_db: 0.5, isolation_db: 30 }), "block B1, parameter throws");
    expectInputError(() => sw({ throws: 0, insertion_loss_db: 0.5, isolation_db: 30 }), "block B1, parameter throws");
    expectInputError(() => sw({ throws: 2, insertion_loss_db: 0.5, isolation_db: 30, off_state: "open" }), "block B1, parameter off_state");
  });
});

describe("array", () => {
  it("couples neighbours at −coupling_db with −90° per element step, falls off per further element, reflects 10^(−RL/20)", () => {
    const { s, traits } = run({ kind: "array", params: { elements: 5, return_loss_db: 15, coupling_db: 20, coupling_falloff_db: 6 } });
    expect(traits).toEqual({ passive: true, reciprocal: true, radiates: true });
    for (let i = 1; i <= 5; i++)
      for (let j = 1; j <= 5; j++) {
        const d = Math.abs(i - j);
        const expected = d === 0 ? c(amp(15)) : polar(amp(20 + (d - 1) * 6), -90 * d);
        expect(near(entry(s, 1, i, j), expected, 1e-15)).toBe(true);
      }
  });

  it("default fall-off ∞: only neighbours couple", () => {
    const { s } = run({ kind: "array", params: { elements: 3, return_loss_db: null, coupling_db: 12 } });
    expect(abs(entry(s, 0, 3, 1))).toBe(0);
    expect(db20(abs(entry(s, 0, 2, 1)))).toBeCloseTo(-12, 12);
  });

  it("refuses coupling too strong for the return loss, naming coupling_db", () => {
    const e = expectInputError(
      () => run({ kind: "array", params: { elements: 8, return_loss_db: 3, coupling_db: 6, coupling_falloff_db: 0 } }),
      "block B1, parameter coupling_db",
    );
    expect(e.message).toMatch(/active array \(largest singular value \d\.\d+ > 1\)/);
  });

  it("64 elements × 201 points is quick and passive", () => {
    const freqs = new Float64Array(201).map((_, k) => 2e9 + k * 1e6);
    const t0 = performance.now();
    const { s } = run({ kind: "array", params: { elements: 64, return_loss_db: 12, coupling_db: 16, coupling_falloff_db: 4 } }, freqs);
    const ms = performance.now() - t0;
    expect(s.n).toBe(64);
    expect(s.nf).toBe(201);
    expect(ms).toBeLessThan(5000); // generous: the test machine is shared
    expect(sigmaMax(matrixAt(s, 100), 64)).toBeLessThanOrEqual(1 + 1e-12);
  });
});

describe("validation", () => {
  it("unknown parameters are named (catches typos)", () => {
    const e = expectInputError(() => run({ kind: "attenuator", params: { los_db: 3 } }), "block B1, parameter los_db");
    expect(e.message).toMatch(/loss_db/);
  });

  it("missing, non-numeric, non-finite and out-of-range values name block and parameter and say what was expected", () => {
    const e = expectInputError(() => run({ kind: "attenuator", params: {} }), "block B1, parameter loss_db");
    expect(e.message).toMatch(/required/);
    expectInputError(() => run({ kind: "attenuator", params: { loss_db: "6" } }), "block B1, parameter loss_db");
    expectInputError(() => run({ kind: "attenuator", params: { loss_db: Number.NaN } }), "block B1, parameter loss_db");
    expectInputError(() => run({ kind: "attenuator", params: { loss_db: Infinity } }), "block B1, parameter loss_db");
    const neg = expectInputError(() => run({ kind: "attenuator", params: { loss_db: -1 } }), "block B1, parameter loss_db");
    expect(neg.message).toMatch(/≥ 0/);
    expectInputError(() => run({ kind: "coupler", params: { coupling_db: 0 } }), "block B1, parameter coupling_db");
    expectInputError(() => run({ kind: "isolator", params: { insertion_loss_db: 0.5 } }), "block B1, parameter isolation_db");
    expectInputError(() => run({ kind: "line", params: { length_m: 1, velocity_factor: 1.2 } }), "block B1, parameter velocity_factor");
    expectInputError(() => run({ kind: "line", params: { length_m: 1, impedance: 0 } }), "block B1, parameter impedance");
    expectInputError(() => run({ kind: "circulator", params: { isolation_db: -3 } }), "block B1, parameter isolation_db");
    expectInputError(() => run({ kind: "array", params: { elements: 2.5, return_loss_db: 10, coupling_db: 20 } }), "block B1, parameter elements");
  });

  it("touchstone, unknown kinds, state on other kinds, bad Z0 and bad frequencies are refused", () => {
    expectInputError(() => run({ kind: "touchstone", file: "a.s2p" }), "block B1, kind");
    expectInputError(() => run({ kind: "wire" as never }), "block B1, kind");
    expectInputError(() => run({ kind: "attenuator", params: { loss_db: 1 }, state: 1 }), "block B1, state");
    expectInputError(() => run({ kind: "tee" }, F, 0), "z0");
    expectInputError(() => run({ kind: "tee" }, new Float64Array([1e9, Number.NaN])), "frequency 1");
    expectInputError(() => blockPortCount({ id: "P", kind: "touchstone", file: "x.s2p" }), "block P, kind");
  });
});

describe("blockPortCount, idealizeBlock, BLOCK_CATALOGUE", () => {
  it("port counts follow docs/blocks.md; switch and array from their parameters", () => {
    const fixed: Record<string, number> = { load: 1, antenna: 1, attenuator: 2, line: 2, phase_shifter: 2, isolator: 2, amplifier: 2, filter: 2, splitter: 3, tee: 3, circulator: 3, coupler: 4, hybrid90: 4, hybrid180: 4 };
    for (const [kind, n] of Object.entries(fixed)) expect(blockPortCount({ id: "X", kind: kind as never })).toBe(n);
    expect(blockPortCount({ id: "S", kind: "switch", params: { throws: 6, insertion_loss_db: 1, isolation_db: 30 } })).toBe(7);
    expect(blockPortCount({ id: "A", kind: "array", params: { elements: 9, return_loss_db: 10, coupling_db: 20 } })).toBe(9);
    expectInputError(() => blockPortCount({ id: "S", kind: "switch", params: { throws: 2, insertion_loss_db: 1, isolation_db: 30 }, state: 5 }), "block S, parameter state");
  });

  it("every catalogue kind evaluates with its suggested and default values, and its port labels match its port count", () => {
    for (const kind of BUILT_IN_KINDS) {
      const entryDef = BLOCK_CATALOGUE[kind];
      const params: Record<string, unknown> = {};
      for (const p of entryDef.params) if (p.suggested !== undefined) params[p.name] = p.suggested;
      if (kind === "filter") Object.assign(params, { center_hz: 2.4e9, bandwidth_hz: 1e8 });
      const spec: BlockSpec = { id: "K", kind, params };
      const { s } = evaluateBlock(spec, F, Z0);
      expect(s.n).toBe(blockPortCount(spec));
      expect(entryDef.portLabels(params)).toHaveLength(s.n);
      for (const p of entryDef.params) {
        expect(p.label.length).toBeGreaterThan(0);
        expect(p.help.length).toBeGreaterThan(0);
        if (p.required) expect(p.suggested).not.toBeUndefined();
      }
    }
  });

  it("idealizeBlock keeps the function and removes the non-idealities", () => {
    const coupler = idealizeBlock({ id: "C", kind: "coupler", params: { coupling_db: 20, directivity_db: 25, excess_loss_db: 0.2 } });
    const s = evaluateBlock(coupler, F, Z0).s;
    expect(db20(abs(entry(s, 0, 3, 1)))).toBeCloseTo(-20, 12);
    expect(abs(entry(s, 0, 4, 1))).toBe(0);
    expect(unitarityError(s)).toBeLessThan(1e-15);

    const ampSpec = idealizeBlock({ id: "A", kind: "amplifier", params: { gain_db: 15, reverse_isolation_db: 20, input_return_loss_db: 8 } });
    const a = evaluateBlock(ampSpec, F, Z0).s;
    expectMatrix(a, [
      [c(0), c(0)],
      [c(Math.pow(10, 15 / 20)), c(0)],
    ]);

    const swSpec: BlockSpec = { id: "S", kind: "switch", params: { throws: 3, insertion_loss_db: 0.7, isolation_db: 25 }, state: 2 };
    const sw = evaluateBlock(idealizeBlock(swSpec), F, Z0).s;
    expect(entry(sw, 0, 3, 1)).toEqual([1, 0]);
    expect(abs(entry(sw, 0, 2, 1))).toBe(0);
    expect(swSpec.params?.isolation_db).toBe(25); // input not modified

    const load = evaluateBlock(idealizeBlock({ id: "L", kind: "load", params: { impedance: [75, 10] } }), F, Z0).s;
    expect(entry(load, 0, 1, 1)).toEqual([0, 0]);
    const line = evaluateBlock(idealizeBlock({ id: "W", kind: "line", params: { length_m: 0.3, impedance: 75, loss_db_per_m: 2 } }), F, Z0).s;
    expect(unitarityError(line)).toBeLessThan(1e-14);
    expect(abs(entry(line, 0, 1, 1))).toBeLessThan(1e-16);
    const arr = evaluateBlock(idealizeBlock({ id: "R", kind: "array", params: { elements: 3, return_loss_db: 10, coupling_db: 15, coupling_falloff_db: 3 } }), F, Z0).s;
    expect(Array.from(arr.data).every((v) => v === 0)).toBe(true);
    const ts: BlockSpec = { id: "T", kind: "touchstone", file: "x.s2p" };
    expect(idealizeBlock(ts)).toEqual(ts);
  });
});
