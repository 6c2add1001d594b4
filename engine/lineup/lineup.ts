// Line-up along a path from one system port to another: per stage and cumulative gain from the actual waves
// of the solved chart (so mismatch, loops and leakage count), cumulative noise figure through the exact
// noise solve, signal levels for an input level, and cascade compression and intercept points.

import { nearestIndex, portIndex } from "../checks/band";
import { leakTrace } from "../checks/leak-trace";
import { internalWaves, solveSystem } from "../network";
import { noiseFigure, systemNoise } from "../noise";
import { EngineInputError, type PreparedSystem, type SData } from "../types";

export type LineupOptions = {
  /** system port names */
  from: string;
  to: string;
  /** block ids in order along the path (default: the strongest forward path of the leak trace) */
  blocks?: string[];
  /** input level at `from`, dBm (incident from the source): levels and headroom are given when set */
  inputDbm?: number;
  /** the plan point where the leak trace picks the default path (default the middle of the plan) */
  frequencyHz?: number;
  /** block id → S used instead (a switch state) */
  replace?: Record<string, SData>;
  /** compute the noise figures (default true); a headroom rule needs only levels */
  noise?: boolean;
};

export type LineupStage = {
  block: string;
  kind: string;
  /** 1-based block ports the path enters and leaves by */
  inPort: number;
  outPort: number;
  /** |b_out|²/|a_in|² of the actual waves, dB, per frequency */
  gainDb: number[];
  /** |b_out|² over the source's incident power, dB, per frequency */
  cumulativeGainDb: number[];
  /** noise figure from `from` to this stage's output (cut there and ended in Z0 at 290 K), dB */
  cumulativeNfDb: number[];
  /** the block's own p1db_out_dbm and oip3_dbm (null: not given, counted ideal) */
  p1dbOutDbm: number | null;
  oip3Dbm: number | null;
  /** cascade output- and input-referred 1 dB compression and third-order intercept up to this stage, dBm */
  cumulativeOp1dbDbm: number[];
  cumulativeIp1dbDbm: number[];
  cumulativeOip3Dbm: number[];
  cumulativeIip3Dbm: number[];
  /** wave levels entering and leaving the stage for `inputDbm`, dBm (null without an input level) */
  levelInDbm: number[] | null;
  levelOutDbm: number[] | null;
  /** p1db_out_dbm − levelOutDbm, dB (null without an input level or a P1dB) */
  headroomDb: number[] | null;
};

export type LineupResult = {
  from: string;
  to: string;
  frequencies: number[];
  /** transducer gain |S_to,from|², dB */
  gainDb: number[];
  /** noise figure from `from` to `to` (docs/scenario-format.md#noise), dB (NaN when `noise: false`) */
  nfDb: number[];
  inputDbm: number | null;
  /** how the path was chosen, and where */
  path: { source: "leak-trace" | "given"; frequencyHz: number | null; text: string };
  stages: LineupStage[];
  warnings: string[];
};

const db10 = (x: number): number => 10 * Math.log10(x);

type PathStage = { block: number; inPort: number; outPort: number };

/**
 * The line-up of a path (see LineupResult). Stage gain and levels come from the internal waves for a wave
 * of 1 W from `from` (other system ports matched). The cascade compression and intercept points follow
 * the usual formulas (common practice): with G_s the stage's gain from the actual waves and the points in
 * watts, 1/OIP3_s,cum = 1/(OIP3_s−1,cum·G_s) + 1/OIP3_s, the same for P1dB, input-referred = output-referred
 * over the cumulative gain; a stage without a figure counts as ideal (∞). Cumulative noise figures cut the
 * chart at each stage's output (that port made a system port ended in the system Z0; what followed sees a
 * matched load at its own temperature) and use the exact noise solve; the last stage's is the system's.
 *
 * @param sys prepared system
 * @param opts from, to, optional blocks, input level, trace frequency, replaced S
 * @throws EngineInputError on unknown ports or blocks, or blocks that do not form a path of links
 * @example lineup(sys, { from: "ANT", to: "RX", inputDbm: -60 }).stages.map((s) => s.block)
 */
