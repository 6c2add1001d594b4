/**
 * Size of a solve before it runs (engine/system/estimate.ts): the estimate against what prepareSystem and
 * solveSystem actually allocate, the refusal of a scenario over the limit before any large array exists,
 * and the CLI's --max-memory and exit codes (2 refused, 70 internal error, never 1 for a crash).
 */
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { main } from "@/engine/cli";
import { parseByteSize } from "@/engine/cli-support";
import { solveSystem } from "@/engine/network";
import { DEFAULT_MAX_SOLVE_BYTES, SizeLimitError, estimateSolve, prepareSystem, solveScenario } from "@/engine/system";
import { EngineInputError, type Scenario } from "@/engine/types";
import { array64, referenceFrontEnd } from "../bench/scenarios";

const work = mkdtempSync(join(tmpdir(), "portolan-size-"));
afterAll(() => rmSync(work, { recursive: true, force: true }));

/** The case: a legal 256-element array on a 100,001-point plan (element 1 a system port). */
function bigArray(elements = 256, points = 100_001): Scenario {
  return {
    format: "portolan.scenario/1",
    name: `${elements}-element array`,
    z0: 50,
    frequency: { start: 1e9, stop: 2e9, points },
    blocks: [{ id: "ARR", kind: "array", params: { elements, return_loss_db: 15, coupling_db: 20 } }],
    links: [],
    ports: [{ name: "E1", at: "ARR:1" }],
  } as Scenario;
}

async function run(...args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  let stdout = "";
  let stderr = "";
  const code = await main(args, { out: (t) => (stdout += t), err: (t) => (stderr += t), cwd: work });
  return { code, stdout, stderr };
}

describe("estimateSolve", () => {
  it("counts exactly the block data, wave maps and composite that a solve of the front end allocates", () => {
    const scenario = referenceFrontEnd();
    const e = estimateSolve(scenario);
    const sys = prepareSystem(scenario);
    const sol = solveSystem(sys);
    // every block's S on the plan: 2 doubles per complex entry, n² entries per point (engine/types.ts SData)
    expect(e.details.blockDataBytes).toBe(sys.blocks.reduce((a, b) => a + b.s.data.byteLength, 0));
    expect(e.details.compositeBytes).toBe(sol.s.data.byteLength);
    expect(e.details.points).toBe(sys.frequencies.length);
    expect(e.details.blockPorts).toBe(sys.blockPorts.length);
    // the same from the prepared system
    const fromSystem = estimateSolve(sys);
    expect(fromSystem.details.waveMapBytes).toBe(e.details.waveMapBytes);
    expect(fromSystem.details.largestFrontier).toBe(e.details.largestFrontier);
    expect(estimateSolve(scenario, { waves: false }).details.waveMapBytes).toBe(0);
    expect(e.work).toBeGreaterThan(0);
  });

  it("grows with the points and with the square of a block's ports", () => {
    const a = estimateSolve(bigArray(64, 1001)).details.blockDataBytes;
    expect(estimateSolve(bigArray(64, 2001)).details.blockDataBytes / a).toBeCloseTo(2001 / 1001, 12);
    expect(estimateSolve(bigArray(128, 1001)).details.blockDataBytes / a).toBeCloseTo(4, 12);
    // the figure: a 64-element array on 100,001 points holds 16·100001·64² bytes ≈ 6.55 GB of block data
    expect(estimateSolve(bigArray(64)).details.blockDataBytes).toBe(16 * 100_001 * 64 * 64);
  });

  it("estimates the 64-element array benchmark with its join order and a frontier no larger than its ports", () => {
    const e = estimateSolve(array64());
    expect(e.details.blocks).toBe(192);
    expect(e.details.largestFrontier).toBeGreaterThanOrEqual(64);
    expect(e.details.largestBlock).toEqual({ id: "ARR", ports: 64 });
  });

  it("refuses the 256-element array at 100,001 points before allocating its data", () => {
    const before = process.memoryUsage().arrayBuffers;
    let error: unknown;
    try {
      solveScenario(bigArray());
    } catch (err) {
      error = err;
    }
    expect(error).toBeInstanceOf(SizeLimitError);
    expect(error).toBeInstanceOf(EngineInputError);
    const e = error as SizeLimitError;
    expect(e.limitBytes).toBe(DEFAULT_MAX_SOLVE_BYTES);
    expect(e.estimate.bytes).toBeGreaterThan(16 * 100_001 * 256 * 256);
    expect(e.message).toMatch(/a solve needs about [\d.]+ GiB .* over the limit of 2 GiB: reduce the frequency points \(100001\), the ports of the largest block \(ARR: 256/);
    // nothing near the block data (105 GB) was taken: typed-array memory grew by less than 64 MiB
    expect(process.memoryUsage().arrayBuffers - before).toBeLessThan(64 * 2 ** 20);
  });

  it("lets a small scenario through under a small limit and refuses it under a smaller one", () => {
    const scenario = referenceFrontEnd();
    const bytes = estimateSolve(scenario).bytes;
    expect(() => solveScenario(scenario, { maxBytes: bytes })).not.toThrow();
    expect(() => solveScenario(scenario, { maxBytes: bytes - 1 })).toThrow(SizeLimitError);
  });
});

describe("portolan --max-memory and exit codes", () => {
  const big = join(work, "big.json");
  writeFileSync(big, JSON.stringify(bigArray()));

  it("exits 2 with the estimate, the limit and what to reduce", async () => {
    const r = await run("solve", big);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(/^.*big\.json: scenario: a solve needs about [\d.]+ GiB .*over the limit of 2 GiB: reduce the frequency points \(100001\).*--max-memory\)\n$/);
    const c = await run("check", big, "--max-memory", "1GiB");
    expect(c.code).toBe(2);
    expect(c.stderr).toMatch(/over the limit of 1 GiB/);
  });

  it("exits 70 (EX_SOFTWARE), not 1, when the engine fails internally", async () => {
    // with the limit lifted, the 105 GB block cannot be allocated at all: a RangeError inside the engine
    const r = await run("solve", big, "--max-memory=1TB");
    expect(r.code).toBe(70);
    expect(r.stderr).toMatch(/^internal error \(exit 70\): RangeError/);
  });

  it("reads sizes with decimal and binary units and refuses anything else", () => {
    expect(parseByteSize("2GB", "--max-memory")).toBe(2e9);
    expect(parseByteSize("2GiB", "--max-memory")).toBe(2 ** 31);
    expect(parseByteSize("512 MiB", "--max-memory")).toBe(512 * 2 ** 20);
    expect(parseByteSize("4096", "--max-memory")).toBe(4096);
    expect(() => parseByteSize("2XB", "--max-memory")).toThrow('--max-memory expects a size such as 2GB, 2GiB, 512MB or a number of bytes, got "2XB"');
    expect(() => parseByteSize("-1GB", "--max-memory")).toThrow();
  });

  it("exits 2 for a --max-memory without a value", async () => {
    const r = await run("solve", big, "--max-memory");
    expect(r.code).toBe(2);
    expect(r.stderr).toBe("--max-memory needs a value\n");
  });
});
