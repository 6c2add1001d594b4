/**
 * Scenario files (docs/scenario-format.md) and system preparation: what is accepted, what is refused
 * and with which JSON path, the frequency plan, index maps, matched terminations, part handling.
 */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { frequencyPlan, parseScenario, parseScenarioText } from "../../engine/scenario";
import { parseTouchstoneCached, prepareSystem, solveScenario } from "../../engine/system";
import { EngineInputError, type Scenario } from "../../engine/types";

const FIXTURES = fileURLToPath(new URL("../fixtures/scenarios/", import.meta.url));
const readFixture = (name: string): unknown => JSON.parse(readFileSync(`${FIXTURES}${name}`, "utf8"));
const readPart = (rel: string): string => readFileSync(`${FIXTURES}${rel}`, "utf8");
const twoPads = (): Scenario => structuredClone(readFixture("two-pads.json")) as Scenario;

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- the cases write invalid values on purpose
type Loose = Record<string, any>;

function errorOf(fn: () => unknown): EngineInputError {
  try {
    fn();
  } catch (err) {
    if (err instanceof EngineInputError) return err;
    throw err;
  }
  throw new Error("expected an EngineInputError");
}

/** S[k][i][j] of a solution as [re, im]. */
function entry(s: { n: number; data: Float64Array }, k: number, i: number, j: number): [number, number] {
  const at = 2 * ((k * s.n + i) * s.n + j);
  return [s.data[at], s.data[at + 1]];
}

describe("parseScenario accepts the fixture scenarios", () => {
  for (const name of ["two-pads.json", "mixed-z0-pad.json", "inline-part-splitter.json", "telemetry-front-end.json"]) {
    it(`accepts ${name}`, () => {
      const scenario = parseScenario(readFixture(name), { readFile: readPart });
      expect(scenario.format).toBe("portolan.scenario/1");
      expect(scenario.blocks.length).toBeGreaterThan(0);
    });
  }
});

