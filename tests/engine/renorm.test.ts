// Renormalisation between reference impedances: closed forms of Kurokawa, "Power waves and the scattering matrix",
// IEEE T-MTT 13(2), 1965, and of Pozar, Microwave Engineering, 4th ed., §4.3; the reference library scikit-rf 0.15.4
// renormalize_s (which goes through Z, so only networks that have a Z matrix are compared with it).
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { solveComplexInPlace } from "@/engine/linalg";
import { renormalize, z0Vector } from "@/engine/renorm";
import { EngineInputError, SingularSystemError, type SData } from "@/engine/types";
import { interleave, requireSkrf, runSkrf, split, type Cplx } from "../fixtures/touchstone/skrf";

type C = [number, number];
const add = (a: C, b: C): C => [a[0] + b[0], a[1] + b[1]];
const sub = (a: C, b: C): C => [a[0] - b[0], a[1] - b[1]];
const mul = (a: C, b: C): C => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
const conj = (a: C): C => [a[0], -a[1]];
const div = (a: C, b: C): C => {
  const d = b[0] * b[0] + b[1] * b[1];
  return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d];
};

function oneport(g: C): SData {
  return { n: 1, nf: 1, data: new Float64Array(g) };
}

function maxDiff(a: Float64Array, b: Float64Array): number {
  expect(a.length).toBe(b.length);
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i] - b[i]));
  return m;
}

/** A passive n-port with a Z matrix: S of a random resistive-reactive network (Re Z positive definite). */
function passiveWithZ(n: number, nf: number, seed: number): SData {
  let x = seed;
  const rnd = () => {
    x = (x * 16807) % 2147483647;
    return x / 2147483647;
  };
  const data = new Float64Array(2 * nf * n * n);
  for (let k = 0; k < nf; k++) {
    // S = (Z − 50)(Z + 50)⁻¹ with Z = 50·(D + jX), D diagonal dominant positive, X symmetric
    const a = new Float64Array(2 * n * n);
    const b = new Float64Array(2 * n * n);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j <= i; j++) {
        const re = i === j ? 0.5 + n * rnd() : 0.3 * (rnd() - 0.5);
        const im = 2 * (rnd() - 0.5);
        for (const [p, q] of [[i, j], [j, i]]) {
          const o = 2 * (p * n + q);
          a[o] = re + (p === q ? 1 : 0);
          a[o + 1] = im;
          b[o] = re - (p === q ? 1 : 0);
          b[o + 1] = im;
        }
      }
    }
    // S = (Zn + I)⁻¹ (Zn − I)
    expect(solveComplexInPlace(a, b, n, n)).toBe(true);
    data.set(b, k * 2 * n * n);
  }
  return { n, nf, data };
}

