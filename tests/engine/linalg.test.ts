import { describe, expect, it } from "vitest";
import { cabs, cdiv, cmul } from "../../engine/complex";
import {
  complexMatmul,
  complexMatmulConjA,
  conditionEstimate1,
  hermitianEigenvalues,
  luFactor,
  luSolve,
  luSolveConjTranspose,
  maxSingularValue,
  norm1,
  reciprocityError,
  singularValues,
  solveLinear,
  unitarityError,
} from "../../engine/linalg";
import { SingularSystemError } from "../../engine/types";
import { maxDiff, rng, runPython } from "./network-helpers";
import { solveComplexInPlace } from "../../engine/linalg";

const EPS = 2 ** -52;

function randomMatrix(r: () => number, n: number, m = n): Float64Array {
  return Float64Array.from({ length: 2 * n * m }, () => 2 * r() - 1);
}

describe("complex scalars", () => {
  it("cabs() gives 5 for 3 + 4j (Pythagorean triple, common practice)", () => {
    expect(cabs(3, 4)).toBe(5);
    expect(cabs(-3, -4)).toBe(5);
  });

  it("cabs() does not overflow or underflow where the naive √(re² + im²) does", () => {
    // |1e300·(1 + j)| = √2·1e300 exactly in real arithmetic; the naive form gives Infinity
    expect(Math.sqrt(1e300 ** 2 + 1e300 ** 2)).toBe(Infinity);
    expect(cabs(1e300, 1e300) / (Math.SQRT2 * 1e300)).toBeCloseTo(1, 15);
    // |3e-200 + 4e-200 j| = 5e-200; the naive form underflows to 0
    expect(Math.sqrt(3e-200 ** 2 + 4e-200 ** 2)).toBe(0);
    expect(cabs(3e-200, 4e-200) / 5e-200).toBeCloseTo(1, 15);
    expect(cabs(0, 0)).toBe(0);
    expect(cabs(Infinity, 1)).toBe(Infinity);
  });

  it("cdiv() matches (a + jb)/(c + jd) = ((ac + bd) + j(bc − ad))/(c² + d²) (common practice)", () => {
    const r = rng(11);
    const out = new Float64Array(2);
    for (let i = 0; i < 200; i++) {
      const [a, b, c, d] = [r() - 0.5, r() - 0.5, r() - 0.5, r() - 0.5];
      cdiv(out, 0, a, b, c, d);
      const den = c * c + d * d;
      expect(Math.abs(out[0] - (a * c + b * d) / den)).toBeLessThan(1e-12 * (1 + cabs(out[0], out[1])));
      expect(Math.abs(out[1] - (b * c - a * d) / den)).toBeLessThan(1e-12 * (1 + cabs(out[0], out[1])));
    }
  });

  it("cdiv() by Smith's algorithm survives operands near the overflow threshold", () => {
    // (1e300 + 1e300 j)/(1e300 + 1e300 j) = 1; the textbook formula overflows in c² + d²
    const out = cdiv(new Float64Array(2), 0, 1e300, 1e300, 1e300, 1e300);
    expect(out[0]).toBeCloseTo(1, 15);
    expect(out[1]).toBeCloseTo(0, 15);
    // 1/j = −j
    cdiv(out, 0, 1, 0, 0, 1);
    expect(Array.from(out)).toEqual([0, -1]);
  });

  it("cmul() gives j·j = −1 and is safe when out holds an operand", () => {
    const z = Float64Array.of(0, 1);
    cmul(z, 0, z[0], z[1], z[0], z[1]);
    expect(Array.from(z)).toEqual([-1, 0]);
  });
});

