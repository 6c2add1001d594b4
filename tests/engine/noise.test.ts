// Noise of blocks and of the assembled system (engine/noise): closed forms from the literature, Bosma's theorem
// on the composite, numpy's dense reference for the interconnection, and scikit-rf 0.15.4's noisy networks
// for a mismatched two-stage cascade and for the noise-parameter conversions.
import { describe, expect, it } from "vitest";
import {
  BOLTZMANN,
  T0,
  blockNoise,
  chainFromNoiseParameters,
  chainFromWave,
  noiseFigure,
  noiseParametersFromChain,
  parseTouchstone,
  prepareSystem,
  systemNoise,
  waveFromChain,
  type Scenario,
} from "@/engine";
import { makeSystem, randomBlockS, rng, runPython } from "./network-helpers";
import { runPythonJson } from "./reference/python";

/** runPython of network-helpers with scikit-rf 0.15.4 imported first. */
function runSkrf<T>(script: string, input: unknown): T {
  const helpers = [
    "import sys, json",
    "data = json.load(sys.stdin)",
    "def flat(a): return np.ascontiguousarray(np.asarray(a, dtype=complex)).view(float).ravel().tolist()",
    "",
  ].join("\n");
  return runPythonJson<T>(helpers + script, input, { skrf: true });
}

const kT0 = BOLTZMANN * T0;
const db = (x: number): number => 10 * Math.log10(x);
const lin = (d: number): number => 10 ** (d / 10);

function scenario(partial: Partial<Scenario>): Scenario {
  return { format: "portolan.scenario/1", name: "noise", z0: 50, frequency: { list: [1e9, 2e9, 3e9] }, blocks: [], links: [], ports: [], ...partial };
}

/** One S2P line (1.1, RI) per frequency from [S11, S21, S12, S22] as [re, im] pairs. */
function s2pLine(fGHz: number, s11: number[], s21: number[], s12: number[], s22: number[]): string {
  return [fGHz, ...s11, ...s21, ...s12, ...s22].join(" ");
}

describe("noise figure of simple chains", () => {
  it("Friis: matched cascade of amplifier, attenuator, amplifier (Pozar, Microwave Engineering, 4th ed., ch. 10, the cascade formula F = F1 + (F2 − 1)/G1 + (F3 − 1)/(G1·G2) — equation number from memory)", () => {
    const sys = prepareSystem(
      scenario({
        blocks: [
          { id: "A1", kind: "amplifier", params: { gain_db: 15, reverse_isolation_db: null, noise_figure_db: 1.5 } },
          { id: "PAD", kind: "attenuator", params: { loss_db: 3 } },
          { id: "A2", kind: "amplifier", params: { gain_db: 20, reverse_isolation_db: null, noise_figure_db: 6 } },
        ],
        links: [
          ["A1:2", "PAD:1"],
          ["PAD:2", "A2:1"],
        ],
        ports: [
          { name: "IN", at: "A1:1" },
          { name: "OUT", at: "A2:2" },
        ],
      }),
    );
    const f = noiseFigure(systemNoise(sys, { outputs: [1] }), 0, 1);
    const F1 = lin(1.5);
    const G1 = lin(15);
    const Fpad = lin(3); // attenuator at 290 K: F = L
    const Gpad = 1 / lin(3);
    const F3 = lin(6);
    const friis = F1 + (Fpad - 1) / G1 + (F3 - 1) / (G1 * Gpad);
    for (const v of f) expect(v).toBeCloseTo(friis, 10);
  });

  it("an attenuator of loss L at 290 K has F = L; at T, F = 1 + (L − 1)·T/T0 (Pozar, 4th ed., ch. 10, lossy line noise figure, from memory)", () => {
    for (const [L, T] of [
      [6, 290],
      [10, 77],
      [1, 500],
    ]) {
      const sys = prepareSystem(
        scenario({
          temperature_k: T,
          blocks: [{ id: "PAD", kind: "attenuator", params: { loss_db: L } }],
          ports: [
            { name: "A", at: "PAD:1" },
            { name: "B", at: "PAD:2" },
          ],
        }),
      );
      const f = noiseFigure(systemNoise(sys), 0, 1);
      for (const v of f) expect(v).toBeCloseTo(1 + (lin(L) - 1) * (T / T0), 10);
    }
  });

  it("an amplifier's figure from a Z0 source is its noise_figure_db whatever its return losses (the model of the issue)", () => {
    const sys = prepareSystem(
      scenario({
        blocks: [
          {
            id: "A",
            kind: "amplifier",
            params: { gain_db: 12, reverse_isolation_db: 20, input_return_loss_db: 6, output_return_loss_db: 9, noise_figure_db: 2.5 },
          },
        ],
        ports: [
          { name: "IN", at: "A:1" },
          { name: "OUT", at: "A:2" },
        ],
      }),
    );
    for (const v of noiseFigure(systemNoise(sys), 0, 1)) expect(db(v)).toBeCloseTo(2.5, 10);
  });

  it("an antenna at noise_temperature_k sends kT(1 − |S11|²) out of its feed", () => {
    const sys = prepareSystem(
      scenario({
        blocks: [{ id: "ANT", kind: "antenna", params: { return_loss_db: 10, noise_temperature_k: 40 } }],
        ports: [{ name: "F", at: "ANT:1" }],
      }),
    );
    const noise = systemNoise(sys);
    for (let k = 0; k < 3; k++) expect(noise.c.data[2 * k] / (BOLTZMANN * 40)).toBeCloseTo(1 - 0.1, 12);
  });
});

