import "server-only";
import { randomUUID } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { writeTouchstone } from "@/engine/touchstone";
import type { RuleSpec, Scenario } from "@/engine/types";
import { recordAudit } from "@/lib/server/audit";
import { createPart } from "./queries/parts";
import { insertRevision } from "./queries/revisions";
import type { Transaction } from "./client";
import { rules, scenarios, type Role } from "./schema";

/** What a demo seed step works in: the seed's transaction, the demo project and the demo users by role. */
export type DemoSeedContext = {
  tx: Transaction;
  projectId: string;
  users: Record<Role, string>;
};

/**
 * The demo project's scenarios: the Kestrel telemetry front end, our own invented system. A transmit
 * chain (driver pad, band-pass filter part, 20 dB coupler for power monitoring at MON, T/R switch), a
 * receive chain (filter then LNA to RX) and an antenna switch choosing the ANT-A connector (a system
 * port) or the ANT-B patch (a part). "Baseline" meets the project's rules; "Cheaper switch" swaps the
 * T/R switch for one with 20 dB less isolation and fails the TX→RX isolation rule.
 */

const Z0 = 50;

/** Series R-L-C resonator between two 50 Ω ports: S11 = Z/(Z+2Z0), S21 = 2Z0/(Z+2Z0) (Pozar 4th ed., table 4.1, series impedance). */
export function resonatorFilterTouchstone(): string {
  const f0 = 2.44e9;
  const q = 9; // loaded Q of the resonator in the 100 Ω loop
  const r = 1.5; // loss resistance, Ω
  const w0 = 2 * Math.PI * f0;
  const l = (q * (2 * Z0 + r)) / w0;
  const c = 1 / (w0 * w0 * l);
  const nf = 181;
  const freqs = new Float64Array(nf);
  const data = new Float64Array(2 * 4 * nf);
  for (let k = 0; k < nf; k++) {
    const f = 2.0e9 + k * 5e6;
    freqs[k] = f;
    const w = 2 * Math.PI * f;
    const zr = r;
    const zi = w * l - 1 / (w * c);
    // 1 / (Z + 2 Z0)
    const dr = zr + 2 * Z0;
    const den = dr * dr + zi * zi;
    const ir = dr / den;
    const ii = -zi / den;
    const s11r = zr * ir - zi * ii;
    const s11i = zr * ii + zi * ir;
    const s21r = 2 * Z0 * ir;
    const s21i = 2 * Z0 * ii;
    const at = 8 * k;
    data.set([s11r, s11i, s21r, s21i, s21r, s21i, s11r, s11i], at);
  }
  return writeTouchstone(
    {
      frequencies: freqs,
      s: { n: 2, nf, data },
      z0: Z0,
      comments: ["Kestrel TX band-pass filter (invented data): one series resonator at 2.44 GHz, loaded Q 9, 1.5 ohm loss"],
    },
    { version: "1.1", format: "MA", unit: "GHz" },
  );
}

/** Patch antenna as a series R-L-C at 2.45 GHz with 62 Ω radiation resistance, seen from 50 Ω: Γ = (Z − Z0)/(Z + Z0). */
export function patchAntennaTouchstone(): string {
  const f0 = 2.45e9;
  const rr = 62;
  const q = 14;
  const w0 = 2 * Math.PI * f0;
  const l = (q * rr) / w0;
  const c = 1 / (w0 * w0 * l);
  const nf = 121;
  const freqs = new Float64Array(nf);
  const data = new Float64Array(2 * nf);
  for (let k = 0; k < nf; k++) {
    const f = 2.2e9 + k * 5e6;
    freqs[k] = f;
    const w = 2 * Math.PI * f;
    const zi = w * l - 1 / (w * c);
    const nr = rr - Z0;
    const dr = rr + Z0;
    const den = dr * dr + zi * zi;
    data[2 * k] = (nr * dr + zi * zi) / den;
    data[2 * k + 1] = (zi * dr - nr * zi) / den;
  }
  return writeTouchstone(
    { frequencies: freqs, s: { n: 1, nf, data }, z0: Z0, comments: ["Kestrel ANT-B patch antenna (invented data): resonance at 2.45 GHz, 62 ohm, Q 14"] },
    { version: "1.1", format: "RI", unit: "GHz" },
  );
}

export const DEMO_PART_FILES = { filter: "kestrel-tx-bpf.s2p", antenna: "kestrel-patch-b.s1p" } as const;

/** The project's rules: isolation TX→RX, match at TX, insertion loss TX→ANT-A, over 2.40–2.48 GHz. */
export const DEMO_RULES: RuleSpec[] = [
  { kind: "isolation", id: "tx-rx-isolation", from: "TX", to: "RX", band: [2.4e9, 2.48e9], min_db: 30 },
  { kind: "match", id: "tx-match", port: "TX", band: [2.4e9, 2.48e9], min_return_loss_db: 12 },
  { kind: "insertion_loss", id: "tx-ant-loss", from: "TX", to: "ANT-A", band: [2.4e9, 2.48e9], max_db: 6 },
];

