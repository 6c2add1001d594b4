/**
 * Benchmark row of the noise solve: the noise figure of the reference front end (1001 points) from one
 * system port to another against its composite solve. Registered through tests/bench/rows/noise.ts.
 */
import { solveSystem } from "../../engine/network";
import { noiseFigure, systemNoise } from "../../engine/noise";
import { prepareSystem } from "../../engine/system";
import { referenceFrontEnd } from "./scenarios";
import { performance } from "node:perf_hooks";
import type { BenchRow } from "./timing";

/**
 * The noise rows of `npm run bench`.
 * @returns one row with its target (NF ≤ 2 × the composite solve)
 * @example const rows = await benchRows();
 */
export async function benchRows(): Promise<BenchRow[]> {
  const scenario = referenceFrontEnd(1001);
  // the bench front end's amplifiers get noise figures so that every noise model takes part
  for (const b of scenario.blocks) if (b.kind === "amplifier") b.params = { ...b.params, noise_figure_db: 3 };
  const fe = prepareSystem(scenario);
  const from = fe.systemPorts.findIndex((p) => p.name === "CAL");
  const to = fe.systemPorts.findIndex((p) => p.name === "RX1");
  let worst = 0;
  const nf = () => {
    const f = noiseFigure(systemNoise(fe, { outputs: [to] }), from, to);
    worst = Math.max(...f);
  };
  // the two are timed in alternation (one run of each, 15 times) so that both see the same load of the
  // shared machine; the medians are compared
  const solveT = { runs: [] as number[], cpu: [] as number[] };
  const nfT = { runs: [] as number[], cpu: [] as number[] };
  for (let r = 0; r < 3; r++) {
    solveSystem(fe);
    nf();
  }
  for (let r = 0; r < 15; r++) {
    for (const [fn, into] of [
      [() => solveSystem(fe), solveT],
      [nf, nfT],
    ] as const) {
      const c0 = process.cpuUsage();
      const t0 = performance.now();
      fn();
      into.runs.push(performance.now() - t0);
      const c1 = process.cpuUsage(c0);
      into.cpu.push((c1.user + c1.system) / 1000);
    }
  }
  const median = (xs: number[]) => xs.slice().sort((a, b) => a - b)[xs.length >> 1];
  const solveMs = median(solveT.runs);
  const solveCpu = median(solveT.cpu);
  const nfMs = median(nfT.runs);
  const nfCpu = median(nfT.cpu);
  return [
    {
      name: "noise figure CAL→RX1: front end (transposed solve + internal waves + T·C·Tᴴ), against its composite solve",
      size: `${fe.blocks.length} blocks, ${fe.blockPorts.length} ports, ${fe.systemPorts.length} sys, ${fe.frequencies.length} pts`,
      ms: nfMs,
      cpuMs: nfCpu,
      target: `≤ 2 × composite (${solveMs.toFixed(1)} ms wall, ${solveCpu.toFixed(1)} ms cpu)`,
      pass: nfMs <= 2 * solveMs,
      passCpu: nfCpu <= 2 * solveCpu,
      note: `ratio ${(nfMs / solveMs).toFixed(2)} wall, ${(nfCpu / solveCpu).toFixed(2)} cpu; worst NF ${(10 * Math.log10(worst)).toFixed(2)} dB`,
    },
  ];
}
