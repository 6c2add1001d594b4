// Quick local timing of the interconnection on synthetic systems with random S (the official benchmark,
// with the reference scenarios, medians and targets, is tests/bench/index.ts: `npm run bench`).
// It prints the best (minimum) and the median of a few runs: on a loaded machine the minimum is close to
// the time at a quiet moment, the median is what the benchmark's verdicts use; the two differ several-fold
// when the load average is far above the core count.
// Run: npx tsx tests/bench/network-timing.ts

import { internalWaves, solveDense, solveSystem } from "../../engine/network";
import type { PreparedSystem } from "../../engine/types";
import { makeSystem, randomS, randomUnitary, rng, type BlockDef } from "../engine/network-helpers";

// best and median of `reps` runs after one untimed run, wall time and this process's CPU time (the CPU
// figure is steadier on a busy machine)
function time(label: string, fn: () => void, reps = 5): number {
  fn();
  const wall: number[] = [];
  const cpu: number[] = [];
  for (let i = 0; i < reps; i++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    fn();
    wall.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1000);
  }
  wall.sort((x, y) => x - y);
  cpu.sort((x, y) => x - y);
  const mid = Math.floor(reps / 2);
  console.log(`${label}: best ${wall[0].toFixed(2)} ms wall, ${cpu[0].toFixed(2)} ms cpu; median ${wall[mid].toFixed(2)} ms wall, ${cpu[mid].toFixed(2)} ms cpu`);
  return wall[0];
}

function chain(n: number, nf: number): PreparedSystem {
  const r = rng(n);
  const blocks: BlockDef[] = Array.from({ length: n }, (_, i) => ({ id: `B${i}`, s: randomS(r, 2, nf, 0.5) }));
  const links = Array.from({ length: n - 1 }, (_, i) => [`B${i}:2`, `B${i + 1}:1`] as [string, string]);
  return makeSystem({ blocks, links, ports: [{ name: "IN", at: "B0:1" }, { name: "OUT", at: `B${n - 1}:2` }] });
}

function frontEnd(nf: number): PreparedSystem {
  // 24 blocks, 70 ports, 8 system ports: 4 receive/transmit branches with switch, filter, amplifier-like,
  // coupler, circulator, antennas sharing a coupled array
  const r = rng(7);
  const blocks: BlockDef[] = [];
  const links: [string, string][] = [];
  const ports: { name: string; at: string; z0?: number }[] = [];
  blocks.push({ id: "ARR", s: randomUnitary(r, 4, nf) });
  for (let b = 0; b < 4; b++) {
    blocks.push({ id: `CIRC${b}`, s: randomS(r, 3, nf, 0.5) });
    blocks.push({ id: `CPL${b}`, s: randomS(r, 4, nf, 0.5) });
    blocks.push({ id: `SW${b}`, s: randomS(r, 3, nf, 0.5) });
    blocks.push({ id: `FLT${b}`, s: randomS(r, 2, nf, 0.5) });
    blocks.push({ id: `LNA${b}`, s: randomS(r, 2, nf, 0.5) });
    links.push([`ARR:${b + 1}`, `CPL${b}:2`], [`CPL${b}:1`, `CIRC${b}:2`], [`CIRC${b}:3`, `FLT${b}:1`], [`FLT${b}:2`, `LNA${b}:1`], [`CIRC${b}:1`, `SW${b}:1`]);
    ports.push({ name: `RX${b}`, at: `LNA${b}:2` }, { name: `TX${b}`, at: `SW${b}:2`, z0: 75 });
  }
  blocks.push({ id: "HYB", s: randomS(r, 4, nf, 0.5) });
  blocks.push({ id: "SPL1", s: randomS(r, 3, nf, 0.5) });
  blocks.push({ id: "SPL2", s: randomS(r, 3, nf, 0.5) });
  links.push([`CPL0:3`, `HYB:1`], [`CPL1:3`, `HYB:2`], [`HYB:3`, `SPL1:2`], [`HYB:4`, `SPL1:3`], [`CPL2:3`, `SPL2:2`], [`CPL3:3`, `SPL2:3`], [`SPL1:1`, `SW0:3`], [`SPL2:1`, `SW1:3`]);
  return makeSystem({ blocks, links, ports });
}

function arraySystem(nf: number, n = 64): PreparedSystem {
  const r = rng(3);
  const blocks: BlockDef[] = [{ id: "ARR", s: randomS(r, n, nf, 0.05) }];
  const links: [string, string][] = [];
  for (let i = 0; i < n; i++) {
    blocks.push({ id: `PS${i}`, s: randomS(r, 2, nf, 0.5) }, { id: `SW${i}`, s: randomS(r, 3, nf, 0.5) });
    links.push([`ARR:${i + 1}`, `PS${i}:2`], [`PS${i}:1`, `SW${i}:1`]);
  }
  // splitter tree: node j (1-based heap order) has children 2j, 2j+1; leaves are the switches
  for (let j = 1; j < n; j++) blocks.push({ id: `SPL${j}`, s: randomS(r, 3, nf, 0.5) });
  for (let j = 1; j < n; j++) {
    for (const [c, port] of [[2 * j, 2], [2 * j + 1, 3]] as const) {
      if (c < n) links.push([`SPL${j}:${port}`, `SPL${c}:1`]);
      else links.push([`SPL${j}:${port}`, `SW${c - n}:2`]);
    }
  }
  return makeSystem({ blocks, links, ports: [{ name: "COM", at: "SPL1:1" }] });
}

const nf = 1001;
for (const n of [10, 100, 1000]) {
  const sys = chain(n, nf);
  time(`chain ${n} @ ${nf}`, () => solveSystem(sys, { waves: false }));
  time(`chain ${n} @ ${nf} with waves kept`, () => solveSystem(sys));
}
const fe = frontEnd(nf);
console.log(`front end: ${fe.blocks.length} blocks, ${fe.blockPorts.length} ports, ${fe.systemPorts.length} system ports`);
const inc = new Float64Array(2 * nf * fe.systemPorts.length).map((_, i) => (i % 2 === 0 ? 1 : 0));
time("front end composite", () => solveSystem(fe));
time("front end composite, no wave maps", () => solveSystem(fe, { waves: false }));
const feSol = solveSystem(fe);
time("front end internal waves x1", () => internalWaves(feSol, inc));
time("front end composite + internal waves x8", () => {
  const sol = solveSystem(fe);
  for (let m = 0; m < 8; m++) internalWaves(sol, inc);
});
time("front end dense", () => solveDense(fe), 2);
const arr = arraySystem(201);
console.log(`array: ${arr.blocks.length} blocks, ${arr.blockPorts.length} ports`);
time("array 64 @ 201", () => solveSystem(arr), 2);