describe("matrix product", () => {
  it("σx·σy = j·σz (Pauli matrices, common practice), also when out aliases an input", () => {
    const sx = Float64Array.of(0, 0, 1, 0, 1, 0, 0, 0);
    const sy = Float64Array.of(0, 0, 0, -1, 0, 1, 0, 0);
    const jsz = Float64Array.of(0, 1, 0, 0, 0, 0, 0, -1);
    expect(Array.from(complexMatmul(new Float64Array(8), sx, sy, 2, 2, 2))).toEqual(Array.from(jsz));
    const a = sx.slice();
    complexMatmul(a, a, sy, 2, 2, 2);
    expect(Array.from(a)).toEqual(Array.from(jsz));
  });

  it("complexMatmulConjA() equals the product with the explicit conjugate transpose", () => {
    const r = rng(5);
    const a = randomMatrix(r, 3, 4); // 3×4
    const b = randomMatrix(r, 3, 2); // 3×2
    const ah = new Float64Array(2 * 12); // 4×3
    for (let i = 0; i < 3; i++)
      for (let j = 0; j < 4; j++) {
        ah[2 * (j * 3 + i)] = a[2 * (i * 4 + j)];
        ah[2 * (j * 3 + i) + 1] = -a[2 * (i * 4 + j) + 1];
      }
    const want = complexMatmul(new Float64Array(16), ah, b, 4, 3, 2);
    expect(maxDiff(complexMatmulConjA(new Float64Array(16), a, b, 3, 4, 2), want)).toBeLessThan(1e-15);
  });
});

describe("LU solve and condition estimate against numpy (Debian python3-numpy via /usr/bin/python3)", () => {
  const r = rng(2024);
  const cases = [1, 2, 5, 9, 16].map((n) => ({ n, a: Array.from(randomMatrix(r, n)), b: Array.from(randomMatrix(r, n, 3)) }));
  // an ill-conditioned case: complex Hilbert-like matrix 1/(i + j + 1) · e^{j(i−j)}
  const nh = 7;
  const hil = new Float64Array(2 * nh * nh);
  for (let i = 0; i < nh; i++)
    for (let j = 0; j < nh; j++) {
      hil[2 * (i * nh + j)] = Math.cos(i - j) / (i + j + 1);
      hil[2 * (i * nh + j) + 1] = Math.sin(i - j) / (i + j + 1);
    }
  cases.push({ n: nh, a: Array.from(hil), b: Array.from(randomMatrix(r, nh, 3)) });
  const ref = runPython<{ x: number[]; xh: number[]; cond: number }[]>(
    `
out = []
for c in data:
    n = c["n"]
    A = cx(c["a"]).reshape(n, n)
    B = cx(c["b"]).reshape(n, 3)
    out.append({"x": flat(np.linalg.solve(A, B)), "xh": flat(np.linalg.solve(A.conj().T, B[:, 0])), "cond": float(np.linalg.cond(A, 1))})
print(json.dumps(out))
`,
    cases,
  );

  cases.forEach((c, i) => {
    it(`luSolve() of a ${c.n}×${c.n} complex system matches numpy.linalg.solve`, () => {
      const a = Float64Array.from(c.a);
      const piv = new Int32Array(c.n);
      const anorm = norm1(a, c.n);
      luFactor(a, c.n, piv);
      const x = luSolve(a, c.n, piv, Float64Array.from(c.b), 3);
      const scale = Math.max(...ref[i].x.map(Math.abs));
      // backward-stable solve: error ≲ κ·ε relative to the solution
      const tol = 50 * ref[i].cond * EPS * scale;
      expect(maxDiff(x, Float64Array.from(ref[i].x))).toBeLessThan(tol);
      const xh = luSolveConjTranspose(a, c.n, piv, Float64Array.from(c.b.filter((_, k) => k % 6 < 2)));
      expect(maxDiff(xh, Float64Array.from(ref[i].xh))).toBeLessThan(50 * ref[i].cond * EPS * Math.max(...ref[i].xh.map(Math.abs)));
      // Hager–Higham: a lower bound of κ₁, in practice within a factor of 3 (Higham 1988, "from memory")
      const est = conditionEstimate1(anorm, a, c.n, piv);
      // The estimate is ‖A⁻¹x‖₁/‖x‖₁ for unit vectors x, a lower bound of κ₁ in exact arithmetic; but both it and
      // numpy's cond(A, 1) apply A⁻¹ through a computed LU, whose columns carry a relative error of order n·κ·ε
      // (Higham, Accuracy and Stability of Numerical Algorithms, 2nd ed., ch. 14, inversion via LU; from memory).
      // For the 7×7 Hilbert-like case (κ₁ ≈ 1e9) that is ≈ 1.5e-6, so a fixed 1e-10 margin was below the rounding
      // of either side: it failed once (985194888.6 vs 985194887.9, 7e-10 apart) when numpy's BLAS took another path.
      expect(est).toBeLessThanOrEqual(ref[i].cond * (1 + 4 * c.n * ref[i].cond * EPS));
      expect(est).toBeGreaterThanOrEqual(ref[i].cond / 3);
    });
  });

  it("solveLinear() reports the condition estimate and leaves A untouched", () => {
    const a = Float64Array.from(cases[2].a);
    const copy = a.slice();
    const { x, condition } = solveLinear(new Float64Array(2 * 5 * 3), a, 5, Float64Array.from(cases[2].b), 3);
    expect(Array.from(a)).toEqual(Array.from(copy));
    expect(maxDiff(x, Float64Array.from(ref[2].x))).toBeLessThan(1e-12);
    expect(condition).toBeGreaterThanOrEqual(ref[2].cond / 3);
  });

  it("solveLinear() raises SingularSystemError on an exactly singular matrix, never NaN", () => {
    // [[1, 2], [2, 4]] has rank 1
    const a = Float64Array.of(1, 0, 2, 0, 2, 0, 4, 0);
    expect(() => solveLinear(new Float64Array(2), a, 2, Float64Array.of(1, 0, 1, 0), 1)).toThrow(SingularSystemError);
    // rank 1 up to rounding: [[1, 1/3], [3, 1]]
    const b = Float64Array.of(1, 0, 1 / 3, 0, 3, 0, 1, 0);
    expect(() => solveLinear(new Float64Array(4), b, 2, Float64Array.of(1, 0, 1, 0), 1)).toThrow(SingularSystemError);
    const z = new Float64Array(8);
    expect(() => luFactor(z, 2, new Int32Array(2))).toThrow(SingularSystemError);
  });
});

