/**
 * Energy balance of every built-in block: for every legal parameter value the largest singular value
 * of S is at most 1 (Pozar, Microwave Engineering, 4th ed., sec. 4.3: a passive network delivers no
 * more power than it receives, i.e. I − SᴴS ⪰ 0), checked with an eigenvalue routine independent of
 * the engine's Cholesky test (tests/engine/blocks-helpers.ts, itself checked against numpy in
 * blocks.test.ts). Also: reciprocity where the traits promise it, SᴴS = I for the ideal lossless cases,
 * and isolation/return loss never reported better than entered.
 */
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { BLOCK_TRAITS, evaluateBlock } from "@/engine/blocks";
import { EngineInputError, type BlockSpec } from "@/engine/types";
import { abs, db20, entry, matrixAt, reciprocityError, sigmaMax, sigmaMaxOver, unitarityError } from "./blocks-helpers";

const TOL = 1e-12;
const amp = (db: number) => Math.pow(10, -db / 20);

/** dB values ≥ 0 including the edge 0 and ∞ (null) */
const dbOrInf = (max: number) => fc.oneof(fc.constant(0), fc.constant(null), fc.double({ min: 0, max, noNaN: true }));

/**
 * The leakage of a switch as its header documents it (engine/blocks/switch.ts), built here independently:
 * common ↔ unselected throw +ι, selected ↔ unselected −ι, unselected ↔ unselected +ι² (absorptive) or −ι²
 * (reflective); ports 0-based, 0 the common port, `sel` the selected throw.
 */
function switchLeakage(throws: number, sel: number, reflective: boolean, isolationDb: number | null): Float64Array {
  const n = throws + 1;
  const iota = isolationDb === null ? 0 : amp(isolationDb);
  const m = new Float64Array(2 * n * n);
  const set = (i: number, j: number, v: number) => {
    m[2 * (i * n + j)] = v;
    m[2 * (j * n + i)] = v;
  };
  for (let k = 1; k <= throws; k++) {
    if (k === sel) continue;
    set(0, k, iota);
    set(sel, k, -iota);
    for (let j = k + 1; j <= throws; j++) if (j !== sel) set(j, k, reflective ? -iota * iota : iota * iota);
  }
  return m;
}

/** Evaluates a switch, or checks that its refusal names isolation_db exactly when its leakage alone is active. */
function evaluateSwitchOrRefusal(spec: BlockSpec, freqs: Float64Array): ReturnType<typeof evaluateBlock> | null {
  const p = spec.params as { throws: number; isolation_db: number | null; off_state?: string };
  const leakSigma = sigmaMax(switchLeakage(p.throws, spec.state ?? 1, p.off_state === "reflective", p.isolation_db), p.throws + 1);
  try {
    const out = evaluateBlock(spec, freqs, 50);
    expect(leakSigma).toBeLessThanOrEqual(1 + 1e-9);
    return out;
  } catch (e) {
    expect(e).toBeInstanceOf(EngineInputError);
    expect((e as EngineInputError).where).toBe("block SW, parameter isolation_db");
    expect((e as Error).message).toMatch(/no passive switch has it; expected at least \d+\.\d\d dB/);
    expect(leakSigma).toBeGreaterThan(1 - 1e-9);
    return null;
  }
}
const dbAtLeast0 = (max: number) => fc.oneof(fc.constant(0), fc.double({ min: 0, max, noNaN: true }));
const freqsArb = fc.array(fc.double({ min: 0, max: 4e10, noNaN: true }), { minLength: 1, maxLength: 3 }).map((a) => Float64Array.from(a));

