// Builders of small PreparedSystems from explicit S-matrices, for the checks' tests.
import type { BlockKind, BlockTraits, PreparedSystem, Scenario } from "@/engine/types";

/** complex number as [re, im] */
export type C = [number, number];
export const c = (re: number, im = 0): C => [re, im];
export const polar = (mag: number, deg: number): C => [mag * Math.cos((deg * Math.PI) / 180), mag * Math.sin((deg * Math.PI) / 180)];
export const fromDb = (db: number): number => Math.pow(10, db / 20);

export type TestBlock = {
  id: string;
  kind?: BlockKind;
  /** S as a function of the plan index and frequency: rows × columns of complex numbers */
  s: (k: number, f: number) => C[][];
  traits?: Partial<BlockTraits>;
  rating_dbm?: number;
};

/**
 * A PreparedSystem from explicit block matrices; links and ports as "ID:port" (1-based).
 * Block ports neither linked nor exposed are matched terminations, as prepareSystem does.
 */
export function buildSystem(opts: {
  frequencies: number[];
  z0?: number;
  blocks: TestBlock[];
  links: [string, string][];
  ports: { name: string; at: string; z0?: number }[];
  rules?: Scenario["rules"];
}): PreparedSystem {
  const z0 = opts.z0 ?? 50;
  const freqs = Float64Array.from(opts.frequencies);
  const nf = freqs.length;
  const blockPorts: PreparedSystem["blockPorts"] = [];
  const blockOffset: number[] = [];
  const blocks = opts.blocks.map((b) => {
    const n = b.s(0, freqs[0]).length;
    const data = new Float64Array(2 * nf * n * n);
    for (let k = 0; k < nf; k++) {
      const m = b.s(k, freqs[k]);
      for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) {
        data[2 * ((k * n + i) * n + j)] = m[i][j][0];
        data[2 * ((k * n + i) * n + j) + 1] = m[i][j][1];
      }
    }
    blockOffset.push(blockPorts.length);
    for (let p = 1; p <= n; p++) blockPorts.push({ index: blockPorts.length, block: b.id, port: p });
    return {
      id: b.id,
      kind: b.kind ?? ("touchstone" as BlockKind),
      s: { n, nf, data },
      traits: { passive: true, reciprocal: true, radiates: false, ...b.traits },
      rating_dbm: b.rating_dbm,
      warnings: [],
    };
  });
  const at = (ref: string) => {
    const [id, p] = ref.split(":");
    const bi = opts.blocks.findIndex((b) => b.id === id);
    if (bi < 0) throw new Error(`no block ${id}`);
    return blockOffset[bi] + Number(p) - 1;
  };
  const links = opts.links.map(([a, b]) => [at(a), at(b)] as [number, number]);
  const systemPorts = opts.ports.map((p) => ({ name: p.name, at: at(p.at), z0: p.z0 ?? z0 }));
  const used = new Set<number>([...links.flat(), ...systemPorts.map((p) => p.at)]);
  const unterminated = blockPorts.map((p) => p.index).filter((p) => !used.has(p));
  const scenario: Scenario = {
    format: "portolan.scenario/1",
    name: "test",
    z0,
    frequency: { list: opts.frequencies },
    blocks: opts.blocks.map((b) => ({ id: b.id, kind: b.kind ?? "touchstone" })),
    links: opts.links,
    ports: opts.ports,
    rules: opts.rules,
  };
  return { scenario, frequencies: freqs, z0, blocks, blockPorts, blockOffset, links, systemPorts, unterminated, warnings: [] };
}

/** A constant 2-port [[s11, s12], [s21, s22]]. */
export const twoPort = (s11: C, s12: C, s21: C, s22: C) => () => [[s11, s12], [s21, s22]];
/** A constant one-port with reflection g. */
export const onePort = (g: C) => () => [[g]];
