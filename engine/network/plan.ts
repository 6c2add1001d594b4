// Order of sub-network growth (Gupta, Garg and Chadha, Computer-Aided Design of Microwave Circuits, 1981,
// sub-network growth method, "from memory"): a greedy choice of the next pair of sub-networks to join,
// always the one whose union keeps the fewest open ports — the minimum-degree heuristic of sparse
// elimination applied to the graph of sub-networks.

import { EngineInputError, type PreparedSystem } from "../types";
import { linkName, portName } from "./names";
import { z0Step } from "./z0-step";

/** A starting sub-network: one block (or the Z0 step of a system port) with its matched ports removed. */
export type Leaf = {
  /** index into sys.blocks, or −1 − m for the Z0 step in front of system port m */
  block: number;
  /** local port indices (0-based) of the block that stay in the sub-network */
  keep: Int32Array;
  /** global port ids of those ports */
  ports: Int32Array;
};

/** Join two sub-networks through every link between them (m ≥ 1 port pairs). */
export type JoinStep = {
  kind: "join";
  a: number;
  b: number;
  c: number;
  /** positions in A of ports kept (α) and linked (κ); in B, kept (β) and linked (λ); κ[i] links λ[i] */
  aKeep: Int32Array;
  aLink: Int32Array;
  bKeep: Int32Array;
  bLink: Int32Array;
  /** global ids of the ports of the result: α then β */
  ports: Int32Array;
  /** global ids of the ports closed here, κ then λ (rows of the stored wave map) */
  inner: Int32Array;
  links: string[];
};

/** Close links between ports of one sub-network (the block links some of its own ports together). */
export type CloseStep = {
  kind: "close";
  a: number;
  c: number;
  keep: Int32Array;
  /** positions in A of the linked ports */
  linked: Int32Array;
  /** partner[i] = index within `linked` of the port linked to linked[i] */
  partner: Int32Array;
  ports: Int32Array;
  inner: Int32Array;
  links: string[];
};

export type Step = JoinStep | CloseStep;

export type Plan = {
  /** number of block ports */
  P: number;
  /** block ports plus two ports per Z0 step */
  totalPorts: number;
  leaves: Leaf[];
  steps: Step[];
  /** per system port: global id of its outermost port (the Z0 step's outer port, or the block port) */
  outer: Int32Array;
  /** per system port: the final sub-network holding it and the position within it */
  outCluster: Int32Array;
  outPos: Int32Array;
  /** per system port: Z0 step reflection ρ and transmission t (ρ = 0, t = 1 when no step) */
  rho: Float64Array;
  t: Float64Array;
  /** per global port: linked partner or −1 */
  partner: Int32Array;
};

type Candidate = { size: number; sum: number; a: number; b: number; seq: number };

function better(x: Candidate, y: Candidate): boolean {
  if (x.size !== y.size) return x.size < y.size;
  if (x.sum !== y.sum) return x.sum < y.sum;
  // newest first: keeps growing the sub-network just made (depth-first), so few are alive at once
  return x.seq > y.seq;
}

class Heap {
  private items: Candidate[] = [];
  get length(): number {
    return this.items.length;
  }
  push(c: Candidate): void {
    const h = this.items;
    h.push(c);
    let i = h.length - 1;
    while (i > 0) {
      const p = (i - 1) >> 1;
      if (!better(h[i], h[p])) break;
      [h[i], h[p]] = [h[p], h[i]];
      i = p;
    }
  }
  pop(): Candidate | undefined {
    const h = this.items;
    if (h.length === 0) return undefined;
    const top = h[0];
    const last = h.pop() as Candidate;
    if (h.length > 0) {
      h[0] = last;
      let i = 0;
      for (;;) {
        const l = 2 * i + 1;
        const r = l + 1;
        let m = i;
        if (l < h.length && better(h[l], h[m])) m = l;
        if (r < h.length && better(h[r], h[m])) m = r;
        if (m === i) break;
        [h[i], h[m]] = [h[m], h[i]];
        i = m;
      }
    }
    return top;
  }
}

/**
 * Decide the whole join sequence of a prepared system from its topology alone (block data is not read).
 *
 * @param sys prepared system (links, system ports, block port counts)
 * @returns the plan; reused for every solve of the same system
 * @throws EngineInputError when a port is linked twice or a system port sits on a linked port
 * @example const plan = buildPlan(sys); plan.steps.length // number of joins
 */
