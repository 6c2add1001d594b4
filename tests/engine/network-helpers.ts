// Test helpers for the interconnection: PreparedSystem objects built directly from small S matrices,
// seeded random S (general, passive, reciprocal, lossless) and comparisons.

import { runPythonJson } from "./reference/python";
import type { EvaluatedBlock, PreparedSystem, SData } from "../../engine/types";

export type BlockDef = { id: string; s: SData };
export type SystemDef = {
  z0?: number;
  frequencies?: number[];
  blocks: BlockDef[];
  links: [string, string][];
  ports: { name: string; at: string; z0?: number }[];
};

/** Mulberry32: a small seeded generator so that failures replay. */
export function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A PreparedSystem as the preparer would make it (ports "ID:n", 1-based). */
export function makeSystem(def: SystemDef): PreparedSystem {
  const z0 = def.z0 ?? 50;
  const nf = def.blocks[0]?.s.nf ?? def.frequencies?.length ?? 1;
  const frequencies = Float64Array.from(def.frequencies ?? Array.from({ length: nf }, (_, k) => 1e9 + 1e6 * k));
  const blockPorts: PreparedSystem["blockPorts"] = [];
  const blockOffset: number[] = [];
  const index = new Map<string, number>();
  const blocks: EvaluatedBlock[] = def.blocks.map((b) => {
    blockOffset.push(blockPorts.length);
    for (let j = 1; j <= b.s.n; j++) {
      index.set(`${b.id}:${j}`, blockPorts.length);
      blockPorts.push({ index: blockPorts.length, block: b.id, port: j });
    }
    return { id: b.id, kind: "touchstone", s: b.s, traits: { passive: true, reciprocal: true, radiates: false }, warnings: [] };
  });
  const at = (ref: string) => {
    const p = index.get(ref);
    if (p === undefined) throw new Error(`unknown port ${ref}`);
    return p;
  };
  const links = def.links.map(([p, q]) => [at(p), at(q)] as [number, number]);
  const systemPorts = def.ports.map((p) => ({ name: p.name, at: at(p.at), z0: p.z0 ?? z0 }));
  const used = new Set<number>([...links.flat(), ...systemPorts.map((p) => p.at)]);
  const unterminated = blockPorts.map((p) => p.index).filter((p) => !used.has(p));
  return {
    scenario: { format: "portolan.scenario/1", name: "test", z0, frequency: { list: Array.from(frequencies) }, blocks: [], links: [], ports: [] },
    frequencies,
    z0,
    blocks,
    blockPorts,
    blockOffset,
    links,
    systemPorts,
    unterminated,
    warnings: unterminated.length ? [`${unterminated.length} block ports left unlinked are treated as matched terminations`] : [],
  };
}

/** S stack from per-frequency matrices given as [re, im] pairs: m[k][i][j] = [re, im]. */
export function sFrom(m: [number, number][][][]): SData {
  const nf = m.length;
  const n = m[0].length;
  const data = new Float64Array(2 * nf * n * n);
  m.forEach((mat, k) => mat.forEach((row, i) => row.forEach(([re, im], j) => {
    data[2 * ((k * n + i) * n + j)] = re;
    data[2 * ((k * n + i) * n + j) + 1] = im;
  })));
  return { n, nf, data };
}

/** The same n×n matrix at every frequency. */
export function constantS(mat: [number, number][][], nf: number): SData {
  return sFrom(Array.from({ length: nf }, () => mat));
}

/** Random complex S with entries in the unit disc (not necessarily passive). */
export function randomS(r: () => number, n: number, nf: number, scale = 1): SData {
  const data = new Float64Array(2 * nf * n * n);
  for (let i = 0; i < data.length; i++) data[i] = scale * (2 * r() - 1);
  return { n, nf, data };
}

/** Symmetrise each frequency: S ← (S + Sᵀ)/2. */
export function symmetrise(s: SData): SData {
  const { n, nf } = s;
  const d = s.data.slice();
  for (let k = 0; k < nf; k++)
    for (let i = 0; i < n; i++)
      for (let j = i + 1; j < n; j++)
        for (let c = 0; c < 2; c++) {
          const x = 2 * ((k * n + i) * n + j) + c;
          const y = 2 * ((k * n + j) * n + i) + c;
          const v = (d[x] + d[y]) / 2;
          d[x] = v;
          d[y] = v;
        }
  return { n, nf, data: d };
}

