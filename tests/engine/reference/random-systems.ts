/**
 * Random systems for the reference tests: blocks with random passive or active S-matrices carried as
 * inline Touchstone text (1.1 with one reference, or 2.0 with per-port references), plus some built-in
 * blocks, wired as chains, trees and trees with extra links (loops).
 */
import type { BlockSpec, Scenario, SystemPortSpec } from "../../../engine/types";

/** Small seeded generator (mulberry32, common practice) so that a failing case can be replayed. */
export function makeRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A block of the random system, with the exact S that the Touchstone text carries. */
export type RandomPart = { n: number; z0: number[]; s: number[][][][] /* [f][i][j][re, im] */ };

type Rand = () => number;

function randomMatrix(rand: Rand, n: number, norm: number): number[][][] {
  const m: number[][][] = [];
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const row: number[][] = [];
    for (let j = 0; j < n; j++) {
      const v = [rand() * 2 - 1, rand() * 2 - 1];
      sum += v[0] * v[0] + v[1] * v[1];
      row.push(v);
    }
    m.push(row);
  }
  // ‖S‖₂ ≤ ‖S‖_F (Golub and Van Loan, Matrix Computations, 4th ed., 2.3.7), so this bounds the power gain
  const scale = norm / Math.sqrt(sum);
  return m.map((row) => row.map(([re, im]) => [re * scale, im * scale]));
}

/**
 * Random S over nf frequencies: passive (‖S‖_F ≤ 0.95), or active (a passive part of norm 0.3 plus a
 * gain of 1.5…4 from one port to another, like an amplifier).
 */
export function randomPart(rand: Rand, n: number, nf: number, active: boolean, z0: number[]): RandomPart {
  const s: number[][][][] = [];
  const from = Math.floor(rand() * n);
  const to = n > 1 ? (from + 1 + Math.floor(rand() * (n - 1))) % n : from;
  for (let k = 0; k < nf; k++) {
    const m = randomMatrix(rand, n, active ? 0.3 : 0.3 + 0.65 * rand());
    if (active && n > 1) {
      const g = 1.5 + 2.5 * rand();
      const ph = 2 * Math.PI * rand();
      m[to][from] = [g * Math.cos(ph), g * Math.sin(ph)];
    }
    s.push(m);
  }
  return { n, z0, s };
}

/** Touchstone text for a part: version 1.1 when every port has the same reference, else 2.0 with [Reference]. */
export function partTouchstone(part: RandomPart, freqs: number[]): string {
  const uniform = part.z0.every((z) => z === part.z0[0]);
  const lines: string[] = ["! random part for the scikit-rf reference test"];
  const v2 = !uniform || part.n === 2;
  if (v2) {
    // Touchstone 2.0 (IBIS Open Forum, 2009): keywords, [Reference] per port, two-port order stated
    lines.push("[Version] 2.0", `# Hz S RI R ${part.z0[0]}`, `[Number of Ports] ${part.n}`);
    if (part.n === 2) lines.push("[Two-Port Data Order] 12_21");
    lines.push(`[Number of Frequencies] ${freqs.length}`, `[Reference] ${part.z0.join(" ")}`, "[Network Data]");
  } else {
    lines.push(`# Hz S RI R ${part.z0[0]}`);
  }
  // String(x) is the shortest text that reads back to the same double (ECMAScript Number::toString)
  const pair = (v: number[]): string => `${String(v[0])} ${String(v[1])}`;
  freqs.forEach((f, k) => {
    const m = part.s[k];
    if (part.n === 1) {
      lines.push(`${f} ${pair(m[0][0])}`);
      return;
    }
    if (part.n === 2 && !v2) {
      // version 1.1 two-port order is S11 S21 S12 S22
      lines.push(`${f} ${pair(m[0][0])} ${pair(m[1][0])} ${pair(m[0][1])} ${pair(m[1][1])}`);
      return;
    }
    for (let i = 0; i < part.n; i++) {
      // each matrix row starts a new line, at most four pairs per line (Touchstone 1.1 layout, valid in 2.0)
      for (let j0 = 0; j0 < part.n; j0 += 4) {
        const chunk = m[i].slice(j0, j0 + 4).map(pair).join(" ");
        lines.push(i === 0 && j0 === 0 ? `${f} ${chunk}` : chunk);
      }
    }
  });
  if (v2) lines.push("[End]");
  return `${lines.join("\n")}\n`;
}

/** A built-in block with random legal parameters. */
function randomBuiltIn(rand: Rand, id: string): BlockSpec {
  const pick = Math.floor(rand() * 7);
  const db = (lo: number, hi: number) => lo + (hi - lo) * rand();
  switch (pick) {
    case 0:
      return { id, kind: "attenuator", params: { loss_db: db(0.5, 10) } };
    case 1:
      return { id, kind: "coupler", params: { coupling_db: db(6, 20), directivity_db: db(15, 30), excess_loss_db: db(0, 0.5) } };
    case 2:
      return { id, kind: "circulator", params: { insertion_loss_db: db(0.1, 0.6), isolation_db: db(15, 30), return_loss_db: db(15, 30) } };
    case 3:
      return { id, kind: "splitter", params: { excess_loss_db: db(0, 0.5), isolation_db: db(15, 30) } };
    case 4:
      return { id, kind: "switch", params: { throws: 2 + Math.floor(rand() * 3), insertion_loss_db: db(0.2, 1), isolation_db: db(20, 40) }, state: 1 };
    case 5:
      return { id, kind: "isolator", params: { insertion_loss_db: db(0.2, 1), isolation_db: db(15, 25), return_loss_db: db(15, 25) } };
    default:
      return { id, kind: "hybrid90", params: { excess_loss_db: db(0, 0.4), isolation_db: db(20, 30) } };
  }
}