export function lineup(sys: PreparedSystem, opts: LineupOptions): LineupResult {
  const sol = solveSystem(sys, { replace: opts.replace });
  const i = portIndex(sol, opts.from, "lineup.from");
  const j = portIndex(sol, opts.to, "lineup.to");
  if (i === j) throw new EngineInputError("lineup.to", "a line-up needs two different system ports");
  const nf = sys.frequencies.length;
  const E = sys.systemPorts.length;
  const warnings: string[] = [];
  let path: PathStage[];
  let pathInfo: LineupResult["path"];
  if (opts.blocks && opts.blocks.length > 0) {
    path = givenPath(sys, opts.blocks, i, j);
    pathInfo = { source: "given", frequencyHz: null, text: describe(sys, path) };
  } else {
    const k = opts.frequencyHz !== undefined ? nearestIndex(sys.frequencies, opts.frequencyHz) : Math.floor((nf - 1) / 2);
    if (opts.replace && Object.keys(opts.replace).length > 0) warnings.push("the default path is traced on the blocks' own S, not the replaced states");
    const trace = leakTrace(sol, { from: opts.from, to: opts.to, frequencyHz: sys.frequencies[k], k: 1, whatIf: false });
    const best = trace.paths[0];
    if (!best) throw new EngineInputError("lineup", `no path joins ${opts.from} to ${opts.to}; name the blocks along it`);
    path = best.hops
      .filter((h) => h.kind === "block" && h.inPort !== h.outPort)
      .map((h) => ({ block: sys.blocks.findIndex((b) => b.id === h.block), inPort: h.inPort, outPort: h.outPort }));
    pathInfo = { source: "leak-trace", frequencyHz: sys.frequencies[k], text: describe(sys, path) };
  }

  // waves for 1 W incident at `from`
  const inc = new Float64Array(2 * nf * E);
  for (let k = 0; k < nf; k++) inc[2 * (k * E + i)] = 1;
  const { a, b } = internalWaves(sol, inc);
  const P = sys.blockPorts.length;
  const power = (w: Float64Array, k: number, p: number) => w[2 * (k * P + p)] ** 2 + w[2 * (k * P + p) + 1] ** 2;

  const withNoise = opts.noise !== false;
  const noise = withNoise ? systemNoise(sys, { outputs: [j], replace: opts.replace }) : null;
  if (noise) warnings.push(...noise.warnings.filter((w) => !sys.warnings.includes(w)));
  const nfTo = noise ? noiseFigure(noise, i, j) : new Float64Array(nf).fill(NaN);
  const s = sol.s.data;
  const gainDb = Array.from({ length: nf }, (_, k) => db10(s[2 * ((k * E + j) * E + i)] ** 2 + s[2 * ((k * E + j) * E + i) + 1] ** 2));

  const stages: LineupStage[] = [];
  const op1 = new Float64Array(nf).fill(Infinity);
  const oip3 = new Float64Array(nf).fill(Infinity);
  const prevCum = new Float64Array(nf).fill(1);
  path.forEach((st, x) => {
    const blk = sys.blocks[st.block];
    const spec = sys.scenario.blocks[st.block];
    const off = sys.blockOffset[st.block];
    const pin = off + st.inPort - 1;
    const pout = off + st.outPort - 1;
    const last = x === path.length - 1 && pout === sys.systemPorts[j].at;
    const cumNf = last || !withNoise ? nfTo : cutNoiseFigure(sys, i, pout, opts.replace);
    const p1 = typeof spec?.p1db_out_dbm === "number" ? spec.p1db_out_dbm : null;
    const ip3 = typeof spec?.oip3_dbm === "number" ? spec.oip3_dbm : null;
    const stage: LineupStage = {
      block: blk.id,
      kind: blk.kind,
      inPort: st.inPort,
      outPort: st.outPort,
      gainDb: [],
      cumulativeGainDb: [],
      cumulativeNfDb: Array.from(cumNf, db10),
      p1dbOutDbm: p1,
      oip3Dbm: ip3,
      cumulativeOp1dbDbm: [],
      cumulativeIp1dbDbm: [],
      cumulativeOip3Dbm: [],
      cumulativeIip3Dbm: [],
      levelInDbm: opts.inputDbm === undefined ? null : [],
      levelOutDbm: opts.inputDbm === undefined ? null : [],
      headroomDb: opts.inputDbm === undefined || p1 === null ? null : [],
    };
    for (let k = 0; k < nf; k++) {
      const pi = power(a, k, pin);
      const po = power(b, k, pout);
      stage.gainDb.push(db10(po / pi));
      stage.cumulativeGainDb.push(db10(po));
      // cascade with this stage's gain taken as the ratio of cumulative gains (telescoping along the links)
      const g = po / prevCum[k];
      prevCum[k] = po;
      op1[k] = combine(op1[k] * g, p1 === null ? Infinity : 10 ** (p1 / 10));
      oip3[k] = combine(oip3[k] * g, ip3 === null ? Infinity : 10 ** (ip3 / 10));
      stage.cumulativeOp1dbDbm.push(db10(op1[k]));
      stage.cumulativeIp1dbDbm.push(db10(op1[k] / po));
      stage.cumulativeOip3Dbm.push(db10(oip3[k]));
      stage.cumulativeIip3Dbm.push(db10(oip3[k] / po));
      if (opts.inputDbm !== undefined) {
        const lo = opts.inputDbm + db10(po);
        stage.levelInDbm!.push(opts.inputDbm + db10(pi));
        stage.levelOutDbm!.push(lo);
        if (p1 !== null) stage.headroomDb!.push(p1 - lo);
      }
    }
    if (stage.headroomDb) {
      const worst = Math.min(...stage.headroomDb);
      if (worst < 0) warnings.push(`${blk.id}: the output level passes its P1dB (${p1} dBm) by ${(-worst).toFixed(2)} dB for ${opts.inputDbm} dBm at ${opts.from}`);
    }
    stages.push(stage);
  });
  return {
    from: opts.from,
    to: opts.to,
    frequencies: Array.from(sys.frequencies),
    gainDb,
    nfDb: Array.from(nfTo, db10),
    inputDbm: opts.inputDbm ?? null,
    path: pathInfo,
    stages,
    warnings,
  };
}

