/**
 * The command line: `portolan solve <scenario.json> [--json] [--out file.sNp]`. Some cases run it as a
 * separate process as a person would, through the compiled entry (`node dist/portolan.mjs ...`, built by
 * the vitest global setup from today's sources); the rest call its `main` in this process with captured
 * output, which is the same code without the process start-up cost.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, describe, expect, it } from "vitest";
import { main } from "../../engine/cli";
import { internalWaves } from "../../engine/network";
import { formatRepeat, repeatTiming } from "../../engine/system/cli-solve";
import { solveScenario } from "../../engine/system";
import { parseTouchstone } from "../../engine/touchstone";
import { EngineInputError } from "../../engine/types";

const ROOT = fileURLToPath(new URL("../../", import.meta.url));
const CLI = join(ROOT, "dist", "portolan.mjs");
const FIXTURES = "tests/fixtures/scenarios";
const work = mkdtempSync(join(tmpdir(), "portolan-cli-"));
afterAll(() => rmSync(work, { recursive: true, force: true }));

function cli(...args: string[]): { code: number | null; stdout: string; stderr: string } {
  const run = spawnSync(process.execPath, [CLI, ...args], { cwd: ROOT, encoding: "utf8", maxBuffer: 1 << 28 });
  return { code: run.status, stdout: run.stdout, stderr: run.stderr };
}

/** The same command through `main`, in this process. */
async function run(...args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  let stdout = "";
  let stderr = "";
  const code = await main(args, { out: (t) => (stdout += t), err: (t) => (stderr += t), cwd: ROOT });
  return { code, stdout, stderr };
}

/** Writes a scenario (or raw text) to the temporary folder and returns its path. */
function scenarioFile(name: string, content: unknown): string {
  const path = join(work, name);
  writeFileSync(path, typeof content === "string" ? content : JSON.stringify(content, null, 2));
  return path;
}

const twoPads = () => JSON.parse(readFileSync(join(ROOT, FIXTURES, "two-pads.json"), "utf8"));

