/**
 * `part_version` on touchstone blocks (docs/scenario-format.md#part-versions): what the schema accepts and
 * refuses (with the JSON path), how a pinned version is looked up among supplied texts, that a file on disk
 * is read as `file`, and the largest |S| change between two versions against numpy's interpolation.
 */
import { describe, expect, it } from "vitest";
import { parseScenario } from "../../engine/scenario";
import { parsePinnedPartPath, pinnedPartPath, solveScenario } from "../../engine/system";
import { parseTouchstone } from "../../engine/touchstone";
import { EngineInputError, type Scenario } from "../../engine/types";
import { maxMagnitudeChangeDb } from "../../lib/domain/parts/compare";
import { partFilesOf } from "../../lib/domain/scenarios/part-files";
import { blocksBehind, partPinMoves, setPartVersion } from "../../lib/domain/parts/pins";
import { runPythonJson } from "./reference/python";

/** An invented matched 2-port: S11 = S22 = 0, S21 = S12 = `through` (real) at 1 and 2 GHz, 50 Ω. */
const pad = (through: number) => ["# GHz S RI R 50", `1 0 0 ${through} 0 ${through} 0 0 0`, `2 0 0 ${through} 0 ${through} 0 0 0`, ""].join("\n");

function scenario(block: Record<string, unknown>): Scenario {
  return {
    format: "portolan.scenario/1",
    name: "pin",
    z0: 50,
    frequency: { list: [1e9, 2e9] },
    blocks: [{ id: "P", kind: "touchstone", file: "parts/pad.s2p", ...block } as Scenario["blocks"][number]],
    links: [],
    ports: [
      { name: "A", at: "P:1" },
      { name: "B", at: "P:2" },
    ],
  };
}

function errorOf(fn: () => unknown): EngineInputError {
  try {
    fn();
  } catch (err) {
    if (err instanceof EngineInputError) return err;
    throw err;
  }
  throw new Error("expected an EngineInputError");
}

const s21 = (sc: Scenario, parts: Record<string, string>) => {
  const solution = solveScenario(parseScenario(sc, { parts }), { parts });
  return Math.hypot(solution.s.data[2 * 2], solution.s.data[2 * 2 + 1]); // S[0][1][0]: row 1, column 0 of a 2×2
};

describe("part_version in the scenario file", () => {
  it("absent means 1; an integer ≥ 1 is accepted and kept", () => {
    expect(parseScenario(scenario({})).blocks[0].part_version).toBeUndefined();
    expect(parseScenario(scenario({ part_version: 3 })).blocks[0].part_version).toBe(3);
  });

  it.each([0, -1, 1.5, "2", null])("part_version %s is refused at blocks[0].part_version", (value) => {
    const err = errorOf(() => parseScenario(scenario({ part_version: value })));
    expect(err.where).toBe("blocks[0].part_version");
  });

  it("a built-in kind or an inline-only touchstone block may not pin a version", () => {
    const builtIn = { ...scenario({}), blocks: [{ id: "P", kind: "attenuator", params: { loss_db: 3 }, part_version: 2 }] } as unknown as Scenario;
    expect(errorOf(() => parseScenario({ ...builtIn, ports: [{ name: "A", at: "P:1" }] })).where).toBe("blocks[0].part_version");
    const inline = { ...scenario({}), blocks: [{ id: "P", kind: "touchstone", data: pad(0.5), part_version: 2 }] } as unknown as Scenario;
    expect(errorOf(() => parseScenario(inline)).where).toBe("blocks[0].part_version");
  });
});

describe("resolving a pinned version", () => {
  it("pinnedPartPath puts v<N>/ before the file name above version 1, and parsePinnedPartPath inverts it", () => {
    expect(pinnedPartPath("parts/pad.s2p")).toBe("parts/pad.s2p");
    expect(pinnedPartPath("parts/pad.s2p", 1)).toBe("parts/pad.s2p");
    expect(pinnedPartPath("parts/pad.s2p", 12)).toBe("parts/v12/pad.s2p");
    expect(pinnedPartPath("pad.s2p", 2)).toBe("v2/pad.s2p");
    for (const key of ["parts/pad.s2p", "parts/v2/pad.s2p", "parts/v12/pad.s2p", "v2/pad.s2p"]) {
      const { file, version } = parsePinnedPartPath(key);
      expect(pinnedPartPath(file, version)).toBe(key);
    }
    // a folder that happens to be called v1 is not a version (version 1 has no segment)
    expect(parsePinnedPartPath("parts/v1/pad.s2p")).toEqual({ file: "parts/v1/pad.s2p", version: 1 });
  });

  it("supplied texts are looked up by the pinned path: version 1 and version 2 of one file solve differently", () => {
    const parts = { "parts/pad.s2p": pad(0.5), "parts/v2/pad.s2p": pad(0.25) };
    // a matched 2-port between two ports at its reference: the composite S21 is the file's (Pozar 4th ed., §4.3)
    expect(s21(scenario({}), parts)).toBeCloseTo(0.5, 14);
    expect(s21(scenario({ part_version: 2 }), parts)).toBeCloseTo(0.25, 14);
  });

  it("a pinned version missing from the supplied texts is not replaced by another version", () => {
    const err = errorOf(() => solveScenario(parseScenario(scenario({ part_version: 2 })), { parts: { "parts/pad.s2p": pad(0.5) } }));
    expect(err.where).toBe("blocks[0].file");
  });

  it("a file on disk has no versions: readFile is asked for `file` itself", () => {
    const asked: string[] = [];
    const readFile = (p: string) => {
      asked.push(p);
      return pad(0.5);
    };
    const sol = solveScenario(parseScenario(scenario({ part_version: 4 }), { readFile }), { readFile });
    expect(Math.hypot(sol.s.data[4], sol.s.data[5])).toBeCloseTo(0.5, 14);
    expect(new Set(asked)).toEqual(new Set(["parts/pad.s2p"]));
  });

  it("partFilesOf names each pinned version once, as the server reads them", () => {
    const sc = { blocks: [{ id: "A", kind: "touchstone", file: "parts/pad.s2p" }, { id: "B", kind: "touchstone", file: "parts/pad.s2p", part_version: 2 }, { id: "C", kind: "touchstone", file: "parts/pad.s2p", part_version: 2 }] };
    expect(partFilesOf(sc).sort()).toEqual(["parts/pad.s2p", "parts/v2/pad.s2p"]);
  });
});

