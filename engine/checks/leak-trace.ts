// Leak trace: the K strongest simple paths of waves from one system port to another through block
// transfers and reflections (signal-flow graph of the interconnection, ranked by −20·log10|S| with Yen's
// K shortest paths), their coherent sum against the exact composite, and ideal-block what-ifs.
import { SingularSystemError } from "../types";
import type { PreparedSystem, SData, Solution } from "../types";
import { evaluateBlock, idealizeBlock } from "../blocks";
import { solveSystem } from "../network";
import { bandIndices, formatHz, nearestIndex, portIndex } from "./band";
import { db20 } from "./conversions";
import { DB_FLOOR } from "./types";
import { addEdge, createGraph, kShortestPaths } from "./k-shortest-paths";
import { sliceS, sliceSystem } from "./slice-system";

/** Block transfers below this magnitude (−240 dB) are left out of the path graph. */
export const LEAK_EDGE_FLOOR = 1e-12;

export type LeakHop = {
  /** "block": a transfer S_out,in of a block (out = in for a reflection); "port": the step between a
   *  system port's own Z0 and the system Z0 (transmission on entry or exit, reflection back into the system) */
  kind: "block" | "port";
  /** block id, or system port name for "port" hops */
  block: string;
  inPort: number;
  outPort: number;
  db: number;
  phaseDeg: number;
};

export type LeakPath = {
  rank: number;
  hops: LeakHop[];
  /** 20·log10 of the product of the hops */
  db: number;
  phaseDeg: number;
  /** readable form, e.g. "TX → SW1 1→3 (−28.00 dB) → RX" */
  text: string;
};

export type LeakWhatIf = {
  block: string;
  kind: string;
  /** what "ideal" means for this block */
  ideal: string;
  /** |S_to,from| in dB with this block ideal (null when the modified system could not be solved) */
  valueDb: number | null;
  /** trueDb − valueDb: how much less energy reaches the target; positive = isolation (or match) improves */
  improvementDb: number | null;
  message: string;
};

export type LeakTraceResult = {
  from: string;
  to: string;
  /** plan point traced, and what was asked */
  frequencyHz: number;
  index: number;
  requestedHz: number | null;
  band: [number, number] | null;
  /** exact composite |S_to,from| dB and phase */
  trueDb: number;
  truePhaseDeg: number;
  paths: LeakPath[];
  /** coherent (complex) sum of the listed paths */
  listedSumDb: number;
  listedSumPhaseDeg: number;
  /** listedSumDb − trueDb: 0 dB when the listed paths explain the composite fully */
  accountedDb: number;
  /** |true − listed sum| in dB, and relative to |true| (dB) */
  residualDb: number;
  residualRelativeDb: number;
  /** Σ|path|² / |true|² (the paths' power share if they added incoherently) */
  powerShare: number;
  ranking: "exact" | "approximate";
  whatIf: LeakWhatIf[];
  messages: string[];
};

export type LeakTraceOptions = {
  from: string;
  to: string;
  /** trace at the plan point nearest to this frequency (Hz); default the first plan point */
  frequencyHz?: number;
  /** or at the frequency of the band where |S_to,from| is largest (the worst isolation or match) */
  band?: [number, number];
  /** number of paths (default 10) */
  k?: number;
  /** compute the ideal-block what-ifs (default true) */
  whatIf?: boolean;
};

type Edge = { kind: "block" | "port"; block: string; inPort: number; outPort: number; re: number; im: number };

const deg = (re: number, im: number) => (Math.atan2(im, re) * 180) / Math.PI;

/**
 * Builds the path graph at plan index k: node 2p is the wave incident on global block port p (a_p), node
 * 2p+1 the wave leaving it (b_p). Block transfers a_q → b_p weigh −20·log10|S_pq| (reflections p = q
 * included); links b_p → a_q weigh 0; a system port whose own Z0 differs from the system Z0 reflects
 * b_p → a_p with Γ = (R − Z0)/(R + Z0) (power waves, real references).
 */
