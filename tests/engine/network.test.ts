import { describe, expect, it } from "vitest";
import { internalWaves, planFor, solveDense, solveSystem } from "../../engine/network";
import { EngineInputError, SingularSystemError, type PreparedSystem, type SData, type Solution } from "../../engine/types";
import { constantS, makeSystem, maxDiff, randomS, randomTopology, rng, runPython, type SystemDef } from "./network-helpers";

const c = (re: number, im = 0): [number, number] => [re, im];
const at = (sol: Solution, k: number, i: number, j: number): [number, number] => {
  const n = sol.s.n;
  return [sol.s.data[2 * ((k * n + i) * n + j)], sol.s.data[2 * ((k * n + i) * n + j) + 1]];
};
const both = (sys: PreparedSystem) => [solveSystem(sys), solveDense(sys)] as const;

describe("closed forms", () => {
  it("solveSystem() of two matched 3 dB pads gives 6 dB (dB of cascaded matched two-ports add, common practice)", () => {
    const pad = (db: number) => {
      const g = 10 ** (-db / 20);
      return constantS([[c(0), c(g)], [c(g), c(0)]], 3);
    };
    const sys = makeSystem({ blocks: [{ id: "PAD1", s: pad(3) }, { id: "PAD2", s: pad(3) }], links: [["PAD1:2", "PAD2:1"]], ports: [{ name: "IN", at: "PAD1:1" }, { name: "OUT", at: "PAD2:2" }] });
    for (const sol of both(sys)) {
      for (let k = 0; k < 3; k++) {
        const [re, im] = at(sol, k, 1, 0);
        expect(20 * Math.log10(Math.hypot(re, im))).toBeCloseTo(-6, 12);
        expect(im).toBe(0);
        expect(Math.hypot(...at(sol, k, 0, 0))).toBeLessThan(1e-16);
      }
    }
  });

  it("a mismatched load at the end of a matched line gives Γin = ΓL·e^(−2jθ) (Pozar, Microwave Engineering, 4th ed., eq. 2.42, from memory)", () => {
    const thetas = [0.3, 1.1, 2.9];
    const gl = c(0.4, -0.25);
    const line = { n: 2, nf: 3, data: new Float64Array(24) };
    thetas.forEach((t, k) => {
      line.data.set([0, 0, Math.cos(t), -Math.sin(t), Math.cos(t), -Math.sin(t), 0, 0], 8 * k);
    });
    const sys = makeSystem({ blocks: [{ id: "LINE", s: line }, { id: "LOAD", s: constantS([[gl]], 3) }], links: [["LINE:2", "LOAD:1"]], ports: [{ name: "IN", at: "LINE:1" }] });
    for (const sol of both(sys)) {
      thetas.forEach((t, k) => {
        const want = [gl[0] * Math.cos(2 * t) + gl[1] * Math.sin(2 * t), gl[1] * Math.cos(2 * t) - gl[0] * Math.sin(2 * t)];
        const [re, im] = at(sol, k, 0, 0);
        expect(Math.abs(re - want[0])).toBeLessThan(1e-15);
        expect(Math.abs(im - want[1])).toBeLessThan(1e-15);
      });
    }
  });

  it("a 50 Ω matched load seen from a 75 Ω system port reflects Γ = (50 − 75)/(50 + 75) = −0.2 (Pozar, 4th ed., eq. 2.35, from memory)", () => {
    const sys = makeSystem({ blocks: [{ id: "T", s: constantS([[c(0)]], 2) }], links: [], ports: [{ name: "A", at: "T:1", z0: 75 }] });
    for (const sol of both(sys)) {
      expect(at(sol, 0, 0, 0)[0]).toBeCloseTo(-0.2, 15);
      expect(sol.portZ0).toEqual([75]);
    }
  });

  it("a 50 Ω line section between 75 Ω system ports matches S from its ABCD matrix (Pozar, 4th ed., Table 4.2, from memory)", () => {
    // A matched 50 Ω line section of electrical length θ between 75 Ω ports, from its ABCD matrix
    // [[cos θ, jZ sin θ], [j sin θ / Z, cos θ]] and S21 = 2 / (A + B/Z0 + C·Z0 + D) (Pozar Table 4.2, from memory).
    const theta = 0.7;
    const Z = 50;
    const Z0 = 75;
    const line = constantS([[c(0), c(Math.cos(theta), -Math.sin(theta))], [c(Math.cos(theta), -Math.sin(theta)), c(0)]], 1);
    const sys = makeSystem({ blocks: [{ id: "L", s: line }], links: [], ports: [{ name: "A", at: "L:1", z0: Z0 }, { name: "B", at: "L:2", z0: Z0 }] });
    // den = A + B/Z0 + C·Z0 + D = 2cos θ + j sin θ (Z/Z0 + Z0/Z)
    const dr = 2 * Math.cos(theta);
    const di = Math.sin(theta) * (Z / Z0 + Z0 / Z);
    const s21 = [(2 * dr) / (dr * dr + di * di), (-2 * di) / (dr * dr + di * di)];
    // S11 = (A + B/Z0 − C·Z0 − D)/den = j sin θ (Z/Z0 − Z0/Z) / den
    const nr = 0;
    const ni = Math.sin(theta) * (Z / Z0 - Z0 / Z);
    const s11 = [(nr * dr + ni * di) / (dr * dr + di * di), (ni * dr - nr * di) / (dr * dr + di * di)];
    for (const sol of both(sys)) {
      expect(Math.abs(at(sol, 0, 1, 0)[0] - s21[0])).toBeLessThan(1e-15);
      expect(Math.abs(at(sol, 0, 1, 0)[1] - s21[1])).toBeLessThan(1e-15);
      expect(Math.abs(at(sol, 0, 0, 0)[0] - s11[0])).toBeLessThan(1e-15);
      expect(Math.abs(at(sol, 0, 0, 0)[1] - s11[1])).toBeLessThan(1e-15);
    }
  });
});

