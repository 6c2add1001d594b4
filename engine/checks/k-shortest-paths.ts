// K shortest simple paths: Yen's algorithm (J. Y. Yen, "Finding the K shortest loopless paths in a network",
// Management Science 17(11), 1971) over Dijkstra, with Johnson's reweighting (D. B. Johnson, J. ACM 24(1),
// 1977) by Bellman–Ford potentials so that negative edge weights (gains above one) are handled exactly.

/** A directed graph with weighted edges; adjacency lists of [target node, weight]. */
export type WeightedGraph = {
  /** node count */
  n: number;
  /** adj[u] = edges leaving u: to[i], w[i] */
  adj: { to: number[]; w: number[] }[];
};

export type RankedPath = {
  /** node sequence from source to target */
  nodes: number[];
  /** sum of the original edge weights */
  cost: number;
};

export type KShortestResult = {
  paths: RankedPath[];
  /** "exact" when potentials made every weight non-negative; "approximate" when a negative cycle forced a shift */
  ranking: "exact" | "approximate";
  messages: string[];
};

/**
 * Creates an empty graph with n nodes.
 * @example const g = createGraph(3); addEdge(g, 0, 1, 2.5);
 */
export function createGraph(n: number): WeightedGraph {
  return { n, adj: Array.from({ length: n }, () => ({ to: [], w: [] })) };
}

/**
 * Adds the directed edge u → v with weight w (no parallel edges are merged: add each pair once).
 * @example addEdge(g, 0, 1, 3)
 */
export function addEdge(g: WeightedGraph, u: number, v: number, w: number): void {
  g.adj[u].to.push(v);
  g.adj[u].w.push(w);
}

/** Bellman–Ford from a virtual node joined to every node by 0: potentials h, or null on a negative cycle. */
function potentials(g: WeightedGraph): Float64Array | null {
  const h = new Float64Array(g.n); // all 0: the virtual source's edges
  let anyNeg = false;
  for (const e of g.adj) for (const w of e.w) if (w < 0) anyNeg = true;
  if (!anyNeg) return h;
  for (let it = 0; it <= g.n; it++) {
    let changed = false;
    for (let u = 0; u < g.n; u++) {
      const { to, w } = g.adj[u];
      for (let i = 0; i < to.length; i++) {
        const d = h[u] + w[i];
        if (d < h[to[i]] - 1e-12 * Math.max(1, Math.abs(d))) { h[to[i]] = d; changed = true; }
      }
    }
    if (!changed) return h;
  }
  return null;
}

/** Binary min-heap of (key, node). */
class Heap {
  private k: number[] = [];
  private v: number[] = [];
  get size(): number { return this.k.length; }
  push(key: number, node: number): void {
    const k = this.k, v = this.v;
    let i = k.length;
    k.push(key); v.push(node);
    while (i > 0) {
      const p = (i - 1) >> 1;
      if (k[p] <= key) break;
      k[i] = k[p]; v[i] = v[p]; i = p;
    }
    k[i] = key; v[i] = node;
  }
  pop(): [number, number] {
    const k = this.k, v = this.v;
    const top: [number, number] = [k[0], v[0]];
    const lk = k.pop() as number, lv = v.pop() as number;
    const n = k.length;
    if (n > 0) {
      let i = 0;
      for (;;) {
        const l = 2 * i + 1;
        if (l >= n) break;
        const c = l + 1 < n && k[l + 1] < k[l] ? l + 1 : l;
        if (k[c] >= lk) break;
        k[i] = k[c]; v[i] = v[c]; i = c;
      }
      k[i] = lk; v[i] = lv;
    }
    return top;
  }
}

/** Dijkstra on non-negative weights wr(u,v) from s to t avoiding banned nodes and edges. */
function dijkstra(g: WeightedGraph, wr: (u: number, i: number) => number, s: number, t: number, bannedNode: Uint8Array, bannedEdge: Set<number>): { nodes: number[]; cost: number } | null {
  const dist = new Float64Array(g.n).fill(Infinity);
  const prev = new Int32Array(g.n).fill(-1);
  const done = new Uint8Array(g.n);
  dist[s] = 0;
  const heap = new Heap();
  heap.push(0, s);
  while (heap.size > 0) {
    const [d, u] = heap.pop();
    if (done[u]) continue;
    done[u] = 1;
    if (u === t) break;
    const { to } = g.adj[u];
    for (let i = 0; i < to.length; i++) {
      const v = to[i];
      if (bannedNode[v] || done[v] || bannedEdge.has(u * g.n + v)) continue;
      const nd = d + wr(u, i);
      if (nd < dist[v]) { dist[v] = nd; prev[v] = u; heap.push(nd, v); }
    }
  }
  if (!Number.isFinite(dist[t])) return null;
  const nodes: number[] = [];
  for (let u = t; u !== -1; u = prev[u]) nodes.push(u);
  nodes.reverse();
  return { nodes, cost: dist[t] };
}