describe("parseScenario refuses bad input with the JSON path", () => {
  // each case: a change to the two-pad scenario, the `where` expected, and words the message must contain
  const cases: { what: string; change: (s: Loose) => void; where: string; says: RegExp }[] = [
    { what: "a wrong format string", change: (s) => (s.format = "portolan.scenario/2"), where: "format", says: /portolan\.scenario\/1/ },
    { what: "a negative system Z0", change: (s) => (s.z0 = -50), where: "z0", says: /> 0/ },
    { what: "a name that is not a string", change: (s) => (s.name = 7), where: "name", says: /string/ },
    { what: "an unknown block kind", change: (s) => (s.blocks[1].kind = "resistor"), where: "blocks[1].kind", says: /attenuator/ },
    { what: "a negative loss", change: (s) => (s.blocks[1].params.loss_db = -1), where: "blocks[1].params.loss_db", says: /-1/ },
    { what: "a loss given as text", change: (s) => (s.blocks[0].params.loss_db = "3 dB"), where: "blocks[0].params.loss_db", says: /number/ },
    { what: "an unknown parameter", change: (s) => (s.blocks[0].params.los_db = 3), where: "blocks[0].params.los_db", says: /unknown/ },
    { what: "a duplicate block id", change: (s) => (s.blocks[1].id = "PAD1"), where: "blocks[1].id", says: /duplicate/ },
    { what: "a link without a port number", change: (s) => (s.links[0][0] = "PAD1"), where: "links[0][0]", says: /BLOCK:PORT/ },
    { what: "a link to an unknown block", change: (s) => (s.links[0][1] = "PAD3:1"), where: "links[0][1]", says: /PAD3/ },
    { what: "a link to a port the block does not have", change: (s) => (s.links[0][1] = "PAD2:3"), where: "links[0][1]", says: /2 ports/ },
    { what: "a port linked twice", change: (s) => s.links.push(["PAD2:1", "PAD1:1"]), where: "links[1][0]", says: /linked twice/ },
    { what: "a link from a port to itself", change: (s) => (s.links[0] = ["PAD1:2", "PAD1:2"]), where: "links[0][1]", says: /linked twice/ },
    { what: "a system port at a linked port", change: (s) => (s.ports[1].at = "PAD2:1"), where: "ports[1].at", says: /linked/ },
    { what: "two system ports at one block port", change: (s) => (s.ports[1].at = "PAD1:1"), where: "ports[1].at", says: /already/ },
    { what: "duplicate system port names", change: (s) => (s.ports[1].name = "IN"), where: "ports[1].name", says: /duplicate/ },
    { what: "no system ports", change: (s) => (s.ports = []), where: "ports", says: /at least 1/ },
    { what: "a zero point count", change: (s) => (s.frequency.points = 0), where: "frequency.points", says: /≥ 1/ },
    { what: "too many points", change: (s) => (s.frequency.points = 100002), where: "frequency.points", says: /100001/ },
    { what: "stop below start", change: (s) => (s.frequency.stop = 5e8), where: "frequency.stop", says: /stop > start/ },
    { what: "a list that does not increase", change: (s) => (s.frequency = { list: [1e9, 2e9, 2e9] }), where: "frequency.list[2]", says: /increase/ },
    { what: "a negative frequency", change: (s) => (s.frequency = { list: [-1] }), where: "frequency.list[0]", says: /> 0/ },
    { what: "a state on a block that is not a switch", change: (s) => (s.blocks[0].state = 1), where: "blocks[0].state", says: /switch/ },
    {
      what: "a touchstone block without data or file",
      change: (s) => (s.blocks[1] = { id: "PAD2", kind: "touchstone" }),
      where: "blocks[1]",
      says: /file/,
    },
    {
      what: "a rule naming an unknown system port",
      change: (s) => (s.rules = [{ kind: "isolation", from: "IN", to: "RX", band: [1e9, 2e9], min_db: 20 }]),
      where: "rules[0].to",
      says: /RX/,
    },
    {
      what: "a rule band upside down",
      change: (s) => (s.rules = [{ kind: "insertion_loss", from: "IN", to: "OUT", band: [2e9, 1e9], max_db: 1 }]),
      where: "rules[0].band",
      says: /high ≥ low/,
    },
    {
      what: "a switch state beyond its throws",
      change: (s) => {
        s.blocks.push({ id: "SW", kind: "switch", params: { throws: 2, insertion_loss_db: 0.5, isolation_db: 30 }, state: 3 });
      },
      where: "blocks[2].state",
      says: /1 to 2/,
    },
  ];
  for (const c of cases) {
    it(`refuses ${c.what} at ${c.where}`, () => {
      const s = twoPads() as unknown as Loose;
      c.change(s);
      const err = errorOf(() => parseScenario(s));
      expect(err.where).toBe(c.where);
      expect(err.message).toMatch(c.says);
    });
  }

  it("refuses something that is not an object", () => {
    expect(errorOf(() => parseScenario([1, 2])).where).toBe("(root)");
  });

  it("reports invalid JSON with line and column", () => {
    // JSON (RFC 8259, section 4): a trailing comma before "}" is not allowed; the "}" is on line 3, column 1
    const err = errorOf(() => parseScenarioText('{\n  "format": "portolan.scenario/1",\n}'));
    expect(err.where).toBe("line 3, column 1");
    expect(err.message).toMatch(/invalid JSON/);
  });

  it("checks the port count of a touchstone part from its data", () => {
    const s = twoPads() as unknown as Loose;
    s.blocks[1] = { id: "PAD2", kind: "touchstone", ports: 1, data: "# GHz S RI R 50\n1 0.1 0\n2 0.1 0\n" };
    s.links[0] = ["PAD1:2", "PAD2:1"];
    s.ports[1].at = "PAD2:2";
    const err = errorOf(() => parseScenario(s));
    expect(err.where).toBe("ports[1].at");
    expect(err.message).toMatch(/1 port;/);
  });
});

describe("frequencyPlan", () => {
  it("spaces start/stop/points linearly with both ends included", () => {
    const f = frequencyPlan({ start: 1e9, stop: 2e9, points: 5 });
    expect(Array.from(f)).toEqual([1e9, 1.25e9, 1.5e9, 1.75e9, 2e9]);
  });
  it("returns a list as given", () => {
    expect(Array.from(frequencyPlan({ list: [1e8, 5e8, 1e9] }))).toEqual([1e8, 5e8, 1e9]);
  });
  it("allows one point when start = stop", () => {
    expect(Array.from(frequencyPlan({ start: 3e9, stop: 3e9, points: 1 }))).toEqual([3e9]);
  });
  it("ends exactly on stop for an awkward step", () => {
    const f = frequencyPlan({ start: 2.3e9, stop: 2.6e9, points: 301 });
    expect(f.length).toBe(301);
    expect(f[300]).toBe(2.6e9);
    expect(f[100]).toBeCloseTo(2.4e9, 0);
  });
});

