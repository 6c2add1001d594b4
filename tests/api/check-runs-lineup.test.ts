// The line-up as a stored check run (issue 16): run on the server on the demo's Baseline revision, its
// figures agree with the composite and with each other; bad inputs are refused and nothing is written.
import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { call, countRows, makeRequest, setUpDatabase, type ErrorJson } from "./helpers";
import * as runsRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/check-runs/route";
import * as rulesRoute from "@/app/api/projects/[projectId]/rules/route";
import { rules as rulesTable } from "@/db/schema";
import type { AllChecksResult } from "@/engine/checks";
import { db } from "@/db/client";
import { checkRuns, scenarios, users } from "@/db/schema";
import { DEMO_USERS, seedDemo } from "@/db/seed";
import { createSessionForUser } from "@/lib/server/auth/session";
import type { CheckRunView } from "@/lib/domain/checks/types";
import type { LineupResult } from "@/engine/lineup";

let projectId: string;
let baseline: string;
let cookie = "";
let engineerCookie = "";

beforeAll(async () => {
  await setUpDatabase();
  const seeded = await seedDemo();
  projectId = seeded.projectId!;
  const reviewer = DEMO_USERS.find((u) => u.role === "reviewer")!;
  const [row] = await db.select({ id: users.id }).from(users).where(eq(users.email, reviewer.email));
  cookie = `portolan_session=${(await createSessionForUser(row.id)).token}`;
  const engineer = DEMO_USERS.find((u) => u.role === "engineer")!;
  const [eng] = await db.select({ id: users.id }).from(users).where(eq(users.email, engineer.email));
  engineerCookie = `portolan_session=${(await createSessionForUser(eng.id)).token}`;
  for (const s of await db.select().from(scenarios).where(eq(scenarios.projectId, projectId))) if (s.name === "Baseline") baseline = s.id;
});

const post = (body: unknown) =>
  call(runsRoute.POST, makeRequest("POST", `/api/projects/${projectId}/scenarios/${baseline}/check-runs`, { cookie, body }), { projectId, scenarioId: baseline });

describe("line-up check runs", () => {
  it("TX → MON through the driver pad, the filter part and the coupler: stored with its stages, levels and figures", async () => {
    const before = await countRows(checkRuns);
    const res = await post({ check: "lineup", inputs: { from: "TX", to: "MON", input_dbm: 0 } });
    expect(res.status).toBe(201);
    const { run } = (await res.json()) as { run: CheckRunView };
    expect(run.check).toBe("lineup");
    const r = run.figures.result as LineupResult;
    expect(r.stages.map((s) => `${s.block} ${s.inPort}→${s.outPort}`)).toEqual(["DRV 1→2", "TXBPF 1→2", "CPL 1→3"]);
    expect(run.headline).toMatch(/^TX→MON through 3 stages: gain /);
    for (let k = 0; k < r.frequencies.length; k += 50) {
      // the stage gains add up along the links to the transducer gain at MON (same Z0)
      const sum = r.stages.reduce((acc, s) => acc + s.gainDb[k], 0);
      expect(sum).toBeCloseTo(r.gainDb[k], 9);
      // a passive chain at 290 K: F = 1/G_available ≤ 1/G_transducer (Bosma; G_A = |S21|²/(1 − |S22|²)), and the
      // matched 3 dB pad alone gives F = L = 3 dB
      expect(r.nfDb[k]).toBeLessThanOrEqual(-r.gainDb[k] + 1e-9);
      expect(r.nfDb[k]).toBeGreaterThan(r.stages[1].cumulativeNfDb[k]);
      expect(r.stages[0].cumulativeNfDb[k]).toBeCloseTo(3, 9);
      expect(r.stages[2].levelOutDbm![k]).toBeCloseTo(r.gainDb[k], 9);
    }
    expect(run.verdict).toBe("pass");
    expect(await countRows(checkRuns)).toBe(before + 1);
  });

  it("bad inputs: 400 for a malformed request, 422 for a port or a path the scenario does not have; nothing written", async () => {
    const before = await countRows(checkRuns);
    for (const body of [{ check: "lineup", inputs: { from: "TX" } }, { check: "lineup", inputs: { from: "TX", to: "RX", input_dbm: "loud" } }, { check: "lineup", inputs: { from: "TX", to: "RX", extra: 1 } }]) {
      const res = await post(body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(((await res.json()) as ErrorJson).error.code).toBe("validation_failed");
    }
    const unknown = await post({ check: "lineup", inputs: { from: "TX", to: "NOPE" } });
    expect(unknown.status).toBe(422);
    expect(((await unknown.json()) as ErrorJson).error.message).toMatch(/NOPE/);
    const broken = await post({ check: "lineup", inputs: { from: "TX", to: "MON", blocks: ["DRV", "CPL"] } });
    expect(broken.status).toBe(422);
    expect(((await broken.json()) as ErrorJson).error.message).toMatch(/no link from DRV to CPL/);
    expect(await countRows(checkRuns)).toBe(before);
  });

  it("project rules of the new kinds (noise_figure, gain, headroom) are validated, stored and join all rules", async () => {
    const addRule = (spec: unknown) => call(rulesRoute.POST, makeRequest("POST", `/api/projects/${projectId}/rules`, { cookie: engineerCookie, body: { spec } }), { projectId });
    const before = await countRows(rulesTable);
    // no limit, least above largest, no input level: 400 naming the field, nothing written
    for (const [spec, field] of [
      [{ kind: "gain", id: "g0", from: "TX", to: "MON", band: [2.4e9, 2.48e9] }, "min_db"],
      [{ kind: "gain", id: "g1", from: "TX", to: "MON", band: [2.4e9, 2.48e9], min_db: -20, max_db: -30 }, "max_db"],
      [{ kind: "headroom", id: "h0", from: "TX", to: "MON", min_db: 3 }, "input_dbm"],
    ] as const) {
      const res = await addRule(spec);
      expect(res.status, JSON.stringify(spec)).toBe(400);
      expect(JSON.stringify(((await res.json()) as ErrorJson).error.fields)).toContain(field);
    }
    expect(await countRows(rulesTable)).toBe(before);
    for (const spec of [
      { kind: "noise_figure", id: "nf-tx-mon", from: "TX", to: "MON", band: [2.4e9, 2.48e9], max_db: 40 },
      { kind: "gain", id: "gain-tx-mon", from: "TX", to: "MON", band: [2.4e9, 2.48e9], min_db: -60, max_db: -10 },
      { kind: "headroom", id: "hr-tx-mon", from: "TX", to: "MON", input_dbm: 10, min_db: 0 },
    ]) {
      const res = await addRule(spec);
      expect(res.status, JSON.stringify(spec)).toBe(201);
    }
    const res = await post({ check: "all_rules", inputs: {} });
    expect(res.status).toBe(201);
    const all = ((await res.json()) as { run: CheckRunView }).run.figures.result as AllChecksResult;
    const byId = new Map(all.rules.map((r) => [r.id, r]));
    expect(byId.get("nf-tx-mon")?.verdict).toBe("pass");
    expect(byId.get("nf-tx-mon")?.quantity).toBe("noise figure");
    expect(byId.get("gain-tx-mon")?.verdict).toBe("pass");
    // no block on TX→MON states a P1dB: nothing to check, said so
    expect(byId.get("hr-tx-mon")?.messages.some((m) => m.includes("no block on the path carries p1db_out_dbm"))).toBe(true);
  });
});