describe("against scikit-rf 0.15.4 connect_s / innerconnect_s (Debian python3-scikit-rf via /usr/bin/python3)", () => {
  const r = rng(31337);
  const cases: { label: string; def: SystemDef }[] = [];
  for (let i = 0; i < 6; i++) {
    const n = 2 + Math.floor(r() * 8);
    const blocks = Array.from({ length: n }, (_, b) => ({ id: `C${b}`, s: randomS(r, 2, 4, 0.45) }));
    const links = Array.from({ length: n - 1 }, (_, b) => [`C${b}:2`, `C${b + 1}:1`] as [string, string]);
    cases.push({ label: `chain of ${n}`, def: { blocks, links, ports: [{ name: "IN", at: "C0:1" }, { name: "OUT", at: `C${n - 1}:2` }] } });
  }
  for (let i = 0; i < 6; i++) cases.push({ label: `tree ${i}`, def: randomTopology(r, { blocks: 3 + i, maxPorts: 4, extraLinks: 0, flavour: "general", unterminated: i % 2 === 0, nf: 3 }) });
  for (let i = 0; i < 8; i++) cases.push({ label: `loops ${i}`, def: randomTopology(r, { blocks: 2 + i, maxPorts: 4, extraLinks: 1 + (i % 3), flavour: "general", unterminated: i % 2 === 1, nf: 3 }) });
  // a block with two of its own ports linked together
  cases.push({ label: "self link", def: { blocks: [{ id: "Q", s: randomS(r, 4, 2, 0.45) }, { id: "R", s: randomS(r, 2, 2, 0.45) }], links: [["Q:2", "Q:4"], ["Q:3", "R:1"]], ports: [{ name: "A", at: "Q:1" }, { name: "B", at: "R:2" }] } });
  const systems = cases.map((x) => makeSystem(x.def));
  const ref = runPython<number[][]>(
    `
import skrf
from skrf.network import connect_s, innerconnect_s
res = []
for c in data:
    nets = []
    for b in c["blocks"]:
        S = cx(b["data"]).reshape(b["nf"], b["n"], b["n"])
        nets.append([S, list(range(b["off"], b["off"] + b["n"]))])
    for p, q in c["links"]:
        ia = next(i for i, nw in enumerate(nets) if p in nw[1])
        ib = next(i for i, nw in enumerate(nets) if q in nw[1])
        if ia == ib:
            S, lab = nets[ia]
            nets[ia] = [innerconnect_s(S, lab.index(p), lab.index(q)), [x for x in lab if x not in (p, q)]]
        else:
            SA, la = nets[ia]
            SB, lb = nets[ib]
            new = [connect_s(SA, la.index(p), SB, lb.index(q)), [x for x in la if x != p] + [x for x in lb if x != q]]
            nets = [nw for i, nw in enumerate(nets) if i not in (ia, ib)] + [new]
    ports = c["ports"]
    nf = c["blocks"][0]["nf"]
    out = np.zeros((nf, len(ports), len(ports)), dtype=complex)
    for i, pi in enumerate(ports):
        for j, pj in enumerate(ports):
            for S, lab in nets:
                if pi in lab and pj in lab:
                    out[:, i, j] = S[:, lab.index(pi), lab.index(pj)]
    res.append(flat(out))
print(json.dumps(res))
`,
    systems.map((sys) => ({
      blocks: sys.blocks.map((b, i) => ({ n: b.s.n, nf: b.s.nf, off: sys.blockOffset[i], data: Array.from(b.s.data) })),
      links: sys.links,
      ports: sys.systemPorts.map((p) => p.at),
    })),
  );

  cases.forEach((x, i) => {
    it(`solveSystem() and solveDense() of a random ${x.label} agree with scikit-rf to 1e-9`, () => {
      const want = Float64Array.from(ref[i]);
      const [g, d] = both(systems[i]);
      expect(maxDiff(g.s.data, want)).toBeLessThan(1e-9);
      expect(maxDiff(d.s.data, want)).toBeLessThan(1e-9);
    });
  });
});