/** 1/(1/x + 1/y) with ∞ as the neutral value (points in watts). */
function combine(x: number, y: number): number {
  if (x === Infinity) return y;
  if (y === Infinity) return x;
  return 1 / (1 / x + 1 / y);
}

/** "ANT → FLT 1→2 → LNA 1→2" */
function describe(sys: PreparedSystem, path: PathStage[]): string {
  return path.map((st) => `${sys.blocks[st.block].id} ${st.inPort}→${st.outPort}`).join(" → ");
}

/**
 * The path through the named blocks: the first enters from the system port `from`, each next one by the
 * link from the previous, the last leaves by the system port `to` (or a link to nothing further).
 */
function givenPath(sys: PreparedSystem, ids: string[], i: number, j: number): PathStage[] {
  const partner = new Map<number, number>();
  for (const [p, q] of sys.links) {
    partner.set(p, q);
    partner.set(q, p);
  }
  const idx = ids.map((id, x) => {
    const b = sys.blocks.findIndex((blk) => blk.id === id);
    if (b < 0) throw new EngineInputError(`lineup.blocks[${x}]`, `no block with id ${id}`);
    return b;
  });
  const portsOf = (b: number) => {
    const off = sys.blockOffset[b];
    return Array.from({ length: sys.blocks[b].s.n }, (_, r) => off + r);
  };
  const stages: PathStage[] = [];
  let entry = sys.systemPorts[i].at;
  idx.forEach((b, x) => {
    const mine = portsOf(b);
    if (!mine.includes(entry)) {
      const prev = x === 0 ? `system port ${sys.systemPorts[i].name}` : ids[x - 1];
      throw new EngineInputError(`lineup.blocks[${x}]`, `${ids[x]} is not connected to ${prev}`);
    }
    let exit: number | undefined;
    if (x + 1 < idx.length) {
      const next = portsOf(idx[x + 1]);
      exit = mine.find((p) => p !== entry && next.includes(partner.get(p) ?? -1));
      if (exit === undefined) throw new EngineInputError(`lineup.blocks[${x + 1}]`, `no link from ${ids[x]} to ${ids[x + 1]}`);
    } else {
      exit = mine.find((p) => p === sys.systemPorts[j].at);
      if (exit === undefined) throw new EngineInputError(`lineup.blocks[${x}]`, `the last block ${ids[x]} is not at system port ${sys.systemPorts[j].name}`);
    }
    const off = sys.blockOffset[b];
    stages.push({ block: b, inPort: entry - off + 1, outPort: exit - off + 1 });
    entry = partner.get(exit) ?? -1;
  });
  return stages;
}

/** NF from system port i to block port p, the chart cut at p (p made a system port in the system Z0). */
function cutNoiseFigure(sys: PreparedSystem, i: number, p: number, replace?: Record<string, SData>): Float64Array {
  const sp = sys.systemPorts.findIndex((x) => x.at === p);
  if (sp >= 0) return noiseFigure(systemNoise(sys, { outputs: [sp], replace }), i, sp);
  const link = sys.links.find(([x, y]) => x === p || y === p);
  const partner = link ? (link[0] === p ? link[1] : link[0]) : -1;
  const info = sys.blockPorts[p];
  const cut: PreparedSystem = {
    ...sys,
    links: sys.links.filter((l) => l !== link),
    systemPorts: [...sys.systemPorts, { name: `${info.block}:${info.port}`, at: p, z0: sys.z0 }],
    unterminated: [...sys.unterminated.filter((u) => u !== p), ...(partner >= 0 ? [partner] : [])],
  };
  const out = cut.systemPorts.length - 1;
  return noiseFigure(systemNoise(cut, { outputs: [out], replace }), i, out);
}

