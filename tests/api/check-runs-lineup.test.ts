// The line-up as a stored check run (issue 16): run on the server on the demo's Baseline revision, its
// figures agree with the composite and with each other; bad inputs are refused and nothing is written.
import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { call, countRows, makeRequest, setUpDatabase, type ErrorJson } from "./helpers";
import * as runsRoute from "@/app/api/projects/[projectId]/scenarios/[scenarioId]/check-runs/route";
import { db } from "@/db/client";
import { checkRuns, scenarios, users } from "@/db/schema";
import { DEMO_USERS, seedDemo } from "@/db/seed";
import { createSessionForUser } from "@/lib/server/auth/session";
import type { CheckRunView } from "@/lib/domain/checks/types";
import type { LineupResult } from "@/engine/lineup";

let projectId: string;
let baseline: string;
let cookie = "";

beforeAll(async () => {
  await setUpDatabase();
  const seeded = await seedDemo();
  projectId = seeded.projectId!;
  const reviewer = DEMO_USERS.find((u) => u.role === "reviewer")!;
  const [row] = await db.select({ id: users.id }).from(users).where(eq(users.email, reviewer.email));
  cookie = `portolan_session=${(await createSessionForUser(row.id)).token}`;
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
});