describe("composite noise through the interconnection", () => {
  it("a passive network at 290 K has C = kT0(I − S·Sᴴ) and F = 1/G_available at every port pair (Bosma's theorem), loops, unlinked ports and port Z0 steps included", () => {
    const r = rng(16);
    const nf = 4;
    const sys = makeSystem({
      blocks: [
        { id: "A", s: randomBlockS(r, 3, nf, "passive") },
        { id: "B", s: randomBlockS(r, 4, nf, "reciprocal") },
        { id: "C", s: randomBlockS(r, 2, nf, "passive") },
        { id: "D", s: randomBlockS(r, 3, nf, "lossless") },
      ],
      links: [
        ["A:2", "B:1"],
        ["B:2", "C:1"],
        ["C:2", "D:1"],
        ["D:2", "A:3"], // a loop
        ["B:3", "D:3"],
      ],
      ports: [
        { name: "P1", at: "A:1", z0: 75 },
        { name: "P2", at: "B:4" },
      ],
    });
    // no port left unlinked above: add one with a fresh system where C:2 is open
    const open = makeSystem({
      blocks: [
        { id: "A", s: randomBlockS(r, 3, nf, "passive") },
        { id: "B", s: randomBlockS(r, 4, nf, "reciprocal") },
        { id: "C", s: randomBlockS(r, 2, nf, "passive") },
      ],
      links: [
        ["A:2", "B:1"],
        ["B:2", "C:1"],
        ["B:3", "A:3"],
      ],
      ports: [
        { name: "P1", at: "A:1", z0: 30 },
        { name: "P2", at: "B:4", z0: 100 },
        { name: "P3", at: "C:2" },
      ],
    });
    for (const s of [sys, open]) {
      const noise = systemNoise(s);
      const E = noise.s.n;
      const S = noise.s.data;
      for (let k = 0; k < nf; k++) {
        for (let i = 0; i < E; i++) {
          for (let j = 0; j < E; j++) {
            let re = i === j ? 1 : 0;
            let im = 0;
            for (let m = 0; m < E; m++) {
              const ar = S[2 * ((k * E + i) * E + m)];
              const ai = S[2 * ((k * E + i) * E + m) + 1];
              const br = S[2 * ((k * E + j) * E + m)];
              const bi = S[2 * ((k * E + j) * E + m) + 1];
              re -= ar * br + ai * bi;
              im -= ai * br - ar * bi;
            }
            expect(noise.c.data[2 * ((k * E + i) * E + j)] / kT0).toBeCloseTo(re, 10);
            expect(noise.c.data[2 * ((k * E + i) * E + j) + 1] / kT0).toBeCloseTo(im, 10);
          }
        }
      }
      for (let i = 0; i < E; i++) {
        for (let j = 0; j < E; j++) {
          if (i === j) continue;
          const f = noiseFigure(noise, i, j);
          for (let k = 0; k < nf; k++) {
            const sji = Math.hypot(S[2 * ((k * E + j) * E + i)], S[2 * ((k * E + j) * E + i) + 1]);
            const sjj = Math.hypot(S[2 * ((k * E + j) * E + j)], S[2 * ((k * E + j) * E + j) + 1]);
            // available gain from i to j with every other port matched: |S_ji|²/(1 − |S_jj|²)
            const gA = (sji * sji) / (1 - sjj * sjj);
            expect(f[k] * gA).toBeCloseTo(1, 9);
          }
        }
      }
    }
  });

  it("matches numpy's dense T·C·Tᴴ with T = Eᵀ(I − S·Γ)⁻¹ on an active, looped, mismatched chart with Z0 steps", () => {
    const r = rng(1976);
    const nf = 3;
    const sys = makeSystem({
      blocks: [
        { id: "A", s: randomBlockS(r, 3, nf, "general") },
        { id: "B", s: randomBlockS(r, 2, nf, "general") },
        { id: "C", s: randomBlockS(r, 4, nf, "passive") },
        { id: "D", s: randomBlockS(r, 2, nf, "general") },
      ],
      links: [
        ["A:2", "B:1"],
        ["B:2", "C:1"],
        ["C:2", "A:3"],
        ["C:3", "D:1"],
      ],
      ports: [
        { name: "P1", at: "A:1", z0: 35 },
        { name: "P2", at: "D:2", z0: 80 },
        { name: "P3", at: "C:4" },
      ],
    });
    // give the active 2-ports noise data (chain form) so that every block is noisy in its own way
    for (const id of ["B", "D"]) {
      const blk = sys.blocks.find((b) => b.id === id)!;
      const chain = new Float64Array(8 * nf);
      for (let k = 0; k < nf; k++) chainFromNoiseParameters({ fmin: 1.2 + 0.3 * k, gammaOpt: [0.3, -0.2 + 0.1 * k], rn: 8 + k }, 50, chain.subarray(8 * k, 8 * k + 8));
      blk.noiseChain = chain;
    }
    const noise = systemNoise(sys);
    const blocksC = blockNoise(sys, sys.blocks.map((b) => b.s)).c;
    const ref = runPython<{ c: number[]; s: number[] }>(
      `
blocks = data["blocks"]; nf = data["nf"]; P = data["P"]; z0 = data["z0"]
out_c = []; out_s = []
for k in range(nf):
    # every block plus one Z0 step per system port, block-diagonal
    sizes = [b["n"] for b in blocks] + [2] * len(data["ports"])
    N = sum(sizes)
    S = np.zeros((N, N), complex); C = np.zeros((N, N), complex)
    o = 0
    for b in blocks:
        n = b["n"]
        S[o:o+n, o:o+n] = cx(b["s"][k]).reshape(n, n)
        C[o:o+n, o:o+n] = cx(b["c"][k]).reshape(n, n)
        o += n
    G = np.zeros((N, N))
    for p, q in data["links"]:
        G[p, q] = 1; G[q, p] = 1
    outer = []
    for (at, pz0) in data["ports"]:
        rho = (z0 - pz0) / (z0 + pz0); t = 2 * np.sqrt(pz0 * z0) / (pz0 + z0)
        S[o:o+2, o:o+2] = [[rho, t], [t, -rho]]
        G[o+1, at] = 1; G[at, o+1] = 1
        outer.append(o); o += 2
    Et = np.zeros((len(outer), N)); 
    for e, p in enumerate(outer): Et[e, p] = 1
    M = np.linalg.inv(np.eye(N) - S @ G)
    T = Et @ M
    out_c.append(flat(T @ C @ T.conj().T))
    out_s.append(flat(Et @ M @ S @ Et.T))
print(json.dumps({"c": sum(out_c, []), "s": sum(out_s, [])}))
`,
      {
        nf,
        P: sys.blockPorts.length,
        z0: sys.z0,
        blocks: sys.blocks.map((b, i) => ({
          n: b.s.n,
          s: Array.from({ length: nf }, (_, k) => Array.from(b.s.data.subarray(2 * k * b.s.n * b.s.n, 2 * (k + 1) * b.s.n * b.s.n))),
          c: Array.from({ length: nf }, (_, k) => Array.from(blocksC[i].data.subarray(2 * k * b.s.n * b.s.n, 2 * (k + 1) * b.s.n * b.s.n))),
        })),
        links: sys.links,
        ports: sys.systemPorts.map((p) => [p.at, p.z0]),
      },
    );
    let scale = 0;
    for (const v of ref.c) scale = Math.max(scale, Math.abs(v));
    ref.c.forEach((v, x) => expect(Math.abs(noise.c.data[x] - v)).toBeLessThan(1e-10 * scale));
    ref.s.forEach((v, x) => expect(noise.s.data[x]).toBeCloseTo(v, 10));
  });
});