describe("pins in the workspace model", () => {
  const sc = { blocks: [{ id: "A", kind: "touchstone", file: "parts/pad.s2p" }, { id: "B", kind: "touchstone", file: "parts/pad.s2p", part_version: 3 }, { id: "C", kind: "attenuator" }] };

  it("blocksBehind lists blocks pinning less than the latest; setPartVersion moves one (version 1 written as absent)", () => {
    expect(blocksBehind(sc, new Map([["pad.s2p", 3]]))).toEqual([{ blockId: "A", fileName: "pad.s2p", pinned: 1, latest: 3 }]);
    const moved = setPartVersion(sc, "A", 3);
    expect(blocksBehind(moved, new Map([["pad.s2p", 3]]))).toEqual([]);
    expect(setPartVersion(moved, "A", 1).blocks[0]).toEqual({ id: "A", kind: "touchstone", file: "parts/pad.s2p" });
    expect(partPinMoves(sc, moved)).toEqual([{ blockId: "A", file: "parts/pad.s2p", from: 1, to: 3 }]);
    expect(partPinMoves(sc, sc)).toEqual([]);
  });
});

describe("largest |S| change between two versions", () => {
  it("matches numpy: np.interp of the older version's real and imaginary parts onto the newer's points in the common range", () => {
    const before = parseTouchstone(["# GHz S RI R 50", "1 0.1 0.05 0.9 -0.1 0.9 -0.1 0.2 0", "2 0.2 0.1 0.7 -0.3 0.7 -0.3 0.1 0.1", "3 0.3 -0.1 0.5 -0.5 0.5 -0.5 0.05 0.2", ""].join("\n"), { name: "a.s2p" });
    const after = parseTouchstone(
      ["# GHz S RI R 50", "0.5 0.1 0 0.9 0 0.9 0 0.1 0", "1.5 0.12 0.07 0.82 -0.2 0.82 -0.2 0.15 0.04", "2.5 0.31 0.02 0.55 -0.45 0.55 -0.45 0.1 0.12", "3.5 0.3 0 0.4 -0.4 0.4 -0.4 0.1 0.1", ""].join("\n"),
      { name: "b.s2p" },
    );
    const ours = maxMagnitudeChangeDb(before, after);
    const toLists = (d: typeof before) => ({ f: Array.from(d.frequencies), re: Array.from({ length: d.s.nf * 4 }, (_, k) => d.s.data[2 * k]), im: Array.from({ length: d.s.nf * 4 }, (_, k) => d.s.data[2 * k + 1]) });
    const ref = runPythonJson<{ db: number; hz: number }>(
      [
        "import json, sys",
        "x = json.load(sys.stdin)",
        "a, b = x['a'], x['b']",
        "fa = np.array(a['f']); fb = np.array(b['f'])",
        "sa = (np.array(a['re']) + 1j * np.array(a['im'])).reshape(len(fa), 2, 2)",
        "sb = (np.array(b['re']) + 1j * np.array(b['im'])).reshape(len(fb), 2, 2)",
        "keep = (fb >= fa[0]) & (fb <= fa[-1])",
        "best = (-1.0, 0.0)",
        "for k in np.nonzero(keep)[0]:",
        "    for i in range(2):",
        "        for j in range(2):",
        "            old = np.interp(fb[k], fa, sa[:, i, j].real) + 1j * np.interp(fb[k], fa, sa[:, i, j].imag)",
        "            d = abs(20 * np.log10(abs(sb[k, i, j])) - 20 * np.log10(abs(old)))",
        "            if d > best[0]: best = (d, fb[k])",
        "print(json.dumps({'db': float(best[0]), 'hz': float(best[1])}))",
      ].join("\n"),
      { a: toLists(before), b: toLists(after) },
    );
    expect(ours).not.toBeNull();
    expect(ours!.db).toBeCloseTo(ref.db, 10);
    expect(ours!.hz).toBe(ref.hz);
  });

  it("is null when the ranges do not overlap", () => {
    const low = parseTouchstone(["# GHz S RI R 50", "1 0 0 0.5 0 0.5 0 0 0", "2 0 0 0.5 0 0.5 0 0 0", ""].join("\n"), { name: "a.s2p" });
    const high = parseTouchstone(["# GHz S RI R 50", "3 0 0 0.5 0 0.5 0 0 0", "4 0 0 0.5 0 0.5 0 0 0", ""].join("\n"), { name: "b.s2p" });
    expect(maxMagnitudeChangeDb(low, high)).toBeNull();
  });
});
