import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { solveSystem } from "@/engine/network";
import { maxSingularValue } from "@/engine/linalg";
import { powerLedger } from "@/engine/checks/power-ledger";
import { dataQuality } from "@/engine/checks/data-quality";
import { buildSystem, c, fromDb, onePort, polar, twoPort, type C, type TestBlock } from "./checks-helpers";

const f1 = [1e9];
const entry = (r: ReturnType<typeof powerLedger>, id: string) => r.blocks.find((b) => b.block === id) as ReturnType<typeof powerLedger>["blocks"][number];

describe("powerLedger()", () => {
  it("a matched attenuator absorbs 1 − 10^(−L/10) and passes the rest", () => {
    // Matched pad of L dB: |S21|² = 10^(−L/10) leaves, the rest is absorbed (Pozar 4th ed. §4.3, power
    // conservation; common practice for attenuators).
    for (const L of [0.5, 3, 6, 20]) {
      const t = fromDb(-L);
      const sys = buildSystem({ frequencies: f1, blocks: [{ id: "PAD", s: twoPort(c(0), c(t), c(t), c(0)) }], links: [], ports: [{ name: "A", at: "PAD:1" }, { name: "B", at: "PAD:2" }] });
      const r = powerLedger(solveSystem(sys), "A");
      expect(entry(r, "PAD").fraction[0]).toBeCloseTo(1 - Math.pow(10, -L / 10), 14);
      expect(entry(r, "PAD").role).toBe("absorbed");
      expect(r.outputs[0].fraction[0]).toBeCloseTo(Math.pow(10, -L / 10), 14);
      expect(Math.abs(r.closure[0])).toBeLessThan(1e-12);
      expect(r.verdict).toBe("pass");
    }
  });

  it("a terminated isolator: forward into a mismatched load, the reflection dies in the isolator", () => {
    // Isolator IL 0.5 dB, isolation 25 dB, matched; load Γ = 0.5∠30°. Driving port 1 with 1 W:
    // load absorbs |t|²(1−|Γ|²), port 1 returns |t·Γ·r|² (r = reverse transmission), the isolator absorbs
    // the rest (power balance, Pozar 4th ed. §4.3; single bounce since both isolator ports are matched).
    const t = fromDb(-0.5), r = fromDb(-25), g = 0.5;
    const sys = buildSystem({
      frequencies: f1,
      blocks: [
        { id: "ISO", kind: "isolator", s: twoPort(c(0), c(r), c(t), c(0)), traits: { reciprocal: false } },
        { id: "LOAD", kind: "load", s: onePort(polar(g, 30)) },
      ],
      links: [["ISO:2", "LOAD:1"]],
      ports: [{ name: "IN", at: "ISO:1" }],
    });
    const l = powerLedger(solveSystem(sys), "IN");
    expect(entry(l, "LOAD").fraction[0]).toBeCloseTo(t * t * (1 - g * g), 14);
    expect(l.reflected[0]).toBeCloseTo((t * g * r) ** 2, 14);
    expect(entry(l, "ISO").fraction[0]).toBeCloseTo(1 - t * t * (1 - g * g) - (t * g * r) ** 2, 14);
    expect(Math.abs(l.worstClosure)).toBeLessThan(1e-12);
  });

  it("a lossless network absorbs nothing (hybrid, lines and a short)", () => {
    // Ideal 90° hybrid (docs/blocks.md "hybrid90"; Pozar 4th ed. §7.5), lossless lines e^(−jθ) and a short Γ = −1: every block is
    // lossless, so all absorption entries vanish and reflected + outputs = 1 (Pozar 4th ed. §4.3).
    const h = -1 / Math.SQRT2;
    const hyb: C[][] = [
      [c(0), c(0, h), c(h), c(0)],
      [c(0, h), c(0), c(0), c(h)],
      [c(h), c(0), c(0), c(0, h)],
      [c(0), c(h), c(0, h), c(0)],
    ];
    const line = (deg: number) => twoPort(c(0), polar(1, -deg), polar(1, -deg), c(0));
    const sys = buildSystem({
      frequencies: [1e9, 2e9],
      blocks: [
        { id: "HYB", kind: "hybrid90", s: () => hyb },
        { id: "L1", kind: "line", s: line(37) },
        { id: "L2", kind: "line", s: line(112) },
        { id: "SHORT", kind: "load", s: onePort(c(-1)) },
      ],
      links: [["HYB:2", "L1:1"], ["L1:2", "SHORT:1"], ["HYB:3", "L2:1"]],
      ports: [{ name: "P1", at: "HYB:1" }, { name: "P4", at: "HYB:4" }, { name: "P3", at: "L2:2" }],
    });
    const l = powerLedger(solveSystem(sys), "P1");
    for (const b of l.blocks) for (const x of b.fraction) expect(Math.abs(x)).toBeLessThan(1e-13);
    for (let q = 0; q < 2; q++) expect(l.reflected[q] + l.outputs.reduce((s, o) => s + o.fraction[q], 0)).toBeCloseTo(1, 13);
  });

  it("an amplifier's share reads as added power, an antenna's as radiated, open ports as terminations", () => {
    // Amplifier 10 dB gain, matched, into an antenna with RL 10 dB (|Γ| = 0.316): radiated = 10·(1 − 0.1) W,
    // the amplifier adds 10 − 1 W minus what returns through its reverse isolation (closed form below).
    const G = fromDb(10), rev = fromDb(-30), g = fromDb(-10);
    const sys = buildSystem({
      frequencies: f1,
      blocks: [
        { id: "AMP", kind: "amplifier", s: twoPort(c(0), c(rev), c(G), c(0)), traits: { passive: false, reciprocal: false } },
        { id: "ANT", kind: "antenna", s: onePort(c(g)), traits: { radiates: true } },
        { id: "CPL", s: twoPort(c(0), c(0.5), c(0.5), c(0)) },
      ],
      links: [["AMP:2", "ANT:1"]],
      ports: [{ name: "IN", at: "AMP:1" }, { name: "X", at: "CPL:1" }],
    });
    const l = powerLedger(solveSystem(sys), "IN");
    expect(entry(l, "ANT").role).toBe("radiated");
    expect(entry(l, "ANT").fraction[0]).toBeCloseTo(G * G * (1 - g * g), 12);
    expect(entry(l, "AMP").role).toBe("added");
    // AMP absorbs a_in = 1 plus the reflection G·g in, gives out G and G·g·rev: 1 + (Gg)² − G² − (Ggrev)².
    expect(entry(l, "AMP").fraction[0]).toBeCloseTo(1 + (G * g) ** 2 - G * G - (G * g * rev) ** 2, 12);
    expect(l.terminations).toEqual([{ block: "CPL", port: 2, fraction: [0] }]);
    expect(Math.abs(l.worstClosure)).toBeLessThan(1e-12);
  });

  it("closes to 1e-9 on random passive networks, with mixed port impedances (property)", () => {
    // Power conservation of passive networks (Pozar 4th ed. §4.3): every watt in is reflected, leaves, or is
    // absorbed in a block or an open termination.
    const cplx = fc.tuple(fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: -1, max: 1, noNaN: true }));
    const blockArb = fc.integer({ min: 1, max: 4 }).chain((n) =>
      fc.record({ n: fc.constant(n), m: fc.array(cplx, { minLength: n * n, maxLength: n * n }), scale: fc.double({ min: 0.3, max: 0.999, noNaN: true }) }),
    );
    const netArb = fc.record({
      blocks: fc.array(blockArb, { minLength: 1, maxLength: 5 }),
      order: fc.array(fc.nat(), { minLength: 24, maxLength: 24 }),
      links: fc.integer({ min: 0, max: 6 }),
      ports: fc.integer({ min: 1, max: 3 }),
      z0s: fc.array(fc.constantFrom(25, 50, 75, 100), { minLength: 3, maxLength: 3 }),
    });
    fc.assert(
      fc.property(netArb, (net) => {
        const blocks: TestBlock[] = net.blocks.map((b, i) => {
          const raw = Float64Array.from(b.m.flat());
          const sigma = maxSingularValue({ n: b.n, nf: 1, data: raw }, 0) || 1;
          const k = b.scale / sigma;
          const mat: C[][] = Array.from({ length: b.n }, (_, r) => Array.from({ length: b.n }, (_, q) => c(b.m[r * b.n + q][0] * k, b.m[r * b.n + q][1] * k)));
          return { id: `B${i}`, s: () => mat };
        });
        const refs = net.blocks.flatMap((b, i) => Array.from({ length: b.n }, (_, p) => `B${i}:${p + 1}`));
        // shuffle block ports deterministically from the drawn order
        const pool = refs.map((r, i) => ({ r, key: net.order[i % net.order.length] * 31 + i })).sort((a, b) => a.key - b.key).map((x) => x.r);
        const nPorts = Math.min(net.ports, pool.length);
        const ports = pool.slice(0, nPorts).map((at, i) => ({ name: `P${i}`, at, z0: net.z0s[i] }));
        const rest = pool.slice(nPorts);
        const links: [string, string][] = [];
        for (let i = 0; i + 1 < rest.length && links.length < net.links; i += 2) links.push([rest[i], rest[i + 1]]);
        const sol = solveSystem(buildSystem({ frequencies: f1, blocks, links, ports }));
        for (const p of sol.ports) {
          const l = powerLedger(sol, p);
          expect(Math.abs(l.worstClosure)).toBeLessThanOrEqual(1e-9);
          expect(l.verdict).toBe("pass");
          for (const b of l.blocks) expect(b.fraction[0]).toBeGreaterThan(-1e-12);
        }
      }),
      { numRuns: 150 },
    );
  });
});