describe("portolan solve", () => {
  it("prints the composite as Touchstone 1.1 that reads back (two 3 dB pads give 6 dB)", () => {
    const r = cli("solve", `${FIXTURES}/two-pads.json`);
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^! Portolan composite of scenario "Two 3 dB pads"/);
    expect(r.stdout).toMatch(/port 1: IN/);
    expect(r.stdout).toMatch(/^# Hz S RI R 50$/m);
    const back = parseTouchstone(r.stdout, { name: "out.s2p" });
    expect(back.ports).toBe(2);
    expect(Array.from(back.frequencies)).toEqual([1e9, 1.5e9, 2e9]);
    // cascaded matched pads add in dB (common practice): |S21| = 10^(−6/20)
    expect(back.s.data[2 * 2]).toBeCloseTo(Math.pow(10, -6 / 20), 10);
  });

  it("prints JSON with frequencies, ports, S as [re, im], warnings and the solve time", () => {
    const r = cli("solve", `${FIXTURES}/telemetry-front-end.json`, "--json");
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.ports).toEqual(["TX", "RX", "DET"]);
    expect(out.frequencies).toHaveLength(101);
    expect(out.frequencies[0]).toBe(2.2e9);
    expect(out.s).toHaveLength(101);
    expect(out.s[0]).toHaveLength(3);
    expect(out.s[0][0]).toHaveLength(3);
    expect(out.s[0][0][0]).toHaveLength(2);
    expect(typeof out.s[50][1][0][0]).toBe("number");
    expect(out.warnings).toContain("block CPL port 4 is not linked and not a system port: treated as a matched termination");
    expect(typeof out.solve_ms).toBe("number");
  });

  it("writes Touchstone 2.0 with [Reference] when system ports have their own Z0", () => {
    const r = cli("solve", `${FIXTURES}/mixed-z0-pad.json`);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/\[Version\] 2\.0/);
    const back = parseTouchstone(r.stdout, { name: "out.s2p" });
    expect(Array.from(back.z0)).toEqual([50, 0, 75, 0]);
  });

  it("writes the file named by --out and refuses a name with the wrong port count", async () => {
    const out = join(work, "pads.s2p");
    const r = await run("solve", `${FIXTURES}/two-pads.json`, "--out", out);
    expect(r.code).toBe(0);
    expect(r.stdout).toBe("");
    expect(parseTouchstone(readFileSync(out, "utf8"), { name: "pads.s2p" }).ports).toBe(2);
    const wrong = await run("solve", `${FIXTURES}/two-pads.json`, "--out", join(work, "pads.s3p"));
    expect(wrong.code).toBe(2);
    expect(wrong.stderr).toMatch(/must end \.s2p/);
  });

  it("exits 2 with one line naming the JSON path of a bad parameter", async () => {
    const s = twoPads();
    s.blocks[1].params.loss_db = -3;
    const path = scenarioFile("bad-loss.json", s);
    const r = await run("solve", path);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr.trim().split("\n")).toHaveLength(1);
    expect(r.stderr).toMatch(/bad-loss\.json: blocks\[1\]\.params\.loss_db: .*-3/);
  });

  it("exits 2 for a link to an unknown block", async () => {
    const s = twoPads();
    s.links[0][1] = "PAD9:1";
    const r = await run("solve", scenarioFile("bad-link.json", s));
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/bad-link\.json: links\[0\]\[1\]: no block with id "PAD9"/);
  });

  it("exits 2 for invalid JSON with line and column", async () => {
    const r = await run("solve", scenarioFile("broken.json", '{\n  "format": "portolan.scenario/1",\n  "name": "x"\n  "z0": 50\n}'));
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/broken\.json: line 4, column 3: invalid JSON/);
  });

  it("exits 2 for a missing scenario file", () => {
    const r = cli("solve", "no/such/scenario.json");
    expect(r.code).toBe(2);
    expect(r.stderr.trim()).toBe("no/such/scenario.json: cannot read scenario file: no such file");
  });

  it("exits 2 for a missing part file, naming the block's file field", async () => {
    const s = JSON.parse(readFileSync(join(ROOT, FIXTURES, "telemetry-front-end.json"), "utf8"));
    const r = await run("solve", scenarioFile("no-part.json", s));
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/no-part\.json: blocks\[5\]\.file: cannot read part file "parts\/telemetry-patch\.s1p"/);
  });

  it("exits 2 for a lossless resonance that has no solution, naming it", async () => {
    // a lossless cavity: a matched line between a switch's reflective (open) off throw and a short circuit.
    // The line is a quarter wave at 250 MHz (θ = 2πfL/c0 = π/2), so the round trip e^(−j2θ) = −1 and with
    // the two reflections (+1 and −1) the loop gain is exactly 1: no unique solution at resonance
    // (lossless resonators: Pozar, Microwave Engineering, 4th ed., ch. 6, from memory)
    const r = await run(
      "solve",
      scenarioFile("cavity.json", {
        format: "portolan.scenario/1",
        name: "cavity",
        z0: 50,
        frequency: { list: [2.5e8, 5e8] },
        blocks: [
          { id: "SW", kind: "switch", params: { throws: 2, insertion_loss_db: 0, isolation_db: null, off_state: "reflective" }, state: 1 },
          { id: "LINE", kind: "line", params: { length_m: 0.299792458 } },
          { id: "SHORT", kind: "load", params: { impedance: [0, 0] } },
        ],
        links: [
          ["SW:3", "LINE:1"],
          ["LINE:2", "SHORT:1"],
        ],
        ports: [
          { name: "A", at: "SW:1" },
          { name: "B", at: "SW:2" },
        ],
      }),
    );
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr.trim().split("\n")).toHaveLength(1);
    expect(r.stderr).toMatch(/cavity\.json: .*singular/i);
  });

  it("exits 2 for an unknown option or command, and prints usage for --help", async () => {
    expect((await run("solve", `${FIXTURES}/two-pads.json`, "--bogus")).code).toBe(2);
    expect((await run("frobnicate")).code).toBe(2);
    const help = cli("--help");
    expect(help.code).toBe(0);
    expect(help.stdout).toMatch(/portolan solve <scenario\.json> \[--json\] \[--out file\.sNp\]/);
    const solveHelp = await run("solve", "--help");
    expect(solveHelp.code).toBe(0);
    expect(solveHelp.stdout).toMatch(/--json/);
  });

  it("reports with --repeat N the first (cold) and the median warm solve time on stderr, the output unchanged", () => {
    const r = cli("solve", `${FIXTURES}/two-pads.json`, "--repeat", "5");
    expect(r.code).toBe(0);
    expect(r.stdout).toBe(cli("solve", `${FIXTURES}/two-pads.json`).stdout);
    expect(r.stderr).toMatch(/^solve --repeat 5: first \(cold\) \d+\.\d\d ms, median of 4 warm \d+\.\d\d ms \(prepare \+ solve; files read once\)\n$/);
    const j = cli("solve", `${FIXTURES}/two-pads.json`, "--json", "--repeat=3");
    const out = JSON.parse(j.stdout);
    expect(out.repeat.runs).toBe(3);
    expect(out.repeat.first_ms).toBeGreaterThan(0);
    expect(out.repeat.warm_median_ms).toBeGreaterThan(0);
  });

  it("takes the median of the warm runs only (the mean of the middle two for an even count)", () => {
    expect(repeatTiming([90, 8, 7, 9])).toEqual({ runs: 4, first_ms: 90, warm_median_ms: 8 });
    expect(repeatTiming([90, 8, 7, 9, 100])).toEqual({ runs: 5, first_ms: 90, warm_median_ms: 8.5 });
    expect(repeatTiming([12])).toEqual({ runs: 1, first_ms: 12, warm_median_ms: null });
    expect(formatRepeat(repeatTiming([12]))).toBe("solve --repeat 1: first (cold) 12.00 ms, no warm runs (prepare + solve; files read once)");
  });

  it("exits 2 for a --repeat that is not a whole number of runs", async () => {
    for (const bad of ["0", "2.5", "x"]) {
      const r = await run("solve", `${FIXTURES}/two-pads.json`, "--repeat", bad);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/--repeat expects a whole number of runs from 1 to 10000/);
    }
  });

  it("keeps no internal-wave maps for a plain solve (the CLI's solve asks for none)", () => {
    const sol = solveScenario(twoPads(), { waves: false });
    const inc = new Float64Array(2 * sol.frequencies.length * sol.ports.length);
    expect(() => internalWaves(sol, inc)).toThrow(EngineInputError);
    expect(() => internalWaves(solveScenario(twoPads()), inc)).not.toThrow();
  });
});
