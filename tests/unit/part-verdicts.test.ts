import { describe, expect, it } from "vitest";
import { dataQuality } from "@/engine/checks";
import { parseScenario } from "@/engine/scenario";
import { solveScenario } from "@/engine/system";
import { parseTouchstone } from "@/engine/touchstone";
import type { Scenario } from "@/engine/types";
import { partFigures, partVerdicts } from "@/lib/domain/parts/figures";

// A two-port whose only non-zero entries are S21 = a and S12 = b: its singular values are |a| and |b|
// (an anti-diagonal matrix is a permutation times a diagonal one; Golub & Van Loan, Matrix
// Computations 4th ed., §2.4), and |S21 − S12| = |a − b|.
function twoPort(a: number, b: number): string {
  return ["# GHz S RI R 50", `1 0 0 ${b} 0 ${b} 0 0 0`, `2 0 0 ${a} 0 ${b} 0 0 0`, ""].join("\n");
}

function engineVerdict(text: string) {
  const scenario: Scenario = {
    format: "portolan.scenario/1",
    name: "part",
    z0: 50,
    frequency: { list: [1e9, 2e9] },
    blocks: [{ id: "P", kind: "touchstone", data: text, ports: 2 }],
    links: [],
    ports: [
      { name: "A", at: "P:1" },
      { name: "B", at: "P:2" },
    ],
  };
  const quality = dataQuality(solveScenario(parseScenario(scenario)));
  const block = quality.blocks.find((b) => b.subject === "P");
  return { passivity: block?.passivity, reciprocity: block?.reciprocity };
}

describe("partVerdicts: the parts page judges measured data as the engine's data-quality check does", () => {
  it("slightly active, non-reciprocal data warns on both (never fails)", () => {
    const text = twoPort(1.00001, 0.9);
    const figures = partFigures(parseTouchstone(text, { name: "p.s2p" }));
    expect(figures.maxSingular).toBeCloseTo(1.00001, 12);
    expect(figures.maxSingularHz).toBe(2e9);
    expect(figures.reciprocityError).toBeCloseTo(0.10001, 12);
    expect(partVerdicts(figures)).toEqual({ passivity: "warn", reciprocity: "warn", active: false, activeReason: null });
    expect(engineVerdict(text)).toEqual({ passivity: partVerdicts(figures).passivity, reciprocity: partVerdicts(figures).reciprocity });
  });

  it("passive reciprocal data passes on both", () => {
    const text = twoPort(0.9, 0.9);
    const figures = partFigures(parseTouchstone(text, { name: "p.s2p" }));
    expect(figures.maxSingular).toBeCloseTo(0.9, 12);
    expect(partVerdicts(figures)).toEqual({ passivity: "pass", reciprocity: "pass", active: false, activeReason: null });
    expect(engineVerdict(text)).toEqual({ passivity: partVerdicts(figures).passivity, reciprocity: partVerdicts(figures).reciprocity });
  });
});