const specArb: Record<string, fc.Arbitrary<BlockSpec>> = {
  load: fc.oneof(
    fc.record({ return_loss_db: dbOrInf(60), phase_deg: fc.double({ min: -720, max: 720, noNaN: true }) }),
    fc.record({ impedance: fc.tuple(fc.double({ min: 0, max: 1e4, noNaN: true }), fc.double({ min: -1e4, max: 1e4, noNaN: true })) }),
  ).map((params) => ({ id: "L", kind: "load", params })),
  antenna: fc.record({ return_loss_db: dbOrInf(60), phase_deg: fc.double({ min: -360, max: 360, noNaN: true }) }).map((params) => ({ id: "A", kind: "antenna", params })),
  attenuator: fc.record({ loss_db: dbAtLeast0(120) }).map((params) => ({ id: "P", kind: "attenuator", params })),
  line: fc
    .record(
      {
        length_m: fc.double({ min: 0, max: 20, noNaN: true }),
        velocity_factor: fc.double({ min: 0.05, max: 1, noNaN: true }),
        loss_db_per_m: dbAtLeast0(30),
        impedance: fc.double({ min: 1, max: 1000, noNaN: true }),
      },
      { requiredKeys: ["length_m"] },
    )
    .map((params) => ({ id: "W", kind: "line", params })),
  phase_shifter: fc.record({ phase_deg: fc.double({ min: -720, max: 720, noNaN: true }), loss_db: dbAtLeast0(40) }).map((params) => ({ id: "PS", kind: "phase_shifter", params })),
  isolator: fc
    .record({ insertion_loss_db: dbAtLeast0(10), isolation_db: dbOrInf(80), return_loss_db: dbOrInf(60) })
    .map((params) => ({ id: "I", kind: "isolator", params })),
  filter: fc
    .record({
      response: fc.constantFrom("lowpass", "highpass"),
      family: fc.constantFrom("butterworth", "chebyshev"),
      order: fc.integer({ min: 1, max: 15 }),
      cutoff_hz: fc.double({ min: 1e6, max: 2e10, noNaN: true }),
    })
    .map((params) => ({ id: "F", kind: "filter", params })),
  splitter: fc.record({ excess_loss_db: dbAtLeast0(10), isolation_db: dbOrInf(60) }).map((params) => ({ id: "S", kind: "splitter", params })),
  tee: fc.constant({ id: "T", kind: "tee" }),
  circulator: fc
    .record({ insertion_loss_db: dbAtLeast0(10), isolation_db: dbOrInf(60), return_loss_db: dbOrInf(60) })
    .map((params) => ({ id: "C", kind: "circulator", params })),
  coupler: fc
    .record({ coupling_db: fc.double({ min: 0.01, max: 40, noNaN: true }), directivity_db: dbOrInf(60), excess_loss_db: dbAtLeast0(5) })
    .map((params) => ({ id: "K", kind: "coupler", params })),
  hybrid90: fc.record({ excess_loss_db: dbAtLeast0(5), isolation_db: dbOrInf(60) }).map((params) => ({ id: "H", kind: "hybrid90", params })),
  hybrid180: fc.record({ excess_loss_db: dbAtLeast0(5), isolation_db: dbOrInf(60) }).map((params) => ({ id: "R", kind: "hybrid180", params })),
  switch: fc
    .record({
      throws: fc.integer({ min: 1, max: 16 }),
      insertion_loss_db: dbAtLeast0(10),
      isolation_db: dbOrInf(80),
      off_state: fc.constantFrom("absorptive", "reflective"),
      pick: fc.double({ min: 0, max: 0.999, noNaN: true }),
    })
    .map(({ pick, ...params }) => ({ id: "SW", kind: "switch", params, state: 1 + Math.floor(pick * params.throws) })),
};