describe("renormalize() against closed forms", () => {
  const loads: C[] = [
    [10, 0],
    [50, 0],
    [120, -35],
    [3, 80],
    [1e4, 1],
  ];
  const refs: C[] = [
    [75, 0],
    [25, 10],
    [50, -40],
    [0.5, 3],
  ];

  it("power waves: a 1-port load Z seen from Z0' gives Γ' = (Z − Z0'*)/(Z + Z0') (Kurokawa 1965, eqs. 1–2: b/a for V = Z I)", () => {
    // Kurokawa defines a = (V + Z0 I)/(2√Re Z0), b = (V − Z0* I)/(2√Re Z0); with V = Z I this gives the ratio above.
    for (const z of loads) {
      const s50 = oneport(div(sub(z, [50, 0]), add(z, [50, 0])));
      for (const z0 of refs) {
        const got = renormalize(null, s50, z0Vector(50, 1), z0Vector([z0], 1), "power").data;
        const want = div(sub(z, conj(z0)), add(z, z0));
        expect(Math.hypot(got[0] - want[0], got[1] - want[1])).toBeLessThan(1e-12);
      }
    }
  });

  it("pseudo-waves: the same load gives Γ' = (Z − Z0')/(Z + Z0') (Marks and Williams 1992, eq. 73 for one port)", () => {
    for (const z of loads) {
      const s50 = oneport(div(sub(z, [50, 0]), add(z, [50, 0])));
      for (const z0 of refs) {
        const got = renormalize(null, s50, z0Vector(50, 1), z0Vector([z0], 1), "pseudo").data;
        const want = div(sub(z, z0), add(z, z0));
        expect(Math.hypot(got[0] - want[0], got[1] - want[1])).toBeLessThan(1e-12);
      }
    }
  });

  it("renormalises from complex to complex references (load Z from Z0 = 30 − 20j to Z0' = 80 + 15j, power waves)", () => {
    const z: C = [42, 17];
    const z1: C = [30, -20];
    const z2: C = [80, 15];
    const s1 = oneport(div(sub(z, conj(z1)), add(z, z1)));
    const got = renormalize(null, s1, z0Vector([z1], 1), z0Vector([z2], 1)).data;
    const want = div(sub(z, conj(z2)), add(z, z2));
    expect(Math.hypot(got[0] - want[0], got[1] - want[1])).toBeLessThan(1e-12);
  });

  it("keeps an ideal through ([[0,1],[1,0]], no Z matrix) matched when both ports move to the same new reference", () => {
    // A zero-length connection between two equal references is matched and lossless (common practice).
    const through: SData = { n: 2, nf: 1, data: new Float64Array([0, 0, 1, 0, 1, 0, 0, 0]) };
    for (const z of [75, 12.5, 300]) {
      const got = renormalize(null, through, z0Vector(50, 2), z0Vector(z, 2)).data;
      expect(maxDiff(got, through.data)).toBeLessThan(1e-15);
    }
  });

  it("a series impedance (no Z matrix) matches Pozar's closed form at the new reference: S11 = Zs/(Zs + 2Z0), S21 = 2Z0/(Zs + 2Z0)", () => {
    // Pozar, Microwave Engineering, 4th ed., §4.3 and Table 4.2 (series element between equal real references).
    const zs: C = [20, -35];
    const series = (z0: number): Float64Array => {
      const den = add(zs, [2 * z0, 0]);
      const s11 = div(zs, den);
      const s21 = div([2 * z0, 0], den);
      return new Float64Array([...s11, ...s21, ...s21, ...s11]);
    };
    const s50: SData = { n: 2, nf: 1, data: series(50) };
    expect(maxDiff(renormalize(null, s50, z0Vector(50, 2), z0Vector(75, 2)).data, series(75))).toBeLessThan(1e-15);
    // With a complex reference z on both ports (power waves, Kurokawa): port 2 ends in z, so Zin = Zs + z and
    // S11 = (Zin − z*)/(Zin + z).
    const z: C = [40, 25];
    const got = renormalize(null, s50, z0Vector(50, 2), z0Vector([z, z], 2)).data;
    const zin = add(zs, z);
    const want = div(sub(zin, conj(z)), add(zin, z));
    expect(Math.hypot(got[0] - want[0], got[1] - want[1])).toBeLessThan(1e-14);
  });

  it("an open (S = 1) and a short (S = −1) stay so at any reference: they have no Z or no Y", () => {
    for (const g of [1, -1]) {
      const got = renormalize(null, oneport([g, 0]), z0Vector(50, 1), z0Vector([[20, 30]], 1), "power").data;
      // Kurokawa: Γ' = (Z − Z0'*)/(Z + Z0') → 1 for Z → ∞; for Z = 0 it is −Z0'*/Z0', of magnitude 1.
      const want = g === 1 ? [1, 0] : div([-20, 30], [20, 30]);
      expect(Math.hypot(got[0] - want[0], got[1] - want[1])).toBeLessThan(1e-15);
    }
  });
});

describe("renormalize() against conversion through Z (networks that have one)", () => {
  it("a non-reciprocal 2-port 50 → 75 Ω equals S → Z at 50 Ω → S at 75 Ω by Pozar's conversion table", () => {
    // Pozar, Microwave Engineering, 4th ed., Table 4.2 (2-port S ↔ Z for equal real Z0 at both ports).
    const s11: C = [0.2, -0.1];
    const s12: C = [0.05, 0.3];
    const s21: C = [0.7, -0.2];
    const s22: C = [-0.3, 0.25];
    const one: C = [1, 0];
    const z0 = 50;
    const zp = 75;
    const dS = sub(mul(sub(one, s11), sub(one, s22)), mul(s12, s21));
    const k = (c: C, x: number): C => [c[0] * x, c[1] * x];
    const z11 = div(k(add(mul(add(one, s11), sub(one, s22)), mul(s12, s21)), z0), dS);
    const z12 = div(k(s12, 2 * z0), dS);
    const z21 = div(k(s21, 2 * z0), dS);
    const z22 = div(k(add(mul(sub(one, s11), add(one, s22)), mul(s12, s21)), z0), dS);
    const Z: C = [zp, 0];
    const dZ = sub(mul(add(z11, Z), add(z22, Z)), mul(z12, z21));
    const want = [
      div(sub(mul(sub(z11, Z), add(z22, Z)), mul(z12, z21)), dZ),
      div(k(z12, 2 * zp), dZ),
      div(k(z21, 2 * zp), dZ),
      div(sub(mul(add(z11, Z), sub(z22, Z)), mul(z12, z21)), dZ),
    ].flat();
    const s: SData = { n: 2, nf: 1, data: new Float64Array([...s11, ...s12, ...s21, ...s22]) };
    for (const kind of ["power", "pseudo"] as const) {
      expect(maxDiff(renormalize(null, s, z0Vector(z0, 2), z0Vector(zp, 2), kind).data, Float64Array.from(want))).toBeLessThan(1e-14);
    }
  });
});