describe("reference impedance of system ports", () => {
  it("ports with their own Z0 match the power-wave renormalisation computed through Z-parameters in numpy", () => {
    // Z = √R (I + S)(I − S)⁻¹ √R and S' = (√R'⁻¹ Z √R'⁻¹ − I)(√R'⁻¹ Z √R'⁻¹ + I)⁻¹ for real references
    // (Kurokawa 1965; Pozar 4th ed. eq. 4.44–4.45, from memory)
    const r = rng(99);
    const def = randomTopology(r, { blocks: 5, maxPorts: 3, extraLinks: 1, flavour: "passive", unterminated: false, nf: 3 });
    const z0s = [75, 50, 25, 100, 60, 35, 50, 120];
    def.ports.forEach((p, i) => (p.z0 = z0s[i % z0s.length]));
    const sys50 = makeSystem({ ...def, ports: def.ports.map((p) => ({ ...p, z0: 50 })) });
    const sys = makeSystem(def);
    const base = solveDense(sys50);
    const want = runPython<number[]>(
      `
S = cx(data["s"]).reshape(data["nf"], data["n"], data["n"])
R = np.diag(np.sqrt(np.full(data["n"], 50.0)))
Rn = np.diag(1 / np.sqrt(np.array(data["z0"], dtype=float)))
I = np.eye(data["n"])
out = []
for k in range(data["nf"]):
    Z = R @ (I + S[k]) @ np.linalg.inv(I - S[k]) @ R
    zn = Rn @ Z @ Rn
    out.append((zn - I) @ np.linalg.inv(zn + I))
print(json.dumps(flat(np.array(out))))
`,
      { s: Array.from(base.s.data), nf: 3, n: base.s.n, z0: def.ports.map((p) => p.z0) },
    );
    for (const sol of both(sys)) expect(maxDiff(sol.s.data, Float64Array.from(want))).toBeLessThan(1e-12);
  });
});