function buildGraph(sys: PreparedSystem, k: number) {
  const np = sys.blockPorts.length;
  const g = createGraph(2 * np);
  const edges = new Map<number, Edge>();
  const put = (u: number, v: number, e: Edge) => {
    const m = Math.hypot(e.re, e.im);
    if (!(m >= LEAK_EDGE_FLOOR)) return;
    addEdge(g, u, v, -db20(m));
    edges.set(u * g.n + v, e);
  };
  sys.blocks.forEach((b, bi) => {
    const off = sys.blockOffset[bi];
    const n = b.s.n;
    const base = 2 * k * n * n;
    for (let q = 0; q < n; q++) {
      for (let p = 0; p < n; p++) {
        const o = base + 2 * (p * n + q);
        put(2 * (off + q), 2 * (off + p) + 1, { kind: "block", block: b.id, inPort: q + 1, outPort: p + 1, re: b.s.data[o], im: b.s.data[o + 1] });
      }
    }
  });
  for (const [p, q] of sys.links) {
    put(2 * p + 1, 2 * q, { kind: "block", block: "", inPort: 0, outPort: 0, re: 1, im: 0 });
    put(2 * q + 1, 2 * p, { kind: "block", block: "", inPort: 0, outPort: 0, re: 1, im: 0 });
  }
  for (const sp of sys.systemPorts) {
    const gam = (sp.z0 - sys.z0) / (sp.z0 + sys.z0);
    if (gam !== 0) put(2 * sp.at + 1, 2 * sp.at, { kind: "port", block: sp.name, inPort: sys.blockPorts[sp.at].port, outPort: sys.blockPorts[sp.at].port, re: gam, im: 0 });
  }
  return { g, edges };
}

/**
 * Leak trace between two system ports at one plan point: the K strongest paths (hops, products in dB),
 * how much of the exact composite value their coherent sum accounts for, and for each block on them the
 * exact composite value with that block idealised.
 *
 * Path search: Yen's K shortest simple paths on −20·log10|S| per hop; gains above one (amplifiers) give
 * negative weights, made non-negative by Johnson potentials so that the ranking stays exact (see
 * kShortestPaths). Simple paths visit each wave at most once, so multiple bounces around a loop are not
 * listed; the residual against the composite shows what they carry.
 *
 * Ideal blocks: built-in kinds use idealizeBlock (infinite isolation and directivity, perfect match, no
 * excess loss) evaluated at the traced frequency; a touchstone part's idealised self is its measured data
 * with the diagonal set to zero (perfect match at every port, transmissions and leakage kept as measured).
 * The modified system is solved exactly (solveSystem with `replace`) at the traced frequency.
 *
 * The graph is built from solution.system's blocks: trace a solution solved without `replace` (the
 * Solution does not record replacements).
 *
 * @param solution solved composite
 * @param opts source and target system port names, frequency or band, K, what-ifs on/off
 * @returns LeakTraceResult (plain JSON)
 * @throws EngineInputError for unknown ports or an empty band
 * @example leakTrace(sol, { from: "TX", to: "RX", band: [2.4e9, 2.48e9] }).whatIf[0].message
 * // "if SW1 were ideal, TX→RX isolation would improve by 18.20 dB"
 */