describe("renormalize() identities", () => {
  it("50 → 75 → 50 returns the original to 1e-12, for networks with and without a Z matrix", () => {
    const through: SData = { n: 2, nf: 1, data: new Float64Array([0, 0, 1, 0, 1, 0, 0, 0]) };
    for (const s of [passiveWithZ(4, 5, 3), through, oneport([1, 0])]) {
      for (const kind of ["power", "pseudo"] as const) {
        const z50 = z0Vector(50, s.n);
        const z75 = z0Vector(75, s.n);
        const back = renormalize(null, renormalize(null, s, z50, z75, kind), z75, z50, kind);
        expect(maxDiff(back.data, s.data)).toBeLessThan(1e-12);
      }
    }
  });

  it("round trips through complex per-port references too", () => {
    const s = passiveWithZ(3, 4, 9);
    const from = z0Vector(50, 3);
    const to = z0Vector([[20, 5], [75, -30], [100, 60]], 3);
    for (const kind of ["power", "pseudo"] as const) {
      const back = renormalize(null, renormalize(null, s, from, to, kind), to, from, kind);
      expect(maxDiff(back.data, s.data)).toBeLessThan(1e-12);
    }
  });

  it("power waves and pseudo-waves agree for real references (Marks and Williams 1992; scikit-rf 0.15.4 docstring)", () => {
    const s = passiveWithZ(3, 6, 5);
    const a = renormalize(null, s, z0Vector(50, 3), z0Vector([75, 25, 110], 3), "power");
    const b = renormalize(null, s, z0Vector(50, 3), z0Vector([75, 25, 110], 3), "pseudo");
    expect(maxDiff(a.data, b.data)).toBeLessThan(1e-14);
  });

  it("writes into out, also when out is s itself", () => {
    const s = passiveWithZ(2, 3, 2);
    const fresh = renormalize(null, s, z0Vector(50, 2), z0Vector([60, 90], 2));
    const copy: SData = { n: 2, nf: 3, data: new Float64Array(s.data) };
    const same = renormalize(copy, copy, z0Vector(50, 2), z0Vector([60, 90], 2));
    expect(same).toBe(copy);
    expect(maxDiff(copy.data, fresh.data)).toBe(0);
  });

  it("keeps a lossless network unitary under power-wave renormalisation to complex references (Kurokawa 1965, §IV)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -3, max: 3, noNaN: true }), { minLength: 9, maxLength: 9 }),
        fc.array(fc.double({ min: 1, max: 200, noNaN: true }), { minLength: 3, maxLength: 3 }),
        fc.array(fc.double({ min: -100, max: 100, noNaN: true }), { minLength: 3, maxLength: 3 }),
        (h, rs, xs) => {
          // Cayley transform of a Hermitian H: U = (I − jH)(I + jH)⁻¹ is unitary (common practice).
          const n = 3;
          const a = new Float64Array(2 * n * n);
          const b = new Float64Array(2 * n * n);
          let p = 0;
          for (let i = 0; i < n; i++) {
            for (let j = i; j < n; j++) {
              const re = h[p++];
              const im = i === j ? 0 : h[p++ % 9];
              // H[i][j] = re + j·im, H[j][i] = conj; jH[i][j] = −im + j·re
              const set = (r: number, c: number, hr: number, hi: number) => {
                a[2 * (r * n + c)] = (r === c ? 1 : 0) - hi;
                a[2 * (r * n + c) + 1] = hr;
                b[2 * (r * n + c)] = (r === c ? 1 : 0) + hi;
                b[2 * (r * n + c) + 1] = -hr;
              };
              set(i, j, re, im);
              if (i !== j) set(j, i, re, -im);
            }
          }
          // (I + jH)⁻¹(I − jH) equals (I − jH)(I + jH)⁻¹ (they commute)
          if (!solveComplexInPlace(a, b, n, n)) return true;
          const s: SData = { n, nf: 1, data: b };
          const to = z0Vector([[rs[0], xs[0]], [rs[1], xs[1]], [rs[2], xs[2]]], n);
          const r = renormalize(null, s, z0Vector(50, n), to).data;
          // SᴴS = I
          for (let i = 0; i < n; i++) {
            for (let j = 0; j < n; j++) {
              let re = 0;
              let im = 0;
              for (let k = 0; k < n; k++) {
                const xr = r[2 * (k * n + i)];
                const xi = -r[2 * (k * n + i) + 1];
                const yr = r[2 * (k * n + j)];
                const yi = r[2 * (k * n + j) + 1];
                re += xr * yr - xi * yi;
                im += xr * yi + xi * yr;
              }
              if (Math.abs(re - (i === j ? 1 : 0)) > 1e-9 || Math.abs(im) > 1e-9) return false;
            }
          }
          return true;
        },
      ),
      { numRuns: 200 },
    );
  });

  it("refuses bad references and shapes, and reports a singular I − ΓS", () => {
    const s = passiveWithZ(2, 1, 4);
    expect(() => renormalize(null, s, z0Vector(50, 2), new Float64Array([0, 0, 50, 0]))).toThrow(EngineInputError);
    expect(() => z0Vector([50, -1], 2)).toThrow(/positive real part/);
    expect(() => z0Vector([50], 2)).toThrow(/expected 2 reference impedances/);
    expect(() => renormalize(null, s, z0Vector(50, 1), z0Vector(50, 1))).toThrow(/expected 2/);
    // An active 1-port with Γ = 1/Γa: 1 − Γa·S = 0. Γa = (75 − 50)/(75 + 50) = 0.2, so S = 5.
    expect(() => renormalize(null, oneport([5, 0]), z0Vector(50, 1), z0Vector(75, 1))).toThrow(SingularSystemError);
  });
});

