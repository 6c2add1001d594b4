import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import type { SData } from "@/engine/types";
import {
  groupDelay,
  magnitudeDb,
  phaseDeg,
  reflectionToImpedance,
  solutionToCsv,
  unwrapRadians,
} from "@/lib/domain/results/results-math";
import { formatHz } from "@/engine/format";
import { formatDb } from "@/lib/browser/format";

const C0 = 299_792_458; // m/s, exact (SI Brochure, 9th ed., 2.3.1)

/** A matched line as a 2-port: S11 = S22 = 0, S21 = S12 = a·e^(−jθ), θ = 2πf·L/(vf·c0) (docs/blocks.md; Pozar, 4th ed., ch. 2). */
function matchedLine(freqs: Float64Array, length: number, vf: number, loss = 1): SData {
  const n = 2;
  const data = new Float64Array(2 * freqs.length * n * n);
  freqs.forEach((f, k) => {
    const theta = (2 * Math.PI * f * length) / (vf * C0);
    for (const [i, j] of [[1, 0], [0, 1]]) {
      const at = 2 * ((k * n + i) * n + j);
      data[at] = loss * Math.cos(theta);
      data[at + 1] = -loss * Math.sin(theta);
    }
  });
  return { n, nf: freqs.length, data };
}

function plan(start: number, stop: number, points: number): Float64Array {
  return Float64Array.from({ length: points }, (_, k) => start + ((stop - start) * k) / (points - 1));
}

describe("group delay", () => {
  it("of a matched line is length/(vf·c0) at every frequency", () => {
    // τ = −dφ/dω = L/(vf·c0) for φ = −ωL/(vf·c0) (common practice)
    const f = plan(2.3e9, 2.6e9, 301);
    const s = matchedLine(f, 0.5, 0.66);
    const tau = groupDelay(f, s, 1, 0);
    const expected = 0.5 / (0.66 * C0); // ≈ 2.527 ns
    for (const t of tau) expect(t).toBeCloseTo(expected, 17);
    expect(Math.abs(tau[0] - expected) / expected).toBeLessThan(1e-9);
  });

  it("is not fooled by phase wrapping on a long line", () => {
    // 10 m line: the phase wraps many times across the plan; spacing keeps |Δφ| < π per step
    const f = plan(1e9, 1.01e9, 201);
    const s = matchedLine(f, 10, 1);
    const tau = groupDelay(f, s, 1, 0);
    for (const t of tau) expect(t / (10 / C0)).toBeCloseTo(1, 9);
  });

  it("unwraps like numpy.unwrap", () => {
    const raw = Float64Array.from({ length: 40 }, (_, k) => Math.atan2(Math.sin(-0.9 * k + 0.3), Math.cos(-0.9 * k + 0.3)));
    const script = `import json,sys,numpy as np; print(json.dumps(np.unwrap(np.array(json.loads(sys.argv[1]))).tolist()))`;
    // reference: numpy (Debian python3-numpy) numpy.unwrap
    const ref = JSON.parse(execFileSync("/usr/bin/python3", ["-c", script, JSON.stringify([...raw])]).toString()) as number[];
    const ours = unwrapRadians(raw);
    ref.forEach((v, k) => expect(ours[k]).toBeCloseTo(v, 12));
  });
});

describe("magnitude, phase and impedance", () => {
  it("reads a 6 dB pad and a −90° phase", () => {
    const f = plan(1e9, 2e9, 2);
    // length chosen so that θ = 90° at 1 GHz: L = c0/(4·1e9)
    const s = matchedLine(f, C0 / 4e9, 1, 10 ** (-6 / 20));
    expect(magnitudeDb(s, 1, 0)[0]).toBeCloseTo(-6, 12);
    expect(phaseDeg(s, 1, 0)[0]).toBeCloseTo(-90, 9);
    expect(magnitudeDb(s, 0, 0)[0]).toBe(Number.NEGATIVE_INFINITY);
  });

  it("converts reflection to impedance", () => {
    // Z = Z0(1+Γ)/(1−Γ) (Pozar, 4th ed., eq. 2.43 rearranged): Γ = 1/3 on 50 Ω gives 100 Ω; Γ = j gives j50 Ω
    const [r1, x1] = reflectionToImpedance(1 / 3, 0, 50);
    expect(r1).toBeCloseTo(100, 12);
    expect(x1).toBeCloseTo(0, 12);
    const [r2, x2] = reflectionToImpedance(0, 1, 50);
    expect(r2).toBeCloseTo(0, 12);
    expect(x2).toBeCloseTo(50, 12);
  });
});

describe("CSV export", () => {
  it("writes frequency then dB and degrees for every pair, row-major", () => {
    const f = plan(1e9, 2e9, 2);
    const s = matchedLine(f, C0 / 4e9, 1, 0.5);
    const csv = solutionToCsv({ frequencies: f, ports: ["TX", "ANT"], portZ0: [50, 50], s });
    const lines = csv.trim().split("\n");
    expect(lines).toHaveLength(3);
    expect(lines[0]).toBe(
      "frequency_hz,S11 dB (TX->TX),S11 deg (TX->TX),S12 dB (ANT->TX),S12 deg (ANT->TX),S21 dB (TX->ANT),S21 deg (TX->ANT),S22 dB (ANT->ANT),S22 deg (ANT->ANT)",
    );
    const row = lines[1].split(",");
    expect(Number(row[0])).toBe(1e9);
    expect(row[1]).toBe("-inf");
    // 20·log10(0.5) = −6.0206 dB (definition of dB); θ = 90° at 1 GHz
    expect(Number(row[5])).toBeCloseTo(-6.0206, 4);
    expect(Number(row[6])).toBeCloseTo(-90, 5);
  });
});

describe("formatting", () => {
  it("uses SI prefixes and a real minus sign", () => {
    expect(formatHz(2.45e9)).toBe("2.45 GHz");
    expect(formatDb(-3.0103)).toBe("\u22123.01 dB");
  });
});