function edgeWeight(g: WeightedGraph, u: number, v: number): number {
  const { to, w } = g.adj[u];
  for (let i = 0; i < to.length; i++) if (to[i] === v) return w[i];
  return Infinity;
}

/**
 * The K lowest-cost simple paths from `source` to `target` (Yen 1971). Negative weights are made
 * non-negative by Johnson potentials h (w' = w + h(u) − h(v), which shifts every s→t path by the same
 * h(s) − h(t), so the ranking stays exact). When the graph holds a negative cycle no potentials exist:
 * every weight is then shifted by the most negative one (which favours paths with fewer hops), the found
 * paths are re-sorted by their true cost and the ranking is reported "approximate".
 *
 * @param g graph
 * @param source start node
 * @param target end node (≠ source)
 * @param K number of paths wanted (≥ 1)
 * @returns up to K paths, lowest true cost first
 * @example
 * const g = createGraph(3); addEdge(g, 0, 1, 1); addEdge(g, 1, 2, 1); addEdge(g, 0, 2, 3);
 * kShortestPaths(g, 0, 2, 2).paths.map((p) => p.cost) // [2, 3]
 */
export function kShortestPaths(g: WeightedGraph, source: number, target: number, K: number): KShortestResult {
  const messages: string[] = [];
  if (source === target) throw new RangeError("kShortestPaths: source and target must differ");
  let ranking: KShortestResult["ranking"] = "exact";
  let h = potentials(g);
  let shift = 0;
  if (!h) {
    ranking = "approximate";
    let min = 0;
    for (const e of g.adj) for (const w of e.w) min = Math.min(min, w);
    shift = -min;
    h = new Float64Array(g.n);
    messages.push(`the path graph holds a loop with net gain, so paths were searched with every hop shifted by ${shift.toFixed(2)} dB; the listed paths are re-sorted by their true products but strong paths with many hops may be missing`);
  }
  const hh = h;
  // Reduced weights, clamped at 0 against rounding.
  const wr = (u: number, i: number) => Math.max(0, g.adj[u].w[i] + shift + hh[u] - hh[g.adj[u].to[i]]);
  const trueCost = (nodes: number[]) => {
    let c = 0;
    for (let i = 0; i + 1 < nodes.length; i++) c += edgeWeight(g, nodes[i], nodes[i + 1]);
    return c;
  };
  const reducedCost = (nodes: number[]) => {
    let c = 0;
    for (let i = 0; i + 1 < nodes.length; i++) {
      const u = nodes[i], v = nodes[i + 1];
      const { to } = g.adj[u];
      for (let j = 0; j < to.length; j++) if (to[j] === v) { c += wr(u, j); break; }
    }
    return c;
  };

  const noNodes = new Uint8Array(g.n);
  const first = dijkstra(g, wr, source, target, noNodes, new Set());
  if (!first) return { paths: [], ranking, messages };
  const A: { nodes: number[]; cost: number }[] = [first];
  const B: { nodes: number[]; cost: number }[] = [];
  const seen = new Set<string>([first.nodes.join(",")]);
  for (let k = 1; k < K; k++) {
    const prev = A[k - 1].nodes;
    for (let i = 0; i + 1 < prev.length; i++) {
      const spur = prev[i];
      const root = prev.slice(0, i + 1);
      const bannedEdge = new Set<number>();
      for (const p of A) {
        if (p.nodes.length > i + 1 && root.every((x, j) => p.nodes[j] === x)) bannedEdge.add(p.nodes[i] * g.n + p.nodes[i + 1]);
      }
      const bannedNode = new Uint8Array(g.n);
      for (let j = 0; j < i; j++) bannedNode[root[j]] = 1;
      const tail = dijkstra(g, wr, spur, target, bannedNode, bannedEdge);
      if (!tail) continue;
      const nodes = root.slice(0, -1).concat(tail.nodes);
      const key = nodes.join(",");
      if (seen.has(key)) continue;
      seen.add(key);
      B.push({ nodes, cost: reducedCost(nodes) });
    }
    if (B.length === 0) break;
    let bi = 0;
    for (let j = 1; j < B.length; j++) if (B[j].cost < B[bi].cost) bi = j;
    A.push(B[bi]);
    B.splice(bi, 1);
  }
  const paths = A.map((p) => ({ nodes: p.nodes, cost: trueCost(p.nodes) }));
  if (ranking === "approximate") paths.sort((a, b) => a.cost - b.cost);
  return { paths, ranking, messages };
}