describe("noise parameters and Touchstone noise data", () => {
  const cases = [
    { fmin: 1.35, gammaOpt: [0.4, 0.25] as [number, number], rn: 12 },
    { fmin: 2.1, gammaOpt: [-0.1, -0.5] as [number, number], rn: 33 },
    { fmin: 1.02, gammaOpt: [0, 0] as [number, number], rn: 2 },
  ];
  const sTwoPort = Float64Array.from([0.3, -0.2, 0.05, 0.02, 2.5, 1.1, 0.25, 0.3]);

  it("noise parameters → chain → noise waves → chain → noise parameters round trip", () => {
    for (const p of cases) {
      const back = noiseParametersFromChain(chainFromWave(waveFromChain(chainFromNoiseParameters(p, 50), sTwoPort, 50), sTwoPort, 50), 50);
      expect(back.fmin).toBeCloseTo(p.fmin, 12);
      expect(back.rn).toBeCloseTo(p.rn, 9);
      expect(back.gammaOpt[0]).toBeCloseTo(p.gammaOpt[0], 12);
      expect(back.gammaOpt[1]).toBeCloseTo(p.gammaOpt[1], 12);
    }
  });

  it("the chain matrix agrees with scikit-rf 0.15.4's Network.set_noise_a, and its figure from Z0 with Network.nf(z0)", () => {
    const ref = runSkrf<{ n: number[][]; nf: number[]; k4: number }>(
      `
freq = skrf.Frequency(1, 1, 1, unit="GHz")
n_out = []; nf_out = []
for c in data["cases"]:
    nw = skrf.Network(frequency=freq, s=np.array([[[0.3-0.2j, 0.05+0.02j], [2.5+1.1j, 0.25+0.3j]]]), z0=50)
    nw.set_noise_a(freq, nfmin_db=10*np.log10(c["fmin"]), gamma_opt=complex(*c["gammaOpt"]), rn=c["rn"])
    n_out.append(flat(nw.n[0]))
    nf_out.append(float(np.real(nw.nf(50.0)[0])))
from skrf.constants import K_BOLTZMANN, T0 as T0_SKRF
print(json.dumps({"n": n_out, "nf": nf_out, "k4": 4 * K_BOLTZMANN * T0_SKRF}))
`,
      { cases },
    );
    cases.forEach((p, x) => {
      const ca = chainFromNoiseParameters(p, 50);
      // scikit-rf 0.15.4 uses an older value of Boltzmann's constant: compare in units of 4kT0 each
      const k4 = 4 * kT0;
      ref.n[x].forEach((v, y) => expect(ca[y] / k4).toBeCloseTo(v / ref.k4, 12));
      // F from a Z0 source is 1 + |c2|²/(kT0·|S21|²)
      const w = waveFromChain(ca, sTwoPort, 50);
      const f = 1 + w[6] / (kT0 * (sTwoPort[4] ** 2 + sTwoPort[5] ** 2));
      expect(f).toBeCloseTo(ref.nf[x], 12);
    });
  });

  it("reads the noise section of 1.1 and 2.0 files; a part with Γopt = 0 has F = Fmin from Z0, and otherwise F = Fmin + 4(Rn/Z0)|Γopt|²/|1 + Γopt|² (Pozar, 4th ed., ch. 12, from memory)", () => {
    const net = [s2pLine(1, [0.2, 0.1], [3, -1], [0.02, 0], [0.1, -0.3]), s2pLine(2, [0.25, 0.05], [2.8, -1.4], [0.02, 0.01], [0.12, -0.28])];
    const v11 = ["# GHz S RI R 50", ...net, "! noise", "1 1.2 0.0 0 0.2", "2 1.5 0.4 60 0.3"].join("\n");
    const v20 = [
      "[Version] 2.0",
      "# GHz S RI R 50",
      "[Number of Ports] 2",
      "[Two-Port Data Order] 21_12",
      "[Number of Frequencies] 2",
      "[Number of Noise Frequencies] 2",
      "[Network Data]",
      ...net,
      "[Noise Data]",
      "1 1.2 0.0 0 0.2",
      "2 1.5 0.4 60 0.3",
      "[End]",
    ].join("\n");
    for (const text of [v11, v20]) {
      const t = parseTouchstone(text, { name: "lna.s2p" });
      expect(Array.from(t.noise!.frequencies)).toEqual([1e9, 2e9]);
      expect(Array.from(t.noise!.rn)).toEqual([10, 15]);
      const sys = prepareSystem(
        scenario({
          frequency: { list: [1e9, 2e9] },
          blocks: [{ id: "LNA", kind: "touchstone", data: text, file: "lna.s2p" }],
          ports: [
            { name: "IN", at: "LNA:1" },
            { name: "OUT", at: "LNA:2" },
          ],
        }),
      );
      const f = noiseFigure(systemNoise(sys), 0, 1);
      expect(db(f[0])).toBeCloseTo(1.2, 10);
      const g = [0.4 * Math.cos(Math.PI / 3), 0.4 * Math.sin(Math.PI / 3)];
      const expected = lin(1.5) + (4 * 0.3 * 0.16) / ((1 + g[0]) ** 2 + g[1] ** 2);
      expect(f[1]).toBeCloseTo(expected, 10);
    }
  });

  it("a mismatched two-stage cascade of noisy parts matches scikit-rf 0.15.4's cascade of noisy networks (Network ** Network, nf(z0), nfmin, g_opt, rn)", () => {
    const freqs = [1, 1.5, 2];
    const stageS = (a: number) =>
      freqs.map((f, k) => ({
        s11: [0.35 * Math.cos(a + k), 0.35 * Math.sin(a + k)],
        s21: [4 * Math.cos(2 * a - k), 4 * Math.sin(2 * a - k)],
        s12: [0.06 * Math.cos(a * k), 0.06 * Math.sin(a * k)],
        s22: [0.4 * Math.cos(-a + 0.5 * k), 0.4 * Math.sin(-a + 0.5 * k)],
        f,
      }));
    const stages = [
      { s: stageS(0.7), noise: freqs.map((f, k) => [f, 0.9 + 0.1 * k, 0.45, 40 + 10 * k, 0.25]) },
      { s: stageS(-1.3), noise: freqs.map((f, k) => [f, 2.4 + 0.2 * k, 0.3, -70 + 5 * k, 0.6]) },
    ];
    const text = (st: (typeof stages)[number]) =>
      ["# GHz S RI R 50", ...st.s.map((x) => s2pLine(x.f, x.s11, x.s21, x.s12, x.s22)), ...st.noise.map((row) => row.join(" "))].join("\n");
    const sys = prepareSystem(
      scenario({
        frequency: { list: freqs.map((f) => f * 1e9) },
        blocks: [
          { id: "S1", kind: "touchstone", data: text(stages[0]), file: "s1.s2p" },
          { id: "S2", kind: "touchstone", data: text(stages[1]), file: "s2.s2p" },
        ],
        links: [["S1:2", "S2:1"]],
        ports: [
          { name: "IN", at: "S1:1" },
          { name: "OUT", at: "S2:2" },
        ],
      }),
    );
    const noise = systemNoise(sys);
    const f = noiseFigure(noise, 0, 1);
    const ref = runSkrf<{ nf: number[]; nfmin: number[]; gopt: number[]; rn: number[] }>(
      `
import os, tempfile
nets = []
with tempfile.TemporaryDirectory() as d:
    for i, t in enumerate(data["texts"]):
        path = os.path.join(d, "stage%d.s2p" % i)
        with open(path, "w") as fh:
            fh.write(t)
        nets.append(skrf.Network(path))
c = nets[0] ** nets[1]
print(json.dumps({"nf": np.real(c.nf(50.0)).tolist(), "nfmin": np.real(c.nfmin).tolist(), "gopt": flat(c.g_opt), "rn": np.real(c.rn).tolist()}))
`,
      { texts: stages.map(text) },
    );
    for (let k = 0; k < freqs.length; k++) {
      expect(f[k]).toBeCloseTo(ref.nf[k], 9);
      const s = noise.s.data.subarray(8 * k, 8 * k + 8);
      const p = noiseParametersFromChain(chainFromWave(noise.c.data.subarray(8 * k, 8 * k + 8), s, 50), 50);
      expect(p.fmin).toBeCloseTo(ref.nfmin[k], 9);
      expect(p.rn).toBeCloseTo(ref.rn[k], 7);
      expect(p.gammaOpt[0]).toBeCloseTo(ref.gopt[2 * k], 9);
      expect(p.gammaOpt[1]).toBeCloseTo(ref.gopt[2 * k + 1], 9);
    }
  });
});