/** Random unitary n×n at each frequency: Gram–Schmidt on random complex columns (applied twice for accuracy). */
export function randomUnitary(r: () => number, n: number, nf: number, symmetric = false): SData {
  const data = new Float64Array(2 * nf * n * n);
  for (let k = 0; k < nf; k++) {
    const q: number[][] = []; // columns, interleaved
    for (let j = 0; j < n; j++) {
      const v = Array.from({ length: 2 * n }, () => 2 * r() - 1);
      for (let pass = 0; pass < 2; pass++) {
        for (const u of q) {
          let dr = 0;
          let di = 0;
          for (let i = 0; i < n; i++) {
            dr += u[2 * i] * v[2 * i] + u[2 * i + 1] * v[2 * i + 1];
            di += u[2 * i] * v[2 * i + 1] - u[2 * i + 1] * v[2 * i];
          }
          for (let i = 0; i < n; i++) {
            v[2 * i] -= dr * u[2 * i] - di * u[2 * i + 1];
            v[2 * i + 1] -= dr * u[2 * i + 1] + di * u[2 * i];
          }
        }
      }
      const norm = Math.sqrt(v.reduce((s, x) => s + x * x, 0));
      q.push(v.map((x) => x / norm));
    }
    for (let i = 0; i < n; i++)
      for (let j = 0; j < n; j++) {
        data[2 * ((k * n + i) * n + j)] = q[j][2 * i];
        data[2 * ((k * n + i) * n + j) + 1] = q[j][2 * i + 1];
      }
  }
  const u = { n, nf, data };
  if (!symmetric) return u;
  // Uᵀ·U is unitary and symmetric (a reciprocal lossless network)
  const out = new Float64Array(2 * nf * n * n);
  for (let k = 0; k < nf; k++)
    for (let i = 0; i < n; i++)
      for (let j = 0; j < n; j++) {
        let sr = 0;
        let si = 0;
        for (let p = 0; p < n; p++) {
          const ar = data[2 * ((k * n + p) * n + i)];
          const ai = data[2 * ((k * n + p) * n + i) + 1];
          const br = data[2 * ((k * n + p) * n + j)];
          const bi = data[2 * ((k * n + p) * n + j) + 1];
          sr += ar * br - ai * bi;
          si += ar * bi + ai * br;
        }
        out[2 * ((k * n + i) * n + j)] = sr;
        out[2 * ((k * n + i) * n + j) + 1] = si;
      }
  return { n, nf, data: out };
}

/** Largest |x − y| over two arrays (NaN counts as infinitely far). */
export function maxDiff(x: Float64Array, y: Float64Array): number {
  if (x.length !== y.length) return Infinity;
  let worst = 0;
  for (let i = 0; i < x.length; i++) {
    const d = Math.abs(x[i] - y[i]);
    if (!(d <= worst)) worst = Number.isNaN(d) ? Infinity : d;
  }
  return worst;
}

/**
 * Run a Python script with Debian's /usr/bin/python3 (numpy, scikit-rf 0.15.4) through the shared
 * reference harness (tests/engine/reference/python.ts). The script reads JSON from stdin as `data` and
 * must print JSON. Complex arrays travel as interleaved re/im lists; in Python `cx(list)` turns one into
 * a complex numpy vector.
 */
export function runPython<T>(script: string, input: unknown): T {
  const helpers = [
    "import sys, json",
    "data = json.load(sys.stdin)",
    "def cx(v): return np.array(v, dtype=float).view(complex)",
    "def flat(a): return np.ascontiguousarray(np.asarray(a, dtype=complex)).view(float).ravel().tolist()",
    "",
  ].join("\n");
  return runPythonJson<T>(helpers + script, input);
}

export type BlockFlavour = "general" | "passive" | "reciprocal" | "lossless" | "lossless-reciprocal";

/** Random S of the given flavour (passive ones scaled so that σ_max ≤ 0.99 at every frequency). */
export function randomBlockS(r: () => number, n: number, nf: number, flavour: BlockFlavour): SData {
  if (flavour === "lossless") return randomUnitary(r, n, nf);
  if (flavour === "lossless-reciprocal") return randomUnitary(r, n, nf, true);
  const s = randomS(r, n, nf, flavour === "general" ? 0.45 : 1);
  if (flavour === "general") return s;
  const t = flavour === "reciprocal" ? symmetrise(s) : s;
  for (let k = 0; k < nf; k++) {
    const block = t.data.subarray(2 * k * n * n, 2 * (k + 1) * n * n);
    const smax = largestSingular(block, n);
    const target = 0.2 + 0.79 * r();
    for (let i = 0; i < block.length; i++) block[i] *= target / smax;
  }
  return t;
}