describe("dataQuality()", () => {
  it("reports σmax, losslessness and reciprocity of blocks and composite", () => {
    // Matched 3 dB pad: σmax = 10^(−3/20); ‖SᴴS − I‖ = 1 − 10^(−3/10) (max-abs entry); reciprocal.
    const t = fromDb(-3);
    const sys = buildSystem({ frequencies: [1e9, 2e9], blocks: [{ id: "PAD", kind: "attenuator", s: twoPort(c(0), c(t), c(t), c(0)) }], links: [], ports: [{ name: "A", at: "PAD:1" }, { name: "B", at: "PAD:2" }] });
    const q = dataQuality(solveSystem(sys));
    expect(q.passivity).toBe("pass");
    expect(q.reciprocity).toBe("pass");
    expect(q.blocks[0].maxSingular).toBeCloseTo(t, 14);
    expect(q.blocks[0].unitarityError).toBeCloseTo(1 - t * t, 14);
    expect(q.composite.maxSingular).toBeCloseTo(t, 14);
  });

  it("a built-in model with active data fails; measured data that is slightly active or non-reciprocal warns, naming blocks and frequencies", () => {
    const active = buildSystem({
      frequencies: [1e9, 2e9],
      blocks: [{ id: "BAD", kind: "attenuator", s: (k) => [[c(0), c(k === 1 ? 1.01 : 0.5)], [c(k === 1 ? 1.01 : 0.5), c(0)]] }],
      links: [],
      ports: [{ name: "A", at: "BAD:1" }, { name: "B", at: "BAD:2" }],
    });
    const qa = dataQuality(solveSystem(active));
    expect(qa.passivity).toBe("fail");
    expect(qa.blocks[0].activeHz).toEqual([2e9]);
    expect(qa.messages.join("\n")).toMatch(/BAD: S is active/);

    const measured = buildSystem({
      frequencies: [1e9, 2e9, 3e9],
      blocks: [
        { id: "PART", kind: "touchstone", s: (k) => [[c(0), c(0.9)], [c(k === 2 ? 1.00001 : 0.9), c(0)]], traits: { passive: false, reciprocal: false } },
        { id: "PAD", kind: "attenuator", s: twoPort(c(0), c(0.5), c(0.5), c(0)) },
      ],
      links: [["PART:2", "PAD:1"]],
      ports: [{ name: "A", at: "PART:1" }, { name: "B", at: "PAD:2" }],
    });
    const qm = dataQuality(solveSystem(measured));
    const part = qm.blocks.find((b) => b.subject === "PART");
    expect(part?.passivity).toBe("warn");
    expect(part?.activeHz).toEqual([3e9]);
    expect(part?.reciprocity).toBe("warn");
    expect(part?.nonReciprocalHz).toEqual([3e9]);
    expect(qm.passivity).toBe("warn");
    expect(qm.reciprocity).toBe("warn");
  });

  it("an amplifier is not expected to be passive or reciprocal, and neither is the composite holding it", () => {
    const sys = buildSystem({ frequencies: f1, blocks: [{ id: "AMP", kind: "amplifier", s: twoPort(c(0), c(0.01), c(10), c(0)), traits: { passive: false, reciprocal: false } }], links: [], ports: [{ name: "A", at: "AMP:1" }, { name: "B", at: "AMP:2" }] });
    const q = dataQuality(solveSystem(sys));
    expect(q.passivity).toBe("pass");
    expect(q.composite.expectPassive).toBe(false);
    expect(q.composite.maxSingular).toBeCloseTo(10, 12);
  });
});
