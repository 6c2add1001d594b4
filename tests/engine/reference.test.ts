/**
 * The interconnection against an independent reference: scikit-rf 0.15.4 (Debian python3-scikit-rf)
 * skrf.network.connect_s / innerconnect_s, run by tests/engine/reference/connect_reference.py.
 * Random chains, trees and loops of random passive and active blocks (inline Touchstone 1.1 and 2.0 with
 * their own reference impedances, and some built-in blocks), with system ports at one Z0 or at mixed Z0.
 */
import { fileURLToPath } from "node:url";
import { beforeAll, describe, expect, it } from "vitest";
import { solveSystem } from "../../engine/network";
import { prepareSystem } from "../../engine/system";
import type { PreparedSystem, Solution } from "../../engine/types";
import { requireReferencePython, runPythonJson } from "./reference/python";
import { makeRandom, randomCase, type RandomCase, type Topology } from "./reference/random-systems";

const SCRIPT = fileURLToPath(new URL("./reference/connect_reference.py", import.meta.url));

type Solved = { c: RandomCase; sys: PreparedSystem; sol: Solution; ref?: number[][][][] };

function referenceInput(c: RandomCase, sys: PreparedSystem, seed: number) {
  const blocks = sys.blocks.map((b) => {
    const part = c.parts.get(b.id);
    if (part) return { z0: part.z0, s: part.s };
    // built-in blocks: their evaluated S (system Z0 at every port) goes to the reference unchanged,
    // so that this test checks the interconnection and the handling of parts, not the models
    const { n, nf, data } = b.s;
    const s: number[][][][] = [];
    for (let k = 0; k < nf; k++) {
      s.push(
        Array.from({ length: n }, (_, r) =>
          Array.from({ length: n }, (_, col) => [data[2 * ((k * n + r) * n + col)], data[2 * ((k * n + r) * n + col) + 1]]),
        ),
      );
    }
    return { z0: Array(n).fill(sys.z0), s };
  });
  // the reference makes the links in a shuffled order, so that connect_s and innerconnect_s both occur
  const rand = makeRandom(seed ^ 0x5bd1e995);
  const links = sys.links.map((l) => [l[0], l[1]]);
  for (let i = links.length - 1; i > 0; i--) {
    const j = Math.floor(rand() * (i + 1));
    [links[i], links[j]] = [links[j], links[i]];
  }
  return { system_z0: sys.z0, blocks, links, ports: sys.systemPorts.map((p) => ({ at: p.at, z0: p.z0 })) };
}

function maxDeviation(sol: Solution, ref: number[][][][]): { dev: number; scale: number } {
  const { n, nf, data } = sol.s;
  let dev = 0;
  let scale = 1;
  for (let k = 0; k < nf; k++) {
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        const at = 2 * ((k * n + i) * n + j);
        const [re, im] = ref[k][i][j];
        dev = Math.max(dev, Math.hypot(data[at] - re, data[at + 1] - im));
        scale = Math.max(scale, Math.hypot(re, im));
      }
    }
  }
  return { dev, scale };
}

const plan: { topology: Topology; mixedZ0: boolean; builtIns: boolean; seeds: number[] }[] = [
  { topology: "chain", mixedZ0: false, builtIns: false, seeds: [11, 12, 13, 14] },
  { topology: "chain", mixedZ0: true, builtIns: false, seeds: [21, 22, 23, 24] },
  { topology: "tree", mixedZ0: false, builtIns: false, seeds: [31, 32, 33, 34] },
  { topology: "tree", mixedZ0: true, builtIns: true, seeds: [41, 42, 43, 44] },
  { topology: "loop", mixedZ0: false, builtIns: false, seeds: [51, 52, 53, 54] },
  { topology: "loop", mixedZ0: true, builtIns: true, seeds: [61, 62, 63, 64, 65, 66] },
];

const solved = new Map<number, Solved>();

beforeAll(() => {
  requireReferencePython();
  const inputs: unknown[] = [];
  const order: number[] = [];
  for (const group of plan) {
    for (const seed of group.seeds) {
      const c = randomCase(seed, group.topology, group);
      const sys = prepareSystem(c.scenario);
      const sol = solveSystem(sys);
      solved.set(seed, { c, sys, sol });
      inputs.push(referenceInput(c, sys, seed));
      order.push(seed);
    }
  }
  const out = runPythonJson<{ results: number[][][][][]; skrf: string }>({ file: SCRIPT }, { cases: inputs }, { skrf: true });
  expect(out.skrf).toBe("0.15.4");
  order.forEach((seed, i) => {
    solved.get(seed)!.ref = out.results[i];
  });
});

describe("interconnection against scikit-rf 0.15.4 connect_s / innerconnect_s", () => {
  for (const group of plan) {
    const what = `${group.topology}s${group.mixedZ0 ? " with system ports at mixed Z0" : ""}${group.builtIns ? " and built-in blocks" : ""}`;
    it(`solveSystem() of random ${what} agrees to 1e-9`, () => {
      for (const seed of group.seeds) {
        const { c, sol, ref } = solved.get(seed)!;
        expect(ref, c.label).toBeDefined();
        expect(sol.s.n, c.label).toBe(c.scenario.ports.length);
        const { dev, scale } = maxDeviation(sol, ref!);
        // relative to the largest entry (active blocks can give |S| > 1)
        expect(dev / scale, `${c.label}: max |ΔS| = ${dev}`).toBeLessThan(1e-9);
      }
    });
  }

  it("the random systems include loops, unlinked ports, active parts and several reference impedances", () => {
    let unlinked = 0;
    let loops = 0;
    let active = 0;
    const referenceSets = new Set<string>();
    for (const { c, sys } of solved.values()) {
      unlinked += sys.unterminated.length;
      // a connected graph with at least as many links as blocks has a cycle
      if (sys.links.length >= sys.blocks.length) loops++;
      for (const part of c.parts.values()) {
        referenceSets.add(part.z0.join(","));
        if (part.s.some((m) => m.some((row) => row.some(([re, im]) => Math.hypot(re, im) > 1)))) active++;
      }
    }
    expect(unlinked).toBeGreaterThan(0);
    expect(loops).toBeGreaterThan(3);
    expect(active).toBeGreaterThan(3);
    expect(referenceSets.size).toBeGreaterThan(5);
  });
});