/** σ_max by power iteration on MᴴM (test-side, independent of engine/linalg). */
function largestSingular(m: Float64Array, n: number): number {
  let v = Array.from({ length: 2 * n }, (_, i) => (i % 2 === 0 ? 1 + i / n : 0.3));
  let lambda = 0;
  for (let it = 0; it < 500; it++) {
    const w = new Array(2 * n).fill(0);
    for (let i = 0; i < n; i++)
      for (let j = 0; j < n; j++) {
        const ar = m[2 * (i * n + j)];
        const ai = m[2 * (i * n + j) + 1];
        w[2 * i] += ar * v[2 * j] - ai * v[2 * j + 1];
        w[2 * i + 1] += ar * v[2 * j + 1] + ai * v[2 * j];
      }
    const u = new Array(2 * n).fill(0);
    for (let i = 0; i < n; i++)
      for (let j = 0; j < n; j++) {
        const ar = m[2 * (j * n + i)];
        const ai = -m[2 * (j * n + i) + 1];
        u[2 * i] += ar * w[2 * j] - ai * w[2 * j + 1];
        u[2 * i + 1] += ar * w[2 * j + 1] + ai * w[2 * j];
      }
    const norm = Math.sqrt(u.reduce((s, x) => s + x * x, 0));
    const next = Math.sqrt(norm / Math.sqrt(v.reduce((s, x) => s + x * x, 0)));
    v = u.map((x) => x / norm);
    if (Math.abs(next - lambda) < 1e-15 * next) return next;
    lambda = next;
  }
  return lambda;
}

export type TopologyOptions = {
  blocks: number;
  maxPorts: number;
  /** extra links beyond a spanning tree (each may close a loop, or link two ports of one block) */
  extraLinks: number;
  flavour: BlockFlavour;
  /** leave some ports unlinked (matched) instead of making every free port a system port */
  unterminated: boolean;
  nf: number;
  /** own Z0 of each system port drawn from this list (default: all 50 Ω) */
  portZ0?: number[];
};

/** A random connected topology (spanning tree plus extra links, so loops and self links occur). */
export function randomTopology(r: () => number, o: TopologyOptions): SystemDef {
  const pick = <T>(xs: T[]): T => xs[Math.floor(r() * xs.length)];
  const blocks: BlockDef[] = [];
  const free: string[][] = [];
  for (let i = 0; i < o.blocks; i++) {
    const n = 1 + Math.floor(r() * o.maxPorts);
    const nPorts = i === 0 ? Math.max(n, 2) : n;
    blocks.push({ id: `B${i}`, s: randomBlockS(r, nPorts, o.nf, o.flavour) });
    free.push(Array.from({ length: nPorts }, (_, j) => `B${i}:${j + 1}`));
  }
  const links: [string, string][] = [];
  const take = (i: number): string => free[i].splice(Math.floor(r() * free[i].length), 1)[0];
  for (let i = 1; i < o.blocks; i++) {
    const candidates = Array.from({ length: i }, (_, j) => j).filter((j) => free[j].length > 0);
    if (candidates.length === 0 || free[i].length === 0) continue;
    const j = pick(candidates);
    links.push([take(j), take(i)]);
  }
  for (let e = 0; e < o.extraLinks; e++) {
    const withFree = free.map((f, i) => (f.length > 0 ? i : -1)).filter((i) => i >= 0);
    if (withFree.length === 0) break;
    const i = pick(withFree);
    const p = take(i);
    const rest = free.map((f, j) => (f.length > 0 ? j : -1)).filter((j) => j >= 0);
    if (rest.length === 0) {
      free[i].push(p);
      break;
    }
    links.push([p, take(pick(rest))]);
  }
  const remaining = free.flat();
  const ports: SystemDef["ports"] = [];
  remaining.forEach((p, i) => {
    if (i === 0 || !o.unterminated || r() < 0.5) ports.push({ name: `P${ports.length + 1}`, at: p, z0: o.portZ0 ? pick(o.portZ0) : undefined });
  });
  if (ports.length === 0) {
    // every port got linked: free one link end up as a system port by unlinking the last link
    const [p, q] = links.pop() as [string, string];
    ports.push({ name: "P1", at: p }, { name: "P2", at: q });
  }
  return { blocks, links, ports };
}