describe("prepareSystem", () => {
  it("numbers block ports in scenario order and resolves links and system ports", () => {
    const sys = prepareSystem(parseScenario(readFixture("two-pads.json")));
    expect(sys.blockPorts.map((p) => `${p.block}:${p.port}`)).toEqual(["PAD1:1", "PAD1:2", "PAD2:1", "PAD2:2"]);
    expect(sys.blockOffset).toEqual([0, 2]);
    expect(sys.links).toEqual([[1, 2]]);
    expect(sys.systemPorts).toEqual([
      { name: "IN", at: 0, z0: 50 },
      { name: "OUT", at: 3, z0: 50 },
    ]);
    expect(sys.unterminated).toEqual([]);
    expect(sys.warnings).toEqual([]);
    expect(sys.frequencies.length).toBe(3);
    expect(sys.blocks.every((b) => b.s.nf === 3 && b.s.n === 2)).toBe(true);
  });

  it("treats an unlinked port as a matched termination and says so", () => {
    const sys = prepareSystem(parseScenario(readFixture("telemetry-front-end.json"), { readFile: readPart }), { readFile: readPart });
    const cpl4 = sys.blockPorts.find((p) => p.block === "CPL" && p.port === 4)!;
    expect(sys.unterminated).toEqual([cpl4.index]);
    expect(sys.warnings).toContain("block CPL port 4 is not linked and not a system port: treated as a matched termination");
  });

  it("renormalises a part from its own reference to the system Z0 (power waves)", () => {
    // Γ = 0.2 in 75 Ω is Z = 75·1.2/0.8 = 112.5 Ω; in 50 Ω Γ = (112.5 − 50)/(112.5 + 50) = 5/13
    // (Pozar, Microwave Engineering, 4th ed., eq. 2.35: Γ = (Z_L − Z0)/(Z_L + Z0))
    const sys = prepareSystem(parseScenario(readFixture("inline-part-splitter.json")));
    const term = sys.blocks.find((b) => b.id === "TERM")!;
    for (let k = 0; k < term.s.nf; k++) {
      expect(term.s.data[2 * k]).toBeCloseTo(5 / 13, 14);
      expect(term.s.data[2 * k + 1]).toBeCloseTo(0, 14);
    }
  });

  it("warns when part data is held outside its range, and refuses it unless allowed", () => {
    const scenario = parseScenario(readFixture("inline-part-splitter.json"));
    const sys = prepareSystem(scenario);
    // the plan is 900…1100 MHz in 50 MHz steps; the part covers 950…1050 MHz: one point on each side is held
    const hold = sys.warnings.filter((w) => w.startsWith("block TERM:"));
    expect(hold).toHaveLength(1);
    expect(hold[0]).toMatch(/1 below and 1 above/);
    const strict = { ...scenario, extrapolate: "error" as const };
    const err = errorOf(() => prepareSystem(strict));
    expect(err.where).toBe("blocks[1].data");
    expect(err.message).toMatch(/extrapolate/);
  });

  it("interpolates part data linearly onto the plan", () => {
    // linear interpolation in real and imaginary parts (the documented method of engine/interp)
    const s = twoPads();
    s.frequency = { list: [1.0e9, 1.05e9, 1.1e9] };
    s.blocks.push({ id: "T", kind: "touchstone", ports: 1, data: "# MHz S RI R 50\n1000 0.1 -0.2\n1100 0.3 0.2\n" });
    s.links.push(["PAD2:2", "T:1"]);
    s.ports = [{ name: "IN", at: "PAD1:1" }];
    const t = prepareSystem(s).blocks[2].s.data;
    expect(t[2]).toBeCloseTo(0.2, 14);
    expect(t[3]).toBeCloseTo(0, 14);
  });

  it("reads part files through readFile or parts, and names a file it cannot read", () => {
    const scenario = parseScenario(readFixture("telemetry-front-end.json"));
    const text = readPart("parts/telemetry-patch.s1p");
    const viaParts = prepareSystem(scenario, { parts: { "parts/telemetry-patch.s1p": text } });
    const viaRead = prepareSystem(scenario, { readFile: readPart });
    expect(Array.from(viaParts.blocks[5].s.data)).toEqual(Array.from(viaRead.blocks[5].s.data));
    const err = errorOf(() =>
      prepareSystem(scenario, {
        readFile: () => {
          throw new Error("no such file");
        },
      }),
    );
    expect(err.where).toBe("blocks[5].file");
    expect(err.message).toMatch(/telemetry-patch\.s1p.*no such file/);
    expect(errorOf(() => prepareSystem(scenario)).where).toBe("blocks[5].file");
  });

  it("parses the same part text once", () => {
    const text = "# GHz S RI R 50\n1 0.5 0\n2 0.25 0\n";
    expect(parseTouchstoneCached(text, "a.s1p")).toBe(parseTouchstoneCached(text, "a.s1p"));
  });

  it("places a touchstone syntax error at the file line", () => {
    const s = twoPads();
    s.blocks.push({ id: "T", kind: "touchstone", file: "bad.s1p" });
    s.links.push(["PAD2:2", "T:1"]);
    s.ports = [{ name: "IN", at: "PAD1:1" }];
    const err = errorOf(() => prepareSystem(s, { parts: { "bad.s1p": "# GHz S RI R 50\n1 0.5 0\n2 zero 0\n" } }));
    expect(err.where).toBe("bad.s1p:3");
    expect(err.message).toMatch(/block T/);
  });
});

