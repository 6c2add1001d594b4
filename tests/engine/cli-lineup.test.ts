/**
 * `portolan lineup`, run as a person would through the compiled entry (`node dist/portolan.mjs`, built by
 * the vitest global setup from today's sources), as tests/engine/cli.test.ts runs `solve`.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, describe, expect, it } from "vitest";

const ROOT = fileURLToPath(new URL("../../", import.meta.url));
const CLI = join(ROOT, "dist", "portolan.mjs");
const work = mkdtempSync(join(tmpdir(), "portolan-lineup-"));
afterAll(() => rmSync(work, { recursive: true, force: true }));

function cli(...args: string[]): { code: number | null; stdout: string; stderr: string } {
  const run = spawnSync(process.execPath, [CLI, ...args], { cwd: ROOT, encoding: "utf8", maxBuffer: 1 << 28 });
  return { code: run.status, stdout: run.stdout, stderr: run.stderr };
}

const lin = (d: number): number => 10 ** (d / 10);

const receiver = {
  format: "portolan.scenario/1",
  name: "receiver",
  z0: 50,
  frequency: { start: 1e9, stop: 2e9, points: 5 },
  blocks: [
    { id: "LNA", kind: "amplifier", params: { gain_db: 18, reverse_isolation_db: null, noise_figure_db: 1.2 }, p1db_out_dbm: 15, oip3_dbm: 25 },
    { id: "FLT", kind: "attenuator", params: { loss_db: 2 } },
    { id: "GAIN", kind: "amplifier", params: { gain_db: 15, reverse_isolation_db: null, noise_figure_db: 4 }, p1db_out_dbm: 20, oip3_dbm: 32 },
  ],
  links: [
    ["LNA:2", "FLT:1"],
    ["FLT:2", "GAIN:1"],
  ],
  ports: [
    { name: "ANT", at: "LNA:1" },
    { name: "IF", at: "GAIN:2" },
  ],
};

describe("portolan lineup", () => {
  const file = join(work, "receiver.json");
  writeFileSync(file, JSON.stringify(receiver));

  it("--json has the issue's fields: frequencies, from, to, gain_db[f], nf_db[f] and stages; Friis and the cascade formulas on matched stages", () => {
    const r = cli("lineup", file, "--from", "ANT", "--to", "IF", "--input-dbm", "-40", "--json");
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(Object.keys(j)).toEqual(["frequencies", "from", "to", "gain_db", "nf_db", "input_dbm", "path", "stages", "warnings"]);
    expect(j.frequencies).toEqual([1e9, 1.25e9, 1.5e9, 1.75e9, 2e9]);
    expect([j.from, j.to, j.input_dbm]).toEqual(["ANT", "IF", -40]);
    // Friis (Pozar, Microwave Engineering, 4th ed., ch. 10, from memory); a 2 dB pad at 290 K has F = L
    const friis = 10 * Math.log10(lin(1.2) + (lin(2) - 1) / lin(18) + (lin(4) - 1) / lin(16));
    for (let k = 0; k < 5; k++) {
      expect(j.gain_db[k]).toBeCloseTo(31, 10);
      expect(j.nf_db[k]).toBeCloseTo(friis, 9);
    }
    expect(j.stages.map((s: { block: string; in_port: number; out_port: number }) => `${s.block}:${s.in_port}>${s.out_port}`)).toEqual(["LNA:1>2", "FLT:1>2", "GAIN:1>2"]);
    const last = j.stages[2];
    // 1/OIP3 = 1/(25 dBm + 13 dB) + 1/32 dBm in mW (common practice): 10^3.8 and 10^3.2 mW → 31.03 dBm
    const oip3 = 10 * Math.log10(1 / (1 / 10 ** 3.8 + 1 / 10 ** 3.2));
    expect(last.cumulative_oip3_dbm[0]).toBeCloseTo(oip3, 9);
    expect(last.cumulative_iip3_dbm[0]).toBeCloseTo(oip3 - 31, 9);
    expect(last.level_out_dbm[0]).toBeCloseTo(-9, 9);
    expect(last.headroom_db[0]).toBeCloseTo(29, 9);
    expect(j.stages[1].headroom_db).toBeNull();
    expect(j.stages[1].p1db_out_dbm).toBeNull();
  });

  it("--blocks gives the same stages as the traced path; the text form shows the stage table", () => {
    const given = JSON.parse(cli("lineup", file, "--from", "ANT", "--to", "IF", "--blocks", "LNA,FLT,GAIN", "--json").stdout);
    const traced = JSON.parse(cli("lineup", file, "--from", "ANT", "--to", "IF", "--json").stdout);
    expect(given.path.source).toBe("given");
    expect(given.stages).toEqual(traced.stages);
    const text = cli("lineup", file, "--from", "ANT", "--to", "IF");
    expect(text.code).toBe(0);
    expect(text.stdout).toMatch(/^line-up ANT → IF \(strongest leak-trace path\): LNA 1→2 → FLT 1→2 → GAIN 1→2$/m);
    expect(text.stdout).toMatch(/^GAIN 1→2 +15\.00 +31\.00 /m);
  });

  it("bad input: exit 2 with one message naming what is wrong", () => {
    const missing = cli("lineup", file, "--from", "ANT");
    expect([missing.code, missing.stdout]).toEqual([2, ""]);
    expect(missing.stderr).toMatch(/needs --from and --to/);
    const unknown = cli("lineup", file, "--from", "ANT", "--to", "NOPE");
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toMatch(/receiver\.json: lineup\.to: unknown system port "NOPE"/);
    const level = cli("lineup", file, "--from", "ANT", "--to", "IF", "--input-dbm", "loud");
    expect(level.code).toBe(2);
    expect(level.stderr).toMatch(/--input-dbm expects a level in dBm, got "loud"/);
    const broken = cli("lineup", file, "--from", "ANT", "--to", "IF", "--blocks", "LNA,GAIN");
    expect(broken.code).toBe(2);
    expect(broken.stderr).toMatch(/no link from LNA to GAIN/);
  });
});