describe("Hermitian eigenvalues and singular values against numpy", () => {
  const r = rng(77);
  const mats = [1, 2, 3, 4, 8, 12, 40].map((n) => ({ n, m: Array.from(randomMatrix(r, n)) }));
  const ref = runPython<{ ev: number[]; sv: number[] }[]>(
    `
out = []
for c in data:
    n = c["n"]
    M = cx(c["m"]).reshape(n, n)
    H = M + M.conj().T
    out.append({"ev": np.linalg.eigvalsh(H).tolist(), "sv": np.linalg.svd(M, compute_uv=False).tolist()})
print(json.dumps(out))
`,
    mats,
  );

  mats.forEach((c, i) => {
    it(`hermitianEigenvalues() and singularValues() of ${c.n}×${c.n} match numpy eigvalsh / svd`, () => {
      const n = c.n;
      const m = Float64Array.from(c.m);
      const h = new Float64Array(2 * n * n);
      for (let p = 0; p < n; p++)
        for (let q = 0; q < n; q++) {
          h[2 * (p * n + q)] = m[2 * (p * n + q)] + m[2 * (q * n + p)];
          h[2 * (p * n + q) + 1] = m[2 * (p * n + q) + 1] - m[2 * (q * n + p) + 1];
        }
      const ev = hermitianEigenvalues(new Float64Array(n), h, n);
      const scale = Math.max(...ref[i].ev.map(Math.abs));
      expect(maxDiff(ev, Float64Array.from(ref[i].ev))).toBeLessThan(1e-13 * scale * n);
      const sv = singularValues(m, n);
      // σ from the eigenvalues of MᴴM: the largest is accurate to ε·σ_max
      expect(Math.abs(sv[0] - ref[i].sv[0])).toBeLessThan(1e-13 * ref[i].sv[0] * n);
      expect(maxSingularValue({ n, nf: 1, data: m }, 0)).toBe(sv[0]);
    });
  });
});

describe("Hermitian eigenvalues of structured matrices", () => {
  it("the identity, a zero matrix and a diagonal matrix give their diagonal (already tridiagonal, no reflections)", () => {
    const n = 5;
    const eye = new Float64Array(2 * n * n);
    for (let i = 0; i < n; i++) eye[2 * (i * n + i)] = 1;
    // bisection stops within a few ulps of the eigenvalue
    for (const v of hermitianEigenvalues(new Float64Array(n), eye, n)) expect(Math.abs(v - 1)).toBeLessThan(4 * EPS);
    for (const v of hermitianEigenvalues(new Float64Array(n), new Float64Array(2 * n * n), n)) expect(Math.abs(v)).toBeLessThan(1e-290);
    const diag = new Float64Array(2 * n * n);
    [3, -1, 7, 0.5, 2].forEach((v, i) => (diag[2 * (i * n + i)] = v));
    const ev = hermitianEigenvalues(new Float64Array(n), diag, n);
    [-1, 0.5, 2, 3, 7].forEach((v, i) => expect(ev[i]).toBeCloseTo(v, 14));
  });

  it("the Hermitian [[2, j], [−j, 2]] has eigenvalues 1 and 3 (2 ± |j|, common practice)", () => {
    const ev = hermitianEigenvalues(new Float64Array(2), Float64Array.of(2, 0, 0, 1, 0, -1, 2, 0), 2);
    expect(ev[0]).toBeCloseTo(1, 14);
    expect(ev[1]).toBeCloseTo(3, 14);
  });
});