export function leakTrace(solution: Solution, opts: LeakTraceOptions): LeakTraceResult {
  const sys = solution.system;
  const m = portIndex(solution, opts.from, "leak.from");
  const t = portIndex(solution, opts.to, "leak.to");
  const K = Math.max(1, Math.floor(opts.k ?? 10));
  const nsp = solution.ports.length;
  const sd = solution.s.data;
  const at = (k: number) => 2 * ((k * nsp + t) * nsp + m);
  let k: number;
  if (opts.band) {
    const ks = bandIndices(solution.frequencies, opts.band, "leak.band");
    k = ks[0];
    for (const q of ks) if (Math.hypot(sd[at(q)], sd[at(q) + 1]) > Math.hypot(sd[at(k)], sd[at(k) + 1])) k = q;
  } else {
    k = nearestIndex(solution.frequencies, opts.frequencyHz ?? solution.frequencies[0]);
  }
  const f = solution.frequencies[k];
  const trueRe = sd[at(k)], trueIm = sd[at(k) + 1];
  const trueMag = Math.hypot(trueRe, trueIm);
  const messages: string[] = [];

  const { g, edges } = buildGraph(sys, k);
  const src = sys.systemPorts[m], dst = sys.systemPorts[t];
  const trans = (r: number) => (2 * Math.sqrt(r * sys.z0)) / (r + sys.z0);
  const tIn = trans(src.z0), tOut = trans(dst.z0);
  const entryHop: LeakHop | null = tIn === 1 ? null : { kind: "port", block: src.name, inPort: 0, outPort: sys.blockPorts[src.at].port, db: db20(tIn), phaseDeg: 0 };
  const exitHop: LeakHop | null = tOut === 1 ? null : { kind: "port", block: dst.name, inPort: sys.blockPorts[dst.at].port, outPort: 0, db: db20(tOut), phaseDeg: 0 };

  const found = kShortestPaths(g, 2 * src.at, 2 * dst.at + 1, K);
  messages.push(...found.messages);
  type Raw = { hops: LeakHop[]; re: number; im: number };
  const raws: Raw[] = found.paths.map((p) => {
    let re = tIn * tOut, im = 0;
    const hops: LeakHop[] = [];
    if (entryHop) hops.push(entryHop);
    for (let i = 0; i + 1 < p.nodes.length; i++) {
      const e = edges.get(p.nodes[i] * g.n + p.nodes[i + 1]) as Edge;
      const r2 = re * e.re - im * e.im;
      im = re * e.im + im * e.re;
      re = r2;
      if (e.block === "") continue; // links carry the wave unchanged
      hops.push({ kind: e.kind, block: e.block, inPort: e.inPort, outPort: e.outPort, db: db20(Math.hypot(e.re, e.im)), phaseDeg: deg(e.re, e.im) });
    }
    if (exitHop) hops.push(exitHop);
    return { hops, re, im };
  });
  if (m === t && src.z0 !== sys.z0) {
    // Reflection at the step between the port's own Z0 and the system Z0, before entering any block.
    const gam = (sys.z0 - src.z0) / (sys.z0 + src.z0);
    raws.push({ hops: [{ kind: "port", block: src.name, inPort: 0, outPort: 0, db: db20(Math.abs(gam)), phaseDeg: deg(gam, 0) }], re: gam, im: 0 });
    raws.sort((a, b) => Math.hypot(b.re, b.im) - Math.hypot(a.re, a.im));
    if (raws.length > K) raws.length = K;
  }
  const paths: LeakPath[] = raws.map((r, i) => ({
    rank: i + 1,
    hops: r.hops,
    db: db20(Math.hypot(r.re, r.im)),
    phaseDeg: deg(r.re, r.im),
    text: [opts.from, ...r.hops.filter((h) => h.kind === "block" || h.inPort !== 0 && h.outPort !== 0).map((h) => `${h.kind === "port" ? `reflection at port ${h.block}` : `${h.block} ${h.inPort}→${h.outPort}`} (${h.db.toFixed(2)} dB)`), opts.to].join(" → "),
  }));
  let sumRe = 0, sumIm = 0, pow = 0;
  for (const r of raws) { sumRe += r.re; sumIm += r.im; pow += r.re * r.re + r.im * r.im; }
  const trueDb = db20(trueMag);
  const listedSumDb = db20(Math.hypot(sumRe, sumIm));
  const resid = Math.hypot(trueRe - sumRe, trueIm - sumIm);
  const residualDb = db20(resid);
  const residualRelativeDb = trueMag > 0 ? db20(resid / trueMag) : residualDb;
  const powerShare = trueMag > 0 ? pow / (trueMag * trueMag) : 0;
  const pair = m === t ? `${opts.from} reflection` : `${opts.from}→${opts.to}`;
  messages.unshift(
    `${pair} at ${formatHz(f)}: composite ${trueDb.toFixed(2)} dB; the ${paths.length} listed path${paths.length === 1 ? "" : "s"} sum coherently to ${listedSumDb.toFixed(2)} dB (${(listedSumDb - trueDb >= 0 ? "+" : "") + (listedSumDb - trueDb).toFixed(2)} dB against the composite), residual ${residualRelativeDb.toFixed(2)} dB relative to it`,
  );
  if (paths.length === 0) messages.push(`no path with hops above ${db20(LEAK_EDGE_FLOOR)} dB joins ${opts.from} to ${opts.to}`);

  const whatIf: LeakWhatIf[] = [];
  if (opts.whatIf !== false) {
    const onPaths: string[] = [];
    for (const p of paths) for (const h of p.hops) if (h.kind === "block" && !onPaths.includes(h.block)) onPaths.push(h.block);
    const one = oneFrequency(sys, k);
    for (const id of onPaths) whatIf.push(idealWhatIf(one, id, m, t, trueDb, pair, m === t));
  }
  return {
    from: opts.from,
    to: opts.to,
    frequencyHz: f,
    index: k,
    requestedHz: opts.band ? null : opts.frequencyHz ?? null,
    band: opts.band ? [opts.band[0], opts.band[1]] : null,
    trueDb,
    truePhaseDeg: deg(trueRe, trueIm),
    paths,
    listedSumDb,
    listedSumPhaseDeg: deg(sumRe, sumIm),
    accountedDb: listedSumDb - trueDb,
    residualDb,
    residualRelativeDb,
    powerShare,
    ranking: found.ranking,
    whatIf,
    messages,
  };
}

