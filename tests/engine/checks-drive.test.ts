import { describe, expect, it } from "vitest";
import { solveSystem } from "@/engine/network";
import { driveCheck, defaultDriveSources, DRIVE_CAUTIONS } from "@/engine/checks/drive";
import { evaluateRule } from "@/engine/checks/rules";
import { EngineInputError } from "@/engine/types";
import { buildSystem, c, onePort, type C } from "./checks-helpers";

// Two 30 dBm sources at the split ports of an ideal equal splitter, S = (−j/√2)[[0,1,1],[1,0,0],[1,0,0]]
// (docs/blocks.md / Pozar 4th ed. §7.3), combine into a matched load on the common port. Each source delivers
// half its power there: 0.5 W (26.99 dBm). Incoherent sum 1 W (30 dBm); worst-case coherent sum
// (√0.5 + √0.5)² = 2 W (33.01 dBm). Each split port takes its own source's 1 W (30 dBm).
const h = -1 / Math.SQRT2;
const split: C[][] = [[c(0), c(0, h), c(0, h)], [c(0, h), c(0), c(0)], [c(0, h), c(0), c(0)]];
const make = (loadRating: number, splitRating?: number) =>
  solveSystem(
    buildSystem({
      frequencies: [1e9, 2e9],
      blocks: [
        { id: "SPL", kind: "splitter", s: () => split, rating_dbm: splitRating },
        { id: "LOAD", kind: "load", s: onePort(c(0)), rating_dbm: loadRating },
      ],
      links: [["SPL:1", "LOAD:1"]],
      ports: [{ name: "A", at: "SPL:2" }, { name: "B", at: "SPL:3" }],
    }),
  );
const sources = [{ port: "A", dbm: 30 }, { port: "B", dbm: 30 }];

describe("driveCheck()", () => {
  it("sums sources incoherently and coherently at every block port", () => {
    const r = driveCheck(make(32), { sources });
    const load = r.ports.find((p) => p.block === "LOAD") as (typeof r.ports)[number];
    expect(load.incoherentDbm).toBeCloseTo(30, 10);
    expect(load.coherentDbm).toBeCloseTo(10 * Math.log10(2000), 10);
    const s2 = r.ports.find((p) => p.block === "SPL" && p.port === 2) as (typeof r.ports)[number];
    expect(s2.incoherentDbm).toBeCloseTo(30, 10);
    expect(s2.ratingDbm).toBeNull();
    expect(r.cautions).toBe(DRIVE_CAUTIONS);
  });

  it("passes on the incoherent sum with a warning when only the coherent worst case exceeds the rating", () => {
    const r = driveCheck(make(32), { sources });
    expect(r.basis).toBe("incoherent");
    expect(r.verdict).toBe("warn");
    expect(r.worst?.margin).toBeCloseTo(2, 10);
    expect(r.messages.join("\n")).toMatch(/coherent worst case reaches 33.01 dBm/);
  });

  it("fails on the coherent basis with the right margin and names the block", () => {
    const r = driveCheck(make(32), { sources, coherent: true });
    expect(r.verdict).toBe("fail");
    expect(r.worst?.block).toBe("LOAD");
    expect(r.worst?.margin).toBeCloseTo(32 - 10 * Math.log10(2000), 10);
    const blk = r.blocks.find((b) => b.block === "LOAD");
    expect(blk?.verdict).toBe("fail");
  });

  it("a block rated below its own source's power fails", () => {
    const r = driveCheck(make(40, 29), { sources: [{ port: "A", dbm: 30 }] });
    expect(r.verdict).toBe("fail");
    expect(r.worst).toMatchObject({ block: "SPL", port: 2 });
    expect(r.worst?.margin).toBeCloseTo(-1, 10);
  });

  it("a drive rule reports the worst incident power against its rating, with the cautions", () => {
    const sol = make(32);
    const r = evaluateRule(sol, { kind: "drive", id: "pa", sources, coherent: true }, 0);
    expect(r.verdict).toBe("fail");
    expect(r.unit).toBe("dBm");
    expect(r.worst).toBeCloseTo(10 * Math.log10(2000), 10);
    expect(r.limit).toBe(32);
    expect((r.extra?.drive as { cautions: string[] }).cautions[0]).toMatch(/burn people/);
    expect(JSON.parse(JSON.stringify(r)).extra.drive.cautions).toHaveLength(DRIVE_CAUTIONS.length);
  });

  it("rejects missing sources and unknown ports, and finds default sources in a drive rule", () => {
    const sol = make(32);
    expect(() => driveCheck(sol, { sources: [] })).toThrow(EngineInputError);
    expect(() => driveCheck(sol, { sources: [{ port: "Z", dbm: 1 }] })).toThrow(/unknown system port "Z"/);
    const scenario = { ...sol.system.scenario, rules: [{ kind: "drive" as const, sources: [{ port: "A", dbm: 43 }] }] };
    expect(defaultDriveSources(scenario)).toEqual([{ port: "A", dbm: 43 }]);
    expect(defaultDriveSources({ ...scenario, rules: [] })).toBeNull();
  });
});