describe("solveScenario", () => {
  it("solve() of two 3 dB pads gives 6 dB", () => {
    // matched attenuators in cascade add in dB (common practice); |S21| = 10^(−6/20)
    const sol = solveScenario(parseScenario(readFixture("two-pads.json")));
    expect(sol.ports).toEqual(["IN", "OUT"]);
    for (let k = 0; k < 3; k++) {
      const [re, im] = entry(sol.s, k, 1, 0);
      expect(re).toBeCloseTo(Math.pow(10, -6 / 20), 14);
      expect(im).toBeCloseTo(0, 14);
      expect(Math.hypot(...entry(sol.s, k, 0, 0))).toBeLessThan(1e-15);
    }
  });

  it("references each system port to its own Z0", () => {
    // 6 dB pad matched in 50 Ω, port B referenced to 75 Ω: seen from A, the pad ends in 75 Ω, so
    // S'11 = S12 S21 Γ_L/(1 − S22 Γ_L) with Γ_L = (75 − 50)/(75 + 50) = 0.2 (Pozar, Microwave Engineering,
    // 4th ed., eq. 12.3a, from memory); seen from B the pad ends in 50 Ω: S'22 = (50 − 75)/(50 + 75) = −0.2;
    // and |S'21|² = t²(1 − |Γ_L|²), the power reaching 75 Ω over the power available from the 50 Ω side.
    const sol = solveScenario(parseScenario(readFixture("mixed-z0-pad.json")));
    const t = Math.pow(10, -6 / 20);
    expect(sol.portZ0).toEqual([50, 75]);
    for (let k = 0; k < 3; k++) {
      expect(entry(sol.s, k, 0, 0)[0]).toBeCloseTo(0.2 * t * t, 14);
      expect(entry(sol.s, k, 1, 1)[0]).toBeCloseTo(-0.2, 14);
      expect(Math.hypot(...entry(sol.s, k, 1, 0))).toBeCloseTo(t * Math.sqrt(0.96), 14);
    }
  });
});

describe("the engine index", () => {
  it("offers parsing, solving and Touchstone output from one import", async () => {
    const engine = await import("../../engine");
    const sol = engine.solveScenario(engine.parseScenario(readFixture("two-pads.json")));
    // matched pads in cascade add in dB (common practice)
    expect(entry(sol.s, 0, 1, 0)[0]).toBeCloseTo(Math.pow(10, -6 / 20), 14);
    const text = engine.writeTouchstone({ frequencies: sol.frequencies, s: sol.s, z0: 50 }, { unit: "Hz" });
    expect(engine.parseTouchstone(text, { name: "pads.s2p" }).ports).toBe(2);
    expect(typeof engine.prepareSystem).toBe("function");
    expect(typeof engine.internalWaves).toBe("function");
    expect(typeof engine.evaluateBlock).toBe("function");
    expect(typeof engine.frequencyPlan).toBe("function");
  });
});

describe("parseScenario keeps the web app's editing fields", () => {
  it("keeps the typed expressions and chart positions of a block", () => {
    const input = twoPads() as Loose;
    input.blocks[0].expr = { loss_db: "3 dB" };
    input.blocks[0].position = { x: 10, y: -20 };
    const scenario = parseScenario(input);
    expect(scenario.blocks[0].expr).toEqual({ loss_db: "3 dB" });
    expect(scenario.blocks[0].position).toEqual({ x: 10, y: -20 });
  });

  it("refuses an expression that is not text, naming its path", () => {
    const input = twoPads() as Loose;
    input.blocks[0].expr = { loss_db: 3 };
    expect(errorOf(() => parseScenario(input)).where).toBe("blocks[0].expr.loss_db");
  });
});