export function buildPlan(sys: PreparedSystem): Plan {
  const P = sys.blockPorts.length;
  const E = sys.systemPorts.length;
  const rho = new Float64Array(E);
  const t = new Float64Array(E).fill(1);
  const stepOf = new Int32Array(E).fill(-1);
  let nSteps = 0;
  for (let m = 0; m < E; m++) {
    const z = sys.systemPorts[m].z0;
    if (!(z > 0) || !Number.isFinite(z)) throw new EngineInputError(`ports[${m}].z0`, `reference impedance must be a positive number of ohms, got ${z}`);
    if (z !== sys.z0) {
      const st = z0Step(z, sys.z0);
      rho[m] = st.rho;
      t[m] = st.t;
      stepOf[m] = nSteps++;
    }
  }
  const totalPorts = P + 2 * nSteps;
  const partner = new Int32Array(totalPorts).fill(-1);
  const link = (p: number, q: number, where: string) => {
    if (p < 0 || q < 0 || p >= P || q >= P) throw new EngineInputError(where, `link refers to a block port that does not exist`);
    if (p === q) throw new EngineInputError(where, `a port cannot be linked to itself (${linkName(sys, p, q)})`);
    if (partner[p] >= 0 || partner[q] >= 0) throw new EngineInputError(where, `block port ${portName(sys, partner[p] >= 0 ? p : q)} is linked more than once`);
    partner[p] = q;
    partner[q] = p;
  };
  sys.links.forEach(([p, q], i) => link(p, q, `links[${i}]`));
  const outer = new Int32Array(E);
  const isSystem = new Uint8Array(totalPorts);
  for (let m = 0; m < E; m++) {
    const at = sys.systemPorts[m].at;
    if (at < 0 || at >= P) throw new EngineInputError(`ports[${m}].at`, `system port refers to a block port that does not exist`);
    if (partner[at] >= 0 || isSystem[at]) throw new EngineInputError(`ports[${m}].at`, `system port ${sys.systemPorts[m].name} sits on a block port that is already linked or used`);
    isSystem[at] = 1;
    if (stepOf[m] >= 0) {
      const o = P + 2 * stepOf[m];
      partner[o + 1] = at;
      partner[at] = o + 1;
      outer[m] = o;
    } else {
      outer[m] = at;
    }
  }

  // leaves: blocks without their matched (unlinked, non-system) ports, then the Z0 steps
  const leaves: Leaf[] = [];
  const owner = new Int32Array(totalPorts).fill(-1);
  const clusterPorts: Int32Array[] = [];
  sys.blocks.forEach((blk, i) => {
    const off = sys.blockOffset[i];
    const keep: number[] = [];
    for (let j = 0; j < blk.s.n; j++) {
      const p = off + j;
      if (partner[p] >= 0 || isSystem[p]) keep.push(j);
    }
    const ports = Int32Array.from(keep, (j) => off + j);
    leaves.push({ block: i, keep: Int32Array.from(keep), ports });
  });
  for (let m = 0; m < E; m++) {
    if (stepOf[m] < 0) continue;
    const o = P + 2 * stepOf[m];
    leaves.push({ block: -1 - m, keep: Int32Array.of(0, 1), ports: Int32Array.of(o, o + 1) });
  }
  leaves.forEach((leaf, id) => {
    clusterPorts.push(leaf.ports);
    for (const p of leaf.ports) owner[p] = id;
  });

  const steps: Step[] = [];
  const alive: boolean[] = leaves.map(() => true);
  const adj: Map<number, number>[] = leaves.map(() => new Map());

  // self links inside one block: close them first
  for (let id = 0; id < leaves.length; id++) {
    const ports = clusterPorts[id];
    const linkedPos: number[] = [];
    for (let i = 0; i < ports.length; i++) {
      const q = partner[ports[i]];
      if (q >= 0 && owner[q] === id) linkedPos.push(i);
    }
    if (linkedPos.length === 0) continue;
    const keep: number[] = [];
    for (let i = 0; i < ports.length; i++) if (!linkedPos.includes(i)) keep.push(i);
    const linkedGlobal = linkedPos.map((i) => ports[i]);
    const partnerIdx = linkedGlobal.map((p) => linkedGlobal.indexOf(partner[p]));
    const names: string[] = [];
    linkedGlobal.forEach((p) => {
      if (p < partner[p]) names.push(linkName(sys, p, partner[p]));
    });
    const c = clusterPorts.length;
    const newPorts = Int32Array.from(keep, (i) => ports[i]);
    steps.push({ kind: "close", a: id, c, keep: Int32Array.from(keep), linked: Int32Array.from(linkedPos), partner: Int32Array.from(partnerIdx), ports: newPorts, inner: Int32Array.from(linkedGlobal), links: names });
    clusterPorts.push(newPorts);
    alive[id] = false;
    alive.push(true);
    adj.push(new Map());
    for (const p of newPorts) owner[p] = c;
  }
  // adjacency between sub-networks: number of links between them
  for (let id = 0; id < clusterPorts.length; id++) {
    if (!alive[id]) continue;
    for (const p of clusterPorts[id]) {
      const q = partner[p];
      if (q < 0) continue;
      const o = owner[q];
      adj[id].set(o, (adj[id].get(o) ?? 0) + 1);
    }
  }
  const heap = new Heap();
  let seq = 0;
  const propose = (a: number, b: number, m: number) => {
    const na = clusterPorts[a].length;
    const nb = clusterPorts[b].length;
    heap.push({ size: na + nb - 2 * m, sum: na + nb, a, b, seq: seq++ });
  };
  for (let id = 0; id < clusterPorts.length; id++) {
    if (!alive[id]) continue;
    for (const [o, m] of adj[id]) if (o > id) propose(id, o, m);
  }
  while (heap.length > 0) {
    const cand = heap.pop() as Candidate;
    const { a, b } = cand;
    if (!alive[a] || !alive[b]) continue;
    const pa = clusterPorts[a];
    const pb = clusterPorts[b];
    const posB = new Map<number, number>();
    pb.forEach((p, i) => posB.set(p, i));
    const aKeep: number[] = [];
    const aLink: number[] = [];
    const bLink: number[] = [];
    const linkedB = new Uint8Array(pb.length);
    const names: string[] = [];
    pa.forEach((p, i) => {
      const q = partner[p];
      if (q >= 0 && owner[q] === b) {
        aLink.push(i);
        const j = posB.get(q) as number;
        bLink.push(j);
        linkedB[j] = 1;
        names.push(linkName(sys, p, q));
      } else {
        aKeep.push(i);
      }
    });
    const bKeep: number[] = [];
    for (let j = 0; j < pb.length; j++) if (!linkedB[j]) bKeep.push(j);
    const c = clusterPorts.length;
    const ports = Int32Array.from([...aKeep.map((i) => pa[i]), ...bKeep.map((j) => pb[j])]);
    const inner = Int32Array.from([...aLink.map((i) => pa[i]), ...bLink.map((j) => pb[j])]);
    steps.push({ kind: "join", a, b, c, aKeep: Int32Array.from(aKeep), aLink: Int32Array.from(aLink), bKeep: Int32Array.from(bKeep), bLink: Int32Array.from(bLink), ports, inner, links: names });
    clusterPorts.push(ports);
    alive[a] = false;
    alive[b] = false;
    alive.push(true);
    for (const p of ports) owner[p] = c;
    const nadj = new Map<number, number>();
    for (const src of [adj[a], adj[b]]) {
      for (const [o, m] of src) {
        if (o === a || o === b) continue;
        nadj.set(o, (nadj.get(o) ?? 0) + m);
      }
    }
    adj.push(nadj);
    for (const [o, m] of nadj) {
      adj[o].delete(a);
      adj[o].delete(b);
      adj[o].set(c, m);
      propose(c, o, m);
    }
    adj[a] = new Map();
    adj[b] = new Map();
  }

  const outCluster = new Int32Array(E);
  const outPos = new Int32Array(E);
  for (let m = 0; m < E; m++) {
    const c = owner[outer[m]];
    outCluster[m] = c;
    outPos[m] = clusterPorts[c].indexOf(outer[m]);
  }
  return { P, totalPorts, leaves, steps, outer, outCluster, outPos, rho, t, partner };
}