describe("energy balance: σ_max(S) ≤ 1 for every passive kind and random legal parameters (fast-check)", () => {
  for (const [kind, arb] of Object.entries(specArb)) {
    it(`${kind} is passive${BLOCK_TRAITS[kind as keyof typeof BLOCK_TRAITS].reciprocal ? " and reciprocal" : ""}`, () => {
      fc.assert(
        fc.property(arb, freqsArb, (spec, freqs) => {
          // a switch whose leakage alone is active is refused (isolation is never reported better than entered)
          const out = kind === "switch" ? evaluateSwitchOrRefusal(spec, freqs) : evaluateBlock(spec, freqs, 50);
          if (out === null) return;
          const { s, traits } = out;
          expect(traits.passive).toBe(true);
          for (const v of s.data) expect(Number.isFinite(v)).toBe(true);
          expect(sigmaMaxOver(s)).toBeLessThanOrEqual(1 + TOL);
          if (traits.reciprocal) expect(reciprocityError(s)).toBe(0);
        }),
        { numRuns: kind === "switch" ? 150 : 250 },
      );
    });
  }

  it("array is passive, or refused with an error naming coupling_db only when its entered figures are truly active", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 12 }),
        dbOrInf(40),
        fc.oneof(fc.constant(null), fc.double({ min: 0.5, max: 40, noNaN: true })),
        dbOrInf(20),
        (elements, rl, coupling, falloff) => {
          const spec: BlockSpec = { id: "AR", kind: "array", params: { elements, return_loss_db: rl, coupling_db: coupling, coupling_falloff_db: falloff } };
          // the documented matrix (engine/blocks/array.ts), built here independently
          const n = elements;
          const m = new Float64Array(2 * n * n);
          for (let i = 0; i < n; i++)
            for (let j = 0; j < n; j++) {
              const d = Math.abs(i - j);
              if (d === 0) {
                m[2 * (i * n + j)] = rl === null ? 0 : amp(rl);
                continue;
              }
              const mag = coupling === null ? 0 : d === 1 ? amp(coupling) : falloff === null ? 0 : amp(coupling + (d - 1) * falloff);
              m[2 * (i * n + j)] = mag * Math.cos((-Math.PI / 2) * d);
              m[2 * (i * n + j) + 1] = mag * Math.sin((-Math.PI / 2) * d);
            }
          const sigma = sigmaMax(m, n);
          try {
            const { s, traits } = evaluateBlock(spec, new Float64Array([1e9, 3e9]), 50);
            expect(traits.radiates).toBe(true);
            expect(sigmaMaxOver(s)).toBeLessThanOrEqual(1 + TOL);
            expect(reciprocityError(s)).toBe(0);
            for (let q = 0; q < m.length; q++) expect(Math.abs(matrixAt(s, 1)[q] - m[q])).toBeLessThan(1e-15);
          } catch (e) {
            expect(e).toBeInstanceOf(EngineInputError);
            expect((e as EngineInputError).where).toBe("block AR, parameter coupling_db");
            expect(sigma).toBeGreaterThan(1);
          }
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe("isolation, directivity and return loss are never reported better than entered", () => {
  it("coupler, hybrids, splitter, circulator, isolator and switch keep their leakage exactly unless the entries alone are active", () => {
    const cases: fc.Arbitrary<[BlockSpec, (s: ReturnType<typeof evaluateBlock>["s"]) => number[]]>[] = [
      fc
        .record({ coupling_db: fc.double({ min: 0.01, max: 40, noNaN: true }), directivity_db: fc.double({ min: 0, max: 60, noNaN: true }), excess_loss_db: dbAtLeast0(3) })
        .map((p) => [{ id: "K", kind: "coupler", params: p }, (s) => [abs(entry(s, 0, 4, 1)) / (amp(p.coupling_db) * amp(p.directivity_db)), abs(entry(s, 0, 3, 2)) / (amp(p.coupling_db) * amp(p.directivity_db))]]),
      fc
        .record({ kind: fc.constantFrom("hybrid90", "hybrid180"), isolation_db: fc.double({ min: 0, max: 60, noNaN: true }) })
        .map((p) => [{ id: "H", kind: p.kind, params: { isolation_db: p.isolation_db } }, (s) => [abs(entry(s, 0, 4, 1)) / amp(p.isolation_db)]]),
      fc.record({ isolation_db: fc.double({ min: 0, max: 60, noNaN: true }) }).map((p) => [{ id: "S", kind: "splitter", params: p }, (s) => [abs(entry(s, 0, 3, 2)) / amp(p.isolation_db)]]),
      fc
        .record({ isolation_db: fc.double({ min: 0, max: 60, noNaN: true }), return_loss_db: fc.double({ min: 0, max: 60, noNaN: true }) })
        .map((p) => [{ id: "C", kind: "circulator", params: p }, (s) => [abs(entry(s, 0, 1, 2)) / amp(p.isolation_db), abs(entry(s, 0, 1, 1)) / amp(p.return_loss_db)]]),
      fc
        .record({ insertion_loss_db: dbAtLeast0(3), isolation_db: fc.double({ min: 0, max: 60, noNaN: true }), return_loss_db: fc.double({ min: 0, max: 60, noNaN: true }) })
        .map((p) => [{ id: "I", kind: "isolator", params: p }, (s) => [abs(entry(s, 0, 1, 2)) / amp(p.isolation_db), abs(entry(s, 0, 2, 2)) / amp(p.return_loss_db)]]),
      fc
        .record({ throws: fc.integer({ min: 2, max: 8 }), insertion_loss_db: dbAtLeast0(3), isolation_db: fc.double({ min: 0, max: 60, noNaN: true }), off_state: fc.constantFrom("absorptive", "reflective") })
        .map((p) => [{ id: "SW", kind: "switch", params: p, state: 1 }, (s) => [abs(entry(s, 0, 3, 1)) / amp(p.isolation_db), abs(entry(s, 0, 3, 2)) / amp(p.isolation_db)]]),
    ];
    fc.assert(
      fc.property(fc.oneof(...cases), ([spec, ratios]) => {
        const out = spec.kind === "switch" ? evaluateSwitchOrRefusal(spec, new Float64Array([1e9])) : evaluateBlock(spec, new Float64Array([1e9]), 50);
        if (out === null) return;
        const { s, warnings } = out;
        // the switch never scales its leakage: it keeps it exactly or refuses the entries
        if (spec.kind === "switch") expect(warnings.some((w) => w.includes("every term reduced"))).toBe(false);
        const scaledAll = warnings.some((w) => w.includes("every term reduced"));
        for (const r of ratios(s)) {
          if (scaledAll) expect(r).toBeLessThanOrEqual(1 + 1e-12);
          else expect(r).toBeCloseTo(1, 12);
        }
      }),
      { numRuns: 400 },
    );
  });

  it("when the transmission had to be reduced, it was reduced no more than needed (σ_max = 1) and the warning gives the amount", () => {
    const { s, warnings } = evaluateBlock({ id: "K", kind: "coupler", params: { coupling_db: 3, directivity_db: 15 } }, new Float64Array([1e9]), 50);
    expect(sigmaMax(matrixAt(s, 0), 4)).toBeGreaterThan(1 - 1e-9);
    const m = warnings[0].match(/transmission reduced by (\d+\.\d+) dB/);
    expect(m).not.toBeNull();
    // the through path of a 3 dB coupler is α = √(1 − β²); what the warning reports is its reduction
    const beta = amp(3);
    expect(db20(abs(entry(s, 0, 2, 1)) / Math.sqrt(1 - beta * beta))).toBeCloseTo(-Number(m![1]), 3);
  });
});

describe("ideal lossless cases: SᴴS = I", () => {
  const lossless: BlockSpec[] = [
    { id: "a", kind: "attenuator", params: { loss_db: 0 } },
    { id: "b", kind: "phase_shifter", params: { phase_deg: 47 } },
    { id: "c", kind: "line", params: { length_m: 1.7, impedance: 93 } },
    { id: "d", kind: "tee" },
    { id: "e", kind: "circulator" },
    { id: "f", kind: "coupler", params: { coupling_db: 6 } },
    { id: "g", kind: "coupler", params: { coupling_db: 30 } },
    { id: "h", kind: "hybrid90" },
    { id: "i", kind: "hybrid180" },
    { id: "j", kind: "switch", params: { throws: 5, insertion_loss_db: 0, isolation_db: null, off_state: "reflective" }, state: 4 },
    { id: "k", kind: "switch", params: { throws: 1, insertion_loss_db: 0, isolation_db: 30 } },
    { id: "l", kind: "load", params: { return_loss_db: 0, phase_deg: 71 } },
    { id: "m", kind: "load", params: { impedance: [0, -35] } },
    { id: "n", kind: "filter", params: { response: "bandstop", family: "chebyshev", order: 6, ripple_db: 0.1, center_hz: 1e9, bandwidth_hz: 3e8 } },
  ];
  for (const spec of lossless) {
    it(`${spec.kind} ${JSON.stringify(spec.params ?? {})} is lossless`, () => {
      const { s } = evaluateBlock(spec, new Float64Array([0.1e9, 0.9e9, 1e9, 2.5e9]), 50);
      expect(unitarityError(s)).toBeLessThan(1e-14);
    });
  }

  it("the ideal splitter, isolator and absorptive switch are not lossless (they absorb by design)", () => {
    for (const spec of [
      { id: "s", kind: "splitter" },
      { id: "i", kind: "isolator", params: { insertion_loss_db: 0, isolation_db: null } },
      { id: "w", kind: "switch", params: { throws: 2, insertion_loss_db: 0, isolation_db: null } },
    ] as BlockSpec[]) {
      const { s } = evaluateBlock(spec, new Float64Array([1e9]), 50);
      expect(unitarityError(s)).toBeGreaterThan(0.5);
      expect(sigmaMaxOver(s)).toBeLessThanOrEqual(1 + TOL);
    }
  });
});

describe("passivity costs no more transmission than needed, and what it changes is said", () => {
  it("circulator, IL 0 and isolation 20 dB, no return loss: passivity cuts 0.480 dB, not 0.915 dB", () => {
    // Derivation (Davis, Circulant Matrices, 1979: a circulant matrix is diagonalised by the DFT, so it is normal
    // and its singular values are the moduli of its eigenvalues): S = κ·C + ι·e^{jφ}·Cᵀ with C the cyclic shift
    // has eigenvalues κ·w^k + ι·e^{jφ}·w^{−k}, w = e^{j2π/3}, so σ_k² = κ² + ι² + 2κι·cos(φ − 4πk/3). The three
    // angles lie 120° apart, so the largest cosine is at least 1/2, reached with φ = 180°: κ² + ι² + κι = 1,
    // κ = (−ι + √(4 − 3ι²))/2. With ι = 0.1: κ = 0.946243, 0.479947 dB; φ = 0° would need κ + ι = 1, κ = 0.9, 0.91515 dB.
    const { s, warnings } = evaluateBlock({ id: "C", kind: "circulator", params: { insertion_loss_db: 0, isolation_db: 20 } }, new Float64Array([1e9]), 50);
    const iota = 0.1;
    const kappa = (-iota + Math.sqrt(4 - 3 * iota * iota)) / 2;
    expect(abs(entry(s, 0, 2, 1))).toBeCloseTo(kappa, 12);
    expect(-db20(abs(entry(s, 0, 2, 1)))).toBeCloseTo(0.479947, 6);
    expect(abs(entry(s, 0, 1, 2))).toBeCloseTo(iota, 15); // isolation exactly as entered
    expect(warnings).toEqual(["block C: transmission reduced by 0.480 dB to keep the part passive with the entered isolation_db and return_loss_db"]);
    expect(sigmaMax(matrixAt(s, 0), 3)).toBeLessThanOrEqual(1 + 1e-12);
    // the same holds for return loss alone (the roles of ι and ρ swap: ρ·I − … has the same three angles)
    const rl = evaluateBlock({ id: "C", kind: "circulator", params: { insertion_loss_db: 0, return_loss_db: 20 } }, new Float64Array([1e9]), 50);
    expect(abs(entry(rl.s, 0, 2, 1))).toBeCloseTo(kappa, 12);
  });

  it("coupler: when passivity lowers the coupled wave, the warning gives the coupling and directivity the model now has", () => {
    const { s, warnings } = evaluateBlock({ id: "K", kind: "coupler", params: { coupling_db: 3, directivity_db: 15 } }, new Float64Array([1e9]), 50);
    const coupling = -db20(abs(entry(s, 0, 3, 1)));
    const directivity = db20(abs(entry(s, 0, 3, 1))) - db20(abs(entry(s, 0, 4, 1))); // directivity = |S31|/|S41| in dB (common practice)
    expect(directivity).toBeLessThan(15);
    const m = warnings.find((w) => w.includes("coupling is now"))?.match(/coupling is now (\d+\.\d+) dB and directivity (\d+\.\d+) dB \(as entered, with excess loss: 3\.000 dB and 15\.000 dB\)/);
    expect(m).not.toBeNull();
    expect(Number(m![1])).toBeCloseTo(coupling, 3);
    expect(Number(m![2])).toBeCloseTo(directivity, 3);
    // no reduction, no such warning: 20 dB coupling with 25 dB directivity and 0.3 dB excess loss fits
    expect(evaluateBlock({ id: "K", kind: "coupler", params: { coupling_db: 20, directivity_db: 25, excess_loss_db: 0.3 } }, new Float64Array([1e9]), 50).warnings).toEqual([]);
  });

  it("switch: 8 throws at 3 dB isolation is refused with the least isolation that works, and that value keeps its leakage", () => {
    const spec = (iso: number): BlockSpec => ({ id: "SW", kind: "switch", params: { throws: 8, insertion_loss_db: 0.5, isolation_db: iso }, state: 1 });
    let least = NaN;
    try {
      evaluateBlock(spec(3), new Float64Array([1e9]), 50);
    } catch (e) {
      expect((e as EngineInputError).where).toBe("block SW, parameter isolation_db");
      least = Number((e as Error).message.match(/expected at least (\d+\.\d\d) dB/)![1]);
    }
    expect(least).toBeGreaterThan(3);
    // the leakage alone at the suggested value is passive (independent eigenvalue routine), just above it not
    expect(sigmaMax(switchLeakage(8, 1, false, least), 9)).toBeLessThanOrEqual(1);
    expect(sigmaMax(switchLeakage(8, 1, false, least - 0.02), 9)).toBeGreaterThan(1);
    const { s } = evaluateBlock(spec(least + 0.5), new Float64Array([1e9]), 50);
    expect(abs(entry(s, 0, 1, 3))).toBeCloseTo(amp(least + 0.5), 14); // S13: common to an unselected throw
  });
});
