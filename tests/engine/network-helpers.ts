// Test helpers for the interconnection: PreparedSystem objects built directly from small S matrices,
// seeded random S (general, passive, reciprocal, lossless) and comparisons.

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