const slices = new WeakMap<PreparedSystem, PreparedSystem>();

/**
 * A one-frequency copy of `sys` at plan index k, kept per system and refilled in place on later calls so
 * that the join plan cached on it (by solveSystem) is built once per system, not once per trace.
 * Callers must use it before the next call (the engine runs single-threaded).
 */
function oneFrequency(sys: PreparedSystem, k: number): PreparedSystem {
  const one = slices.get(sys);
  if (!one) {
    const made = sliceSystem(sys, [k]);
    slices.set(sys, made);
    return made;
  }
  one.frequencies[0] = sys.frequencies[k];
  sys.blocks.forEach((b, i) => {
    const nn = 2 * b.s.n * b.s.n;
    one.blocks[i].s.data.set(b.s.data.subarray(k * nn, (k + 1) * nn));
  });
  return one;
}

/**
 * The idealised S of one block of a one-frequency system: idealizeBlock + evaluateBlock for built-in kinds,
 * the data with a zero diagonal for touchstone parts.
 * @returns the S (nf = sys.frequencies.length) and a description of the idealisation
 * @example idealS(sliceSystem(sys, [k]), "SW1").s
 */
export function idealS(sys: PreparedSystem, id: string): { s: SData; ideal: string } {
  const bi = sys.blocks.findIndex((b) => b.id === id);
  const block = sys.blocks[bi];
  if (block.kind === "touchstone") {
    const s = sliceS(block.s, Array.from({ length: block.s.nf }, (_, q) => q));
    const n = s.n;
    for (let q = 0; q < s.nf; q++) for (let i = 0; i < n; i++) {
      const o = 2 * ((q * n + i) * n + i);
      s.data[o] = 0;
      s.data[o + 1] = 0;
    }
    return { s, ideal: "measured data with perfect match (reflections S_ii set to 0, transmissions kept)" };
  }
  const spec = sys.scenario.blocks.find((b) => b.id === id);
  if (!spec) throw new Error(`block ${id} is not in the scenario`);
  const r = evaluateBlock(idealizeBlock(spec), sys.frequencies, sys.z0);
  return { s: r.s, ideal: "ideal model (infinite isolation and directivity, perfect match, no excess loss)" };
}

function idealWhatIf(one: PreparedSystem, id: string, m: number, t: number, trueDb: number, pair: string, self: boolean): LeakWhatIf {
  const kind = one.blocks.find((b) => b.id === id)?.kind ?? "";
  let ideal = "";
  try {
    const r = idealS(one, id);
    ideal = r.ideal;
    const sol = solveSystem(one, { replace: { [id]: r.s }, waves: false });
    const n = sol.s.n;
    const o = 2 * (t * n + m);
    const valueDb = db20(Math.hypot(sol.s.data[o], sol.s.data[o + 1]));
    const improvementDb = trueDb - valueDb;
    const what = self ? `${pair.replace(" reflection", "")} return loss` : `${pair} isolation`;
    const message = valueDb <= DB_FLOOR
      ? `if ${id} were ideal, ${pair} would carry nothing (below ${DB_FLOOR} dB): every leak path runs through ${id}`
      : Math.abs(improvementDb) < 0.005
      ? `if ${id} were ideal, ${what} would not change (${(-valueDb).toFixed(2)} dB)`
      : `if ${id} were ideal, ${what} would ${improvementDb > 0 ? "improve" : "worsen"} by ${Math.abs(improvementDb).toFixed(2)} dB`;
    return { block: id, kind, ideal, valueDb, improvementDb, message };
  } catch (err) {
    if (!(err instanceof SingularSystemError)) throw err;
    return { block: id, kind, ideal, valueDb: null, improvementDb: null, message: `if ${id} were ideal, the system could not be solved: ${err.message}` };
  }
}