/** The front end with a T/R switch of the given isolation. */
export function kestrelScenario(name: string, trIsolationDb: number): Scenario {
  return {
    format: "portolan.scenario/1",
    name,
    z0: Z0,
    frequency: { start: 2.3e9, stop: 2.6e9, points: 301 },
    blocks: [
      { id: "DRV", kind: "attenuator", params: { loss_db: 3 }, label: "driver pad", position: { x: 0, y: 0 } },
      { id: "TXBPF", kind: "touchstone", file: `parts/${DEMO_PART_FILES.filter}`, label: "TX band-pass", position: { x: 240, y: 0 } },
      { id: "CPL", kind: "coupler", params: { coupling_db: 20, directivity_db: 25, excess_loss_db: 0.1 }, label: "monitor coupler", position: { x: 480, y: 0 } },
      { id: "TERM", kind: "load", params: { return_loss_db: 30 }, label: "coupler termination", position: { x: 480, y: 220 } },
      { id: "TR", kind: "switch", params: { throws: 2, insertion_loss_db: 0.5, isolation_db: trIsolationDb }, state: 1, label: "T/R switch", position: { x: 740, y: 0 } },
      {
        id: "RXBPF",
        kind: "filter",
        params: { response: "bandpass", family: "chebyshev", order: 3, ripple_db: 0.1, center_hz: 2.44e9, bandwidth_hz: 2.0e8 },
        label: "RX preselector",
        position: { x: 740, y: 240 },
      },
      { id: "LNA", kind: "amplifier", params: { gain_db: 16, reverse_isolation_db: 30, input_return_loss_db: 14, output_return_loss_db: 14 }, rating_dbm: 10, position: { x: 980, y: 240 } },
      { id: "ASW", kind: "switch", params: { throws: 2, insertion_loss_db: 0.3, isolation_db: 25 }, state: 1, label: "antenna switch", position: { x: 1000, y: 0 } },
      { id: "ANTB", kind: "touchstone", file: `parts/${DEMO_PART_FILES.antenna}`, label: "ANT-B patch", position: { x: 1260, y: 140 } },
    ],
    links: [
      ["DRV:2", "TXBPF:1"],
      ["TXBPF:2", "CPL:1"],
      ["CPL:4", "TERM:1"],
      ["CPL:2", "TR:2"],
      ["TR:3", "RXBPF:1"],
      ["RXBPF:2", "LNA:1"],
      ["TR:1", "ASW:1"],
      ["ASW:3", "ANTB:1"],
    ],
    ports: [
      { name: "TX", at: "DRV:1" },
      { name: "RX", at: "LNA:2" },
      { name: "MON", at: "CPL:3" },
      { name: "ANT-A", at: "ASW:2" },
    ],
    // no `rules`: the demo scenarios are judged by the project's rules (DEMO_RULES), inherited
  };
}

export const DEMO_SCENARIOS = [
  { name: "Baseline", trIsolationDb: 45 },
  { name: "Cheaper switch", trIsolationDb: 25 },
] as const;

/**
 * Seed step for db/seed.ts: the two parts, the project rules and the demo scenarios (revision 1 each).
 * Does nothing when the project already has a "Baseline" scenario.
 */
export async function seedDemoScenarios({ tx, projectId, users }: DemoSeedContext): Promise<void> {
  const [existing] = await tx
    .select({ id: scenarios.id })
    .from(scenarios)
    .where(and(eq(scenarios.projectId, projectId), eq(scenarios.name, DEMO_SCENARIOS[0].name)));
  if (existing) return;
  const actor = null;
  await createPart({ actor, projectId, name: "TX band-pass filter", fileName: DEMO_PART_FILES.filter, text: resonatorFilterTouchstone(), executor: tx });
  await createPart({ actor, projectId, name: "ANT-B patch antenna", fileName: DEMO_PART_FILES.antenna, text: patchAntennaTouchstone(), executor: tx });
  for (const rule of DEMO_RULES) {
    await tx.insert(rules).values({ id: randomUUID(), projectId, kind: rule.kind, spec: rule, createdBy: users.engineer });
  }
  for (const demo of DEMO_SCENARIOS) {
    const id = randomUUID();
    await tx.insert(scenarios).values({ id, projectId, name: demo.name, createdBy: users.engineer });
    await insertRevision(tx, { scenarioId: id, projectId, content: kestrelScenario(demo.name, demo.trIsolationDb), authorId: users.engineer, origin: "seed" });
    await recordAudit(tx, { actor, projectId, action: "scenario.create", target: demo.name, detail: { scenarioId: id, template: "demo" } });
  }
}
