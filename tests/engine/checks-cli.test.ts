import { describe, expect, it } from "vitest";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { spawnSync } from "node:child_process";
import { main } from "@/engine/cli";

// Two matched 3 dB pads in a chain: IN→OUT insertion loss 6 dB at every point (common practice: dB of
// matched cascaded attenuators add), return loss infinite.
const base = {
  format: "portolan.scenario/1",
  name: "Two 3 dB pads",
  z0: 50,
  frequency: { start: 1e9, stop: 2e9, points: 3 },
  blocks: [
    { id: "PAD1", kind: "attenuator", params: { loss_db: 3 } },
    { id: "PAD2", kind: "attenuator", params: { loss_db: 3 } },
  ],
  links: [["PAD1:2", "PAD2:1"]],
  ports: [{ name: "IN", at: "PAD1:1" }, { name: "OUT", at: "PAD2:2" }],
};
const dir = mkdtempSync(join(tmpdir(), "portolan-check-"));
function scenarioFile(name: string, rules: unknown[]): string {
  writeFileSync(join(dir, name), JSON.stringify({ ...base, rules }));
  return name;
}
async function run(args: string[]) {
  let out = "", err = "";
  const code = await main(["check", ...args], { out: (t) => { out += t; }, err: (t) => { err += t; }, cwd: dir });
  return { code, out, err };
}

describe("portolan check", () => {
  it("exits 0 and prints a table when every rule and built-in check passes", async () => {
    const f = scenarioFile("pass.json", [{ kind: "insertion_loss", id: "il", from: "IN", to: "OUT", band: [1e9, 2e9], max_db: 6.5 }]);
    const r = await run([f]);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/PASS\s+rule il \(insertion_loss\)\s+worst 6\.00 dB \(IN→OUT\)/);
    expect(r.out).toMatch(/ledger IN/);
    expect(r.out).toMatch(/passivity/);
  });

  it("exits 1 when a rule fails, naming the worst frequency and margin", async () => {
    const f = scenarioFile("fail.json", [{ kind: "insertion_loss", id: "il", from: "IN", to: "OUT", band: [1e9, 2e9], max_db: 5 }]);
    const r = await run([f]);
    expect(r.code).toBe(1);
    expect(r.out).toMatch(/FAIL\s+rule il.*margin -1\.00 dB/);
  });

  it("--json prints every result as JSON", async () => {
    const f = scenarioFile("json.json", [{ kind: "isolation", from: "IN", to: "OUT", band: [1e9, 2e9], min_db: 3 }]);
    const r = await run([f, "--json"]);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.verdict).toBe("pass");
    expect(j.rules[0].worst).toBeCloseTo(6, 9);
    expect(j.checks.map((c: { name: string }) => c.name)).toEqual(["rule:rules[0]", "ledger:IN", "ledger:OUT", "passivity", "reciprocity"]);
  });

  it("exits 2 on bad input: missing file, unknown port, empty band, unknown option", async () => {
    expect((await run(["nope.json"])).code).toBe(2);
    const unknown = await run([scenarioFile("unknown.json", [{ kind: "match", port: "ANT", band: [1e9, 2e9], max_vswr: 2 }])]);
    expect(unknown.code).toBe(2);
    expect(unknown.err).toMatch(/rules\[0\]\.port.*ANT/);
    const empty = await run([scenarioFile("empty.json", [{ kind: "match", id: "m", port: "IN", band: [3e9, 4e9], max_vswr: 2 }])]);
    expect(empty.code).toBe(2);
    expect(empty.err).toMatch(/rule "m"/);
    expect((await run(["pass.json", "--bogus"])).code).toBe(2);
  });

  it("the npm script gives the same exit codes to a shell", () => {
    const f1 = scenarioFile("spawn-fail.json", [{ kind: "insertion_loss", from: "IN", to: "OUT", band: [1e9, 2e9], max_db: 5 }]);
    const npm = (file: string) => spawnSync("npm", ["run", "-s", "portolan", "--", "check", join(dir, file)], { cwd: process.cwd(), encoding: "utf8" });
    expect(npm(f1).status).toBe(1);
    expect(npm("missing.json").status).toBe(2);
  }, 60_000);
});
