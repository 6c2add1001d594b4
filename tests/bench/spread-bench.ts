/**
 * Benchmark row of the spread analysis: 1000 samples of the reference front end at 201 points, with
 * spreads on eight blocks (antenna phases unknown, amplifier gains, isolator and circulator isolation,
 * a filter's centre frequency: a filter is re-synthesised for every sample) and its three rules.
 * Registered through tests/bench/rows/spread.ts (the bench index loads every module in rows/).
 */
import { performance } from "node:perf_hooks";
import { runSpread } from "../../engine/spread";
import type { Scenario } from "../../engine/types";
import { referenceFrontEnd } from "./scenarios";
import type { BenchRow } from "./timing";

const SPREADS: Record<string, Record<string, { plus_minus: number } | { sigma: number }>> = {
  ANT1: { phase_deg: { plus_minus: 180 } },
  ANT2: { phase_deg: { plus_minus: 180 } },
  ANT4: { phase_deg: { plus_minus: 180 } },
  PA1: { gain_db: { sigma: 0.5 } },
  LNA1: { gain_db: { sigma: 0.5 } },
  ISO1: { isolation_db: { plus_minus: 3 } },
  CIRC: { isolation_db: { sigma: 2 } },
  FLT3: { center_hz: { sigma: 5e6 } },
};

/** The reference front end with spreads on eight blocks. */
export function spreadFrontEnd(points = 201): Scenario {
  const sc = referenceFrontEnd(points);
  return { ...sc, blocks: sc.blocks.map((b) => (SPREADS[b.id] ? { ...b, spread: SPREADS[b.id] } : b)) };
}

/**
 * The spread analysis row of `npm run bench`: median of 3 runs after one warm-up run (wall and CPU).
 * @returns one row with its target (≤ 5 s)
 * @example const rows = await benchRows();
 */
export async function benchRows(): Promise<BenchRow[]> {
  const scenario = spreadFrontEnd(201);
  const samples = 1000;
  await runSpread(scenario, { samples: 100, seed: 1 });
  const wall: number[] = [];
  const cpu: number[] = [];
  let last = await runSpread(scenario, { samples: 1, seed: 1 });
  for (let run = 0; run < 3; run++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    last = await runSpread(scenario, { samples, seed: run + 1 });
    wall.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1000);
  }
  const median = (xs: number[]) => xs.slice().sort((a, b) => a - b)[1];
  const ms = median(wall);
  const cpuMs = median(cpu);
  return [
    {
      name: `spread analysis: front end, ${samples} samples × ${last.rules.length} rules, ${last.parameters.length} spreads`,
      size: `${scenario.blocks.length} blocks, 201 pts`,
      ms,
      cpuMs,
      target: "≤ 5 s",
      pass: ms <= 5000,
      passCpu: cpuMs <= 5000,
      note: `yields ${last.rules.map((r) => `${r.id} ${(100 * r.yield).toFixed(1)}%`).join(", ")}`,
    },
  ];
}