const BUILT_IN_PORTS: Record<string, (b: BlockSpec) => number> = {
  attenuator: () => 2,
  coupler: () => 4,
  circulator: () => 3,
  splitter: () => 3,
  switch: (b) => 1 + Number(b.params?.throws),
  isolator: () => 2,
  hybrid90: () => 4,
};

export type Topology = "chain" | "tree" | "loop";

/** A random case: the scenario and, for every touchstone block, the exact data it carries. */
export type RandomCase = { scenario: Scenario; parts: Map<string, RandomPart>; label: string };

/**
 * A random scenario.
 *
 * @param seed - replays the case
 * @param topology - chain of two-ports; tree (each new block hangs off a free port); loop (a tree plus
 *   one to three links between free ports, possibly two ports of one block)
 * @param opts - mixedZ0: system ports get their own Z0; builtIns: some blocks are built-in kinds
 */
export function randomCase(seed: number, topology: Topology, opts: { mixedZ0: boolean; builtIns: boolean }): RandomCase {
  const rand = makeRandom(seed);
  const nf = 2 + Math.floor(rand() * 4);
  const freqs = Array.from({ length: nf }, (_, k) => 1e9 + k * 2.5e8);
  const refs = [25, 50, 75, 100];
  const blocks: BlockSpec[] = [];
  const parts = new Map<string, RandomPart>();
  const portsOf: number[] = [];
  const count = topology === "chain" ? 2 + Math.floor(rand() * 11) : 3 + Math.floor(rand() * 8);

  const addBlock = (wantPorts: number): void => {
    const id = `X${blocks.length + 1}`;
    if (opts.builtIns && topology !== "chain" && rand() < 0.4) {
      const b = randomBuiltIn(rand, id);
      blocks.push(b);
      portsOf.push(BUILT_IN_PORTS[b.kind](b));
      return;
    }
    const n = wantPorts;
    const z0 =
      rand() < 0.5 ? Array(n).fill(refs[Math.floor(rand() * refs.length)]) : Array.from({ length: n }, () => 20 + Math.round(rand() * 100));
    const part = randomPart(rand, n, nf, rand() < 0.25, z0);
    parts.set(id, part);
    blocks.push({ id, kind: "touchstone", ports: n, data: partTouchstone(part, freqs) });
    portsOf.push(n);
  };

  const links: [string, string][] = [];
  const free: string[] = [];
  if (topology === "chain") {
    for (let b = 0; b < count; b++) addBlock(2);
    for (let b = 1; b < count; b++) links.push([`X${b}:2`, `X${b + 1}:1`]);
    free.push("X1:1", `X${count}:2`);
  } else {
    addBlock(1 + Math.floor(rand() * 4));
    for (let p = 1; p <= portsOf[0]; p++) free.push(`X1:${p}`);
    for (let b = 1; b < count; b++) {
      // a one-port block on the last free port would leave nothing for a system port
      addBlock(free.length <= 1 ? 2 + Math.floor(rand() * 3) : 1 + Math.floor(rand() * 4));
      const id = `X${b + 1}`;
      const n = portsOf[b];
      const at = free.splice(Math.floor(rand() * free.length), 1)[0];
      const mine = 1 + Math.floor(rand() * n);
      links.push([at, `${id}:${mine}`]);
      for (let p = 1; p <= n; p++) if (p !== mine) free.push(`${id}:${p}`);
    }
    if (topology === "loop") {
      const extra = 1 + Math.floor(rand() * 3);
      for (let e = 0; e < extra && free.length >= 4; e++) {
        const a = free.splice(Math.floor(rand() * free.length), 1)[0];
        const b = free.splice(Math.floor(rand() * free.length), 1)[0];
        links.push([a, b]);
      }
    }
  }
  // shuffle the free ports; the first few become system ports, the rest stay unlinked (matched)
  for (let i = free.length - 1; i > 0; i--) {
    const j = Math.floor(rand() * (i + 1));
    [free[i], free[j]] = [free[j], free[i]];
  }
  const nSys = topology === "chain" ? 2 : Math.max(1, Math.min(free.length, 1 + Math.floor(rand() * 4)));
  const ports: SystemPortSpec[] = free.slice(0, nSys).map((at, i) => {
    const sp: SystemPortSpec = { name: `P${i + 1}`, at };
    if (opts.mixedZ0) sp.z0 = [25, 50, 75, 100, 150][Math.floor(rand() * 5)];
    return sp;
  });
  const scenario: Scenario = {
    format: "portolan.scenario/1",
    name: `random ${topology} #${seed}`,
    z0: 50,
    frequency: { list: freqs },
    blocks,
    links,
    ports,
  };
  return { scenario, parts, label: `${topology} seed ${seed}${opts.mixedZ0 ? " mixed Z0" : ""}${opts.builtIns ? " with built-ins" : ""}` };
}