describe("singular and ill-conditioned systems", () => {
  it("two open-circuit 1-ports linked together raise SingularSystemError naming the link and the frequency", () => {
    // Γ = 1 on both sides: 1 − Γ1Γ2 = 0, a lossless resonance (the waves bounce forever)
    const open = constantS([[c(1)]], 2);
    const sys = makeSystem({
      frequencies: [1e9, 2e9],
      blocks: [{ id: "O1", s: open }, { id: "O2", s: open }, { id: "PAD", s: constantS([[c(0), c(0.5)], [c(0.5), c(0)]], 2) }],
      links: [["O1:1", "O2:1"]],
      ports: [{ name: "A", at: "PAD:1" }, { name: "B", at: "PAD:2" }],
    });
    for (const solve of [solveSystem, solveDense]) {
      let err: unknown;
      try {
        solve(sys);
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(SingularSystemError);
      expect((err as SingularSystemError).links).toContain("O1:1–O2:1");
      expect((err as SingularSystemError).frequencyHz).toBe(1e9);
    }
  });

  it("a shorted lossless line at its half-wave resonance raises SingularSystemError at that frequency only", () => {
    // shorts (Γ = −1) at both ends of a lossless line: resonance where e^(−2jθ) = 1, θ = π (Pozar 4th ed. §6.2, from memory)
    const thetas = [2, Math.PI, 4];
    const line = { n: 2, nf: 3, data: new Float64Array(24) };
    thetas.forEach((t, k) => line.data.set([0, 0, Math.cos(t), -Math.sin(t), Math.cos(t), -Math.sin(t), 0, 0], 8 * k));
    const short = constantS([[c(-1)]], 3);
    const coupler = constantS([[c(0), c(0.6), c(0)], [c(0.6), c(0), c(0.8)], [c(0), c(0.8), c(0)]], 3);
    const sys = makeSystem({
      frequencies: [1e9, 1.5e9, 2e9],
      blocks: [{ id: "S1", s: short }, { id: "LINE", s: line }, { id: "S2", s: short }, { id: "X", s: coupler }],
      links: [["S1:1", "LINE:1"], ["LINE:2", "S2:1"]],
      ports: [{ name: "A", at: "X:1" }, { name: "B", at: "X:2" }, { name: "C", at: "X:3" }],
    });
    for (const solve of [solveSystem, solveDense]) {
      expect(() => solve(sys)).toThrow(SingularSystemError);
      try {
        solve(sys);
      } catch (e) {
        expect((e as SingularSystemError).frequencyHz).toBe(1.5e9);
      }
    }
    // away from resonance the same system solves, with finite values
    const line2 = { n: 2, nf: 3, data: line.data.slice() };
    line2.data.set([0, 0, Math.cos(3), -Math.sin(3), Math.cos(3), -Math.sin(3), 0, 0], 8);
    const sol = solveSystem(sys, { replace: { LINE: line2 } });
    expect(sol.s.data.every(Number.isFinite)).toBe(true);
  });

  it("a nearly lossless resonance solves but warns that the interconnection is ill-conditioned", () => {
    // Γ1Γ2 = 1 − 1e−10: 1 − Γ1Γ2 = 1e−10, condition ≈ 2e10
    const sys = makeSystem({
      blocks: [{ id: "O1", s: constantS([[c(1)]], 1) }, { id: "T", s: constantS([[c(1 - 1e-10), c(0)], [c(0), c(0)]], 1) }],
      links: [["O1:1", "T:1"]],
      ports: [{ name: "A", at: "T:2" }],
    });
    for (const sol of both(sys)) {
      expect(sol.warnings.some((w) => w.includes("ill-conditioned"))).toBe(true);
      expect(sol.s.data.every(Number.isFinite)).toBe(true);
    }
  });
});

describe("join order", () => {
  it("a chain of 300 two-ports is grown keeping two open ports (sub-network growth from one end, common practice)", () => {
    const r = rng(300);
    const n = 300;
    const blocks = Array.from({ length: n }, (_, i) => ({ id: `C${i}`, s: randomS(r, 2, 1, 0.45) }));
    const links = Array.from({ length: n - 1 }, (_, i) => [`C${i}:2`, `C${i + 1}:1`] as [string, string]);
    const sys = makeSystem({ blocks, links, ports: [{ name: "IN", at: "C0:1" }, { name: "OUT", at: `C${n - 1}:2` }] });
    const plan = planFor(sys);
    expect(plan.steps.length).toBe(n - 1);
    expect(Math.max(...plan.steps.map((s) => s.ports.length))).toBe(2);
    expect(maxDiff(solveSystem(sys).s.data, solveDense(sys).s.data)).toBeLessThan(1e-12);
  });
});

describe("bookkeeping", () => {
  it("unlinked block ports are matched terminations: same as keeping them as 50 Ω system ports and dropping their rows", () => {
    const r = rng(4);
    const s3 = randomS(r, 3, 2, 0.5);
    const s2 = randomS(r, 2, 2, 0.5);
    const open = makeSystem({ blocks: [{ id: "A", s: s3 }, { id: "B", s: s2 }], links: [["A:2", "B:1"]], ports: [{ name: "X", at: "A:1" }, { name: "Y", at: "B:2" }] });
    const full = makeSystem({ blocks: [{ id: "A", s: s3 }, { id: "B", s: s2 }], links: [["A:2", "B:1"]], ports: [{ name: "X", at: "A:1" }, { name: "M", at: "A:3" }, { name: "Y", at: "B:2" }] });
    const a = solveSystem(open);
    const b = solveSystem(full);
    for (let k = 0; k < 2; k++)
      for (const [i, bi] of [[0, 0], [1, 2]])
        for (const [j, bj] of [[0, 0], [1, 2]]) expect(at(a, k, i, j)).toEqual(at(b, k, bi, bj));
    expect(a.warnings).toEqual(open.warnings);
    expect(a.warnings.length).toBe(1);
  });

  it("disconnected parts give zero transmission between them", () => {
    const r = rng(8);
    const sys = makeSystem({ blocks: [{ id: "A", s: randomS(r, 2, 1, 0.5) }, { id: "B", s: randomS(r, 2, 1, 0.5) }], links: [], ports: [{ name: "1", at: "A:1" }, { name: "2", at: "B:1" }, { name: "3", at: "A:2" }] });
    const [g, d] = both(sys);
    expect(at(g, 0, 0, 1)).toEqual([0, 0]);
    expect(at(g, 0, 1, 2)).toEqual([0, 0]);
    expect(maxDiff(g.s.data, d.s.data)).toBeLessThan(1e-16);
    const s = sys.blocks[0].s.data;
    expect(at(g, 0, 2, 0)).toEqual([s[4], s[5]]);
  });

  it("replace swaps a block's S without re-preparing, and equals solving a system built with it", () => {
    const r = rng(12);
    const def = randomTopology(r, { blocks: 6, maxPorts: 3, extraLinks: 2, flavour: "general", unterminated: true, nf: 2 });
    const sys = makeSystem(def);
    const other: SData = randomS(r, def.blocks[2].s.n, 2, 0.45);
    const swapped = makeSystem({ ...def, blocks: def.blocks.map((b, i) => (i === 2 ? { id: b.id, s: other } : b)) });
    const first = solveSystem(sys);
    const viaReplace = solveSystem(sys, { replace: { B2: other } });
    expect(maxDiff(viaReplace.s.data, solveSystem(swapped).s.data)).toBe(0);
    expect(maxDiff(viaReplace.s.data, first.s.data)).toBeGreaterThan(1e-6);
    expect(maxDiff(solveDense(sys, { replace: { B2: other } }).s.data, viaReplace.s.data)).toBeLessThan(1e-12);
  });

  it("bad input raises EngineInputError: unknown replacement, wrong shape, non-finite S, a port linked twice", () => {
    const r = rng(1);
    const sys = makeSystem({ blocks: [{ id: "A", s: randomS(r, 2, 2) }, { id: "B", s: randomS(r, 2, 2) }], links: [["A:2", "B:1"]], ports: [{ name: "X", at: "A:1" }] });
    expect(() => solveSystem(sys, { replace: { NOPE: randomS(r, 2, 2) } })).toThrow(EngineInputError);
    expect(() => solveSystem(sys, { replace: { A: randomS(r, 3, 2) } })).toThrow(EngineInputError);
    const bad = randomS(r, 2, 2);
    bad.data[5] = NaN;
    expect(() => solveSystem(sys, { replace: { B: bad } })).toThrow(/non-finite/);
    const twice: PreparedSystem = { ...sys, links: [[1, 2], [1, 3]] };
    expect(() => solveSystem(twice)).toThrow(EngineInputError);
  });

  it("internalWaves() of an older solution stays right after later solves of the same system (and writes into `out`)", () => {
    const r = rng(21);
    const def = randomTopology(r, { blocks: 5, maxPorts: 3, extraLinks: 1, flavour: "passive", unterminated: true, nf: 3, portZ0: [50, 75] });
    const sys = makeSystem(def);
    const E = sys.systemPorts.length;
    const inc = Float64Array.from({ length: 2 * 3 * E }, () => 2 * r() - 1);
    const first = solveSystem(sys);
    const other = randomS(r, def.blocks[1].s.n, 3, 0.3);
    const second = solveSystem(sys, { replace: { B1: other } });
    // dense solves keep their own data: the references
    const want1 = internalWaves(solveDense(sys), inc);
    const want2 = internalWaves(solveDense(sys, { replace: { B1: other } }), inc);
    const got1 = internalWaves(first, inc);
    expect(maxDiff(got1.a, want1.a)).toBeLessThan(1e-12);
    expect(maxDiff(got1.b, want1.b)).toBeLessThan(1e-12);
    const out = { a: new Float64Array(got1.a.length).fill(7), b: new Float64Array(got1.b.length).fill(7) };
    const got2 = internalWaves(second, inc, out);
    expect(got2.a).toBe(out.a);
    expect(maxDiff(got2.a, want2.a)).toBeLessThan(1e-12);
    expect(maxDiff(got2.b, want2.b)).toBeLessThan(1e-12);
    expect(maxDiff(internalWaves(first, inc).a, want1.a)).toBeLessThan(1e-12);
  });

  it("edge cases: no system ports, no frequencies, no blocks, and a non-positive or infinite port Z0", () => {
    const r = rng(3);
    const closed = makeSystem({ blocks: [{ id: "A", s: randomS(r, 2, 2, 0.4) }, { id: "B", s: randomS(r, 2, 2, 0.4) }], links: [["A:2", "B:1"]], ports: [] });
    for (const [sol] of [[solveSystem(closed)], [solveDense(closed)]]) {
      expect(sol.s.n).toBe(0);
      // no excitation: every wave is zero
      expect(internalWaves(sol, new Float64Array(0)).b.every((x) => x === 0)).toBe(true);
    }
    const noFreq = makeSystem({ frequencies: [], blocks: [{ id: "A", s: { n: 2, nf: 0, data: new Float64Array(0) } }], links: [], ports: [{ name: "X", at: "A:1" }] });
    expect(solveSystem(noFreq).s).toEqual({ n: 1, nf: 0, data: new Float64Array(0) });
    const empty = makeSystem({ frequencies: [1e9], blocks: [], links: [], ports: [] });
    expect(solveSystem(empty).s.data.length).toBe(0);
    for (const z0 of [0, -50, Infinity, NaN]) {
      const sys = makeSystem({ blocks: [{ id: "A", s: randomS(r, 1, 1) }], links: [], ports: [{ name: "X", at: "A:1", z0 }] });
      expect(() => solveSystem(sys)).toThrow(EngineInputError);
    }
  });

  it("internalWaves() needs the wave data of a solve and an excitation of the right length", () => {
    const r = rng(2);
    const sys = makeSystem({ blocks: [{ id: "A", s: randomS(r, 2, 3) }], links: [], ports: [{ name: "X", at: "A:1" }] });
    expect(() => internalWaves(solveSystem(sys, { waves: false }), new Float64Array(6))).toThrow(EngineInputError);
    expect(() => internalWaves(solveSystem(sys), new Float64Array(4))).toThrow(EngineInputError);
  });
});