describe("unitarity and reciprocity defects", () => {
  it("unitarityError() is ~ε for the unitary ideal splitter-like 2×2 rotation and 0.19 for 0.9× it", () => {
    // U = (1/√2)[[1, j], [j, 1]] is unitary (ideal 3 dB quadrature coupler core, Pozar 4th ed. §7.5, from memory)
    const s = Math.SQRT1_2;
    const u = Float64Array.of(s, 0, 0, s, 0, s, s, 0);
    expect(unitarityError({ n: 2, nf: 1, data: u }, 0)).toBeLessThan(4 * EPS);
    // (0.9U)ᴴ(0.9U) − I = −0.19·I, so the max-abs entry is 0.19 exactly in real arithmetic
    const v = u.map((x) => 0.9 * x);
    expect(unitarityError({ n: 2, nf: 1, data: v }, 0)).toBeCloseTo(0.19, 14);
    // the second frequency of a stack is read, not the first
    const two = new Float64Array(16);
    two.set(u, 0);
    two.set(v, 8);
    expect(unitarityError({ n: 2, nf: 2, data: two }, 1)).toBeCloseTo(0.19, 14);
  });

  it("reciprocityError() is max |Sij − Sji|", () => {
    // S12 = 0.5, S21 = 0.5 + 0.1j → |difference| = 0.1
    const d = Float64Array.of(0.1, 0, 0.5, 0, 0.5, 0.1, 0, 0);
    expect(reciprocityError({ n: 2, nf: 1, data: d }, 0)).toBeCloseTo(0.1, 15);
    expect(reciprocityError({ n: 1, nf: 1, data: Float64Array.of(0.3, 0.4) }, 0)).toBe(0);
  });

  it("maxSingularValue() of a unitary 1-port is 1 and of an empty network is 0", () => {
    expect(maxSingularValue({ n: 1, nf: 1, data: Float64Array.of(0.6, 0.8) }, 0)).toBeCloseTo(1, 15);
    expect(maxSingularValue({ n: 0, nf: 1, data: new Float64Array(0) }, 0)).toBe(0);
  });
});

describe("solveComplexInPlace (the LU for callers that name their own errors)", () => {
  it("matches numpy.linalg.solve (Debian python3-numpy) and reports a numerically singular matrix", () => {
    const r = rng(77);
    const n = 6;
    const a = randomMatrix(r, n);
    const b = randomMatrix(r, n, 2);
    const ref = runPython<number[]>("n = 6\nprint(json.dumps(flat(np.linalg.solve(cx(data['a']).reshape(n, n), cx(data['b']).reshape(n, 2)))))", { a: Array.from(a), b: Array.from(b) });
    const x = b.slice();
    expect(solveComplexInPlace(a.slice(), x, n, 2)).toBe(true);
    expect(maxDiff(x, Float64Array.from(ref))).toBeLessThan(1e-12);
    // rank 1 up to rounding: row 2 = c · row 1 with c = 1/3 + 0.1j rounded, so the second pivot is of the
    // order of ε·max|A|, below the 64·ε·max|A| threshold (common practice)
    const [cr, ci] = [1 / 3, 0.1];
    const row = [0.7, 1.3, 2.9, -0.4];
    const s = Float64Array.of(row[0], row[1], row[2], row[3], cr * row[0] - ci * row[1], cr * row[1] + ci * row[0], cr * row[2] - ci * row[3], cr * row[3] + ci * row[2]);
    expect(solveComplexInPlace(s, Float64Array.of(1, 0, 1, 0), 2, 1)).toBe(false);
    expect(solveComplexInPlace(new Float64Array(8), Float64Array.of(1, 0, 1, 0), 2, 1)).toBe(false);
  });
});