describe("renormalize() against scikit-rf 0.15.4 renormalize_s (networks with a Z matrix)", () => {
  it("a 2-port 6 dB attenuator 50 → 75 Ω, and random passive 3-ports to complex references, both wave kinds", () => {
    requireSkrf();
    // matched 6 dB pad at 50 Ω: S21 = S12 = 10^(−6/20), S11 = S22 = 0 (docs/blocks.md attenuator; Pozar §4.3)
    const a = 10 ** (-6 / 20);
    const pad: SData = { n: 2, nf: 1, data: new Float64Array([0, 0, a, 0, a, 0, 0, 0]) };
    const cases: { s: SData; from: Float64Array; to: Float64Array; kind: "power" | "pseudo" }[] = [
      { s: pad, from: z0Vector(50, 2), to: z0Vector(75, 2), kind: "power" },
      { s: pad, from: z0Vector(50, 2), to: z0Vector([75, 35], 2), kind: "pseudo" },
      { s: passiveWithZ(3, 4, 17), from: z0Vector(50, 3), to: z0Vector([[30, 10], [75, -20], [50, 0]], 3), kind: "power" },
      { s: passiveWithZ(3, 4, 18), from: z0Vector([[40, -5], [60, 0], [90, 30]], 3), to: z0Vector([[75, 25], [20, 0], [50, -50]], 3), kind: "power" },
      { s: passiveWithZ(3, 4, 19), from: z0Vector(50, 3), to: z0Vector([[30, 10], [75, -20], [50, 0]], 3), kind: "pseudo" },
    ];
    const zs = (z: Float64Array) => [Array.from(z).filter((_, i) => i % 2 === 0), Array.from(z).filter((_, i) => i % 2 === 1)];
    const refs = runSkrf<{ s: Cplx }>(
      cases.map((c) => ({ kind: "renorm", s: split(c.s.data, c.s.nf, c.s.n), z_old: zs(c.from), z_new: zs(c.to), s_def: c.kind })),
    );
    cases.forEach((c, i) => {
      const got = renormalize(null, c.s, c.from, c.to, c.kind);
      expect(maxDiff(got.data, interleave(refs[i].s))).toBeLessThan(1e-12);
    });
  });
});
