// Drive check: incident power |a|² at every block port (Kurokawa power waves, from the internal waves)
// for given source powers, summed incoherently Σ_s|a_s|² and worst-case coherently (Σ_s|a_s|)².
import { EngineInputError } from "../types";
import type { RuleSpec, Scenario, Solution } from "../types";
import { internalWavesMany } from "../network";
import { bandIndices, formatHz, portIndex } from "./band";
import { dbmFromWatts, wattsFromDbm } from "./conversions";
import type { Verdict } from "./types";

/** The cautions shown with every drive-check result (docs/checks.md, "Drive check"; docs/README.md, "Cautions the product shows"). */
export const DRIVE_CAUTIONS: readonly string[] = [
  "RF power can burn people and destroy parts.",
  "These figures are estimates from the entered data.",
  "Exposure limits and equipment ratings follow local regulations and the part makers' documents.",
  "Transmitting systems are to be verified by qualified people with calibrated instruments before use.",
];

export type DriveSource = { port: string; dbm: number };

/** Incident power at one block port, worst over the evaluated frequencies. */
export type DrivePortResult = {
  block: string;
  /** 1-based block port */
  port: number;
  ratingDbm: number | null;
  /** Σ_s |a_s|², dBm, and where it peaks */
  incoherentDbm: number;
  incoherentHz: number;
  /** (Σ_s |a_s|)², dBm, and where it peaks */
  coherentDbm: number;
  coherentHz: number;
  /** rating − power on the verdict basis, dB; null when the block has no rating */
  margin: number | null;
  verdict: Verdict | null;
};

export type DriveBlockResult = {
  block: string;
  ratingDbm: number | null;
  /** highest incident power over the block's ports on the verdict basis, dBm */
  worstDbm: number;
  worstPort: number;
  worstHz: number;
  margin: number | null;
  verdict: Verdict | null;
};

export type DriveResult = {
  verdict: Verdict;
  /** which sum the verdict uses: "coherent" when requested, else "incoherent" (the coherent sum then only warns) */
  basis: "coherent" | "incoherent";
  sources: { port: string; dbm: number; watts: number }[];
  /** plan points evaluated */
  points: number;
  band: [number, number] | null;
  ports: DrivePortResult[];
  blocks: DriveBlockResult[];
  /** the rated port with the smallest margin, or null when no block is rated */
  worst: { block: string; port: number; dbm: number; hz: number; ratingDbm: number; margin: number } | null;
  /** the highest incident power anywhere (verdict basis), dBm, and its frequency */
  maxDbm: number;
  maxHz: number;
  /** blocks with p1db_out_dbm: the highest outgoing power |b|² at any of their ports (verdict basis) against it */
  compression: DriveCompression[];
  cautions: readonly string[];
  messages: string[];
};

/** Outgoing power at a block with a P1dB: a level past it makes the linear figures optimistic. */
export type DriveCompression = { block: string; port: number; outDbm: number; hz: number; p1dbOutDbm: number; marginDb: number };

export type DriveOptions = {
  sources: DriveSource[];
  /** restrict to plan points inside [lo, hi] Hz (default: the whole plan) */
  band?: [number, number];
  /** judge ratings against the worst-case coherent sum (default: incoherent) */
  coherent?: boolean;
  /** name used in errors, e.g. a rule name */
  where?: string;
};

/**
 * Source powers from the scenario's first drive rule, for a drive check run without a request.
 * @returns the rule's sources, or null when the scenario has no drive rule
 * @example defaultDriveSources(scenario) // [{ port: "TX", dbm: 40 }]
 */
export function defaultDriveSources(scenario: Scenario): DriveSource[] | null {
  const r = (scenario.rules ?? []).find((x): x is Extract<RuleSpec, { kind: "drive" }> => x.kind === "drive");
  return r ? r.sources : null;
}

/**
 * Drive check: for each source (a wave of √P at its system port, phase 0, referenced to the port's own Z0,
 * the other ports matched), the incident power |a|² at every block port; the per-port sums over sources,
 * incoherent Σ_s|a_s|² and worst-case coherent (Σ_s|a_s|)², against each block's rating_dbm.
 *
 * @param solution solved composite (its system carries the blocks and ratings)
 * @param opts sources in dBm, optional band (Hz), verdict basis
 * @returns a DriveResult with DRIVE_CAUTIONS attached; verdict "fail" when a rated port exceeds its rating on
 *   the basis, "warn" when only the coherent worst case does
 * @throws EngineInputError for no sources, unknown ports, non-finite powers or an empty band
 * @example driveCheck(sol, { sources: [{ port: "TX", dbm: 43 }] }).worst
 */
export function driveCheck(solution: Solution, opts: DriveOptions): DriveResult {
  const where = opts.where ?? "drive";
  const sys = solution.system;
  if (!opts.sources || opts.sources.length === 0) throw new EngineInputError(`${where}.sources`, "a drive check needs at least one source power");
  const nsp = solution.ports.length;
  const nf = solution.frequencies.length;
  const np = sys.blockPorts.length;
  const ks = opts.band ? bandIndices(solution.frequencies, opts.band, where) : Array.from({ length: nf }, (_, k) => k);
  const sources = opts.sources.map((s, i) => {
    portIndex(solution, s.port, `${where}.sources[${i}].port`);
    if (typeof s.dbm !== "number" || !Number.isFinite(s.dbm)) throw new EngineInputError(`${where}.sources[${i}].dbm`, `power must be a finite number of dBm, got ${String(s.dbm)}`);
    return { port: s.port, dbm: s.dbm, watts: wattsFromDbm(s.dbm) };
  });

  // Per (frequency, block port): Σ|a_s|² and Σ|a_s|.
  const pInc = new Float64Array(nf * np);
  const aSum = new Float64Array(nf * np);
  // outgoing waves, for the blocks that state a compression point
  const pOut = new Float64Array(nf * np);
  const bSum = new Float64Array(nf * np);
  // every source's waves from one batched pass over the wave maps
  const incidents = sources.map((src) => {
    const m = solution.ports.indexOf(src.port);
    const incident = new Float64Array(2 * nf * nsp);
    const amp = Math.sqrt(src.watts);
    for (let k = 0; k < nf; k++) incident[2 * (k * nsp + m)] = amp;
    return incident;
  });
  for (const w of internalWavesMany(solution, incidents)) {
    for (let i = 0; i < nf * np; i++) {
      const m2 = w.a[2 * i] * w.a[2 * i] + w.a[2 * i + 1] * w.a[2 * i + 1];
      pInc[i] += m2;
      aSum[i] += Math.sqrt(m2);
      const o2 = w.b[2 * i] * w.b[2 * i] + w.b[2 * i + 1] * w.b[2 * i + 1];
      pOut[i] += o2;
      bSum[i] += Math.sqrt(o2);
    }
  }

  const basis: DriveResult["basis"] = opts.coherent ? "coherent" : "incoherent";
  const ports: DrivePortResult[] = [];
  for (let p = 0; p < np; p++) {
    const info = sys.blockPorts[p];
    let bi = 0, bc = 0, ki = ks[0], kc = ks[0];
    for (const k of ks) {
      const pi = pInc[k * np + p];
      const pc = aSum[k * np + p] * aSum[k * np + p];
      if (pi > bi) { bi = pi; ki = k; }
      if (pc > bc) { bc = pc; kc = k; }
    }
    const blockIdx = sys.blocks.findIndex((b) => b.id === info.block);
    const rating = sys.blocks[blockIdx]?.rating_dbm;
    const incoherentDbm = dbmFromWatts(bi);
    const coherentDbm = dbmFromWatts(bc);
    let margin: number | null = null;
    let verdict: Verdict | null = null;
    if (typeof rating === "number" && Number.isFinite(rating)) {
      margin = rating - (basis === "coherent" ? coherentDbm : incoherentDbm);
      verdict = margin < 0 ? "fail" : rating - coherentDbm < 0 ? "warn" : "pass";
    }
    ports.push({
      block: info.block,
      port: info.port,
      ratingDbm: typeof rating === "number" && Number.isFinite(rating) ? rating : null,
      incoherentDbm,
      incoherentHz: solution.frequencies[ki],
      coherentDbm,
      coherentHz: solution.frequencies[kc],
      margin,
      verdict,
    });
  }

  const blocks: DriveBlockResult[] = sys.blocks.map((b) => {
    const mine = ports.filter((p) => p.block === b.id);
    let w = mine[0];
    for (const p of mine) if (powerOf(p, basis) > powerOf(w, basis)) w = p;
    const rating = typeof b.rating_dbm === "number" && Number.isFinite(b.rating_dbm) ? b.rating_dbm : null;
    const worstDbm = w ? powerOf(w, basis) : dbmFromWatts(0);
    const rated = mine.filter((p) => p.verdict !== null);
    const verdict: Verdict | null = rating === null ? null : rated.some((p) => p.verdict === "fail") ? "fail" : rated.some((p) => p.verdict === "warn") ? "warn" : "pass";
    return {
      block: b.id,
      ratingDbm: rating,
      worstDbm,
      worstPort: w ? w.port : 0,
      worstHz: w ? (basis === "coherent" ? w.coherentHz : w.incoherentHz) : solution.frequencies[ks[0]],
      margin: rating === null ? null : rating - worstDbm,
      verdict,
    };
  });

  let worst: DriveResult["worst"] = null;
  let maxP: DrivePortResult | null = null;
  for (const p of ports) {
    if (!maxP || powerOf(p, basis) > powerOf(maxP, basis)) maxP = p;
    if (p.margin === null || p.ratingDbm === null) continue;
    if (!worst || p.margin < worst.margin) {
      worst = { block: p.block, port: p.port, dbm: powerOf(p, basis), hz: basis === "coherent" ? p.coherentHz : p.incoherentHz, ratingDbm: p.ratingDbm, margin: p.margin };
    }
  }

  const compression: DriveCompression[] = [];
  sys.blocks.forEach((b, bi) => {
    const p1 = sys.scenario.blocks[bi]?.id === b.id ? sys.scenario.blocks[bi].p1db_out_dbm : undefined;
    if (typeof p1 !== "number" || !Number.isFinite(p1)) return;
    const end = bi + 1 < sys.blocks.length ? sys.blockOffset[bi + 1] : np;
    let best = -1, bk = ks[0], bp = sys.blockOffset[bi];
    for (let p = sys.blockOffset[bi]; p < end; p++) {
      for (const k of ks) {
        const v = basis === "coherent" ? bSum[k * np + p] * bSum[k * np + p] : pOut[k * np + p];
        if (v > best) { best = v; bk = k; bp = p; }
      }
    }
    const outDbm = dbmFromWatts(best);
    compression.push({ block: b.id, port: sys.blockPorts[bp].port, outDbm, hz: solution.frequencies[bk], p1dbOutDbm: p1, marginDb: p1 - outDbm });
  });

  const messages: string[] = [];
  const rated = ports.filter((p) => p.verdict !== null);
  const compressed = compression.filter((c) => c.marginDb < 0);
  const verdict: Verdict = rated.some((p) => p.verdict === "fail") ? "fail" : rated.some((p) => p.verdict === "warn") || compressed.length > 0 ? "warn" : "pass";
  const srcText = sources.map((s) => `${s.port} ${s.dbm} dBm`).join(", ");
  if (worst) {
    messages.push(`drive (${srcText}, ${basis} sum): smallest margin ${worst.margin.toFixed(2)} dB at ${worst.block}:${worst.port}, ${worst.dbm.toFixed(2)} dBm against ${worst.ratingDbm} dBm at ${formatHz(worst.hz)}`);
  } else {
    messages.push(`drive (${srcText}): no block carries rating_dbm; highest incident power ${maxP ? powerOf(maxP, basis).toFixed(2) : "-"} dBm at ${maxP ? `${maxP.block}:${maxP.port}` : "-"}`);
  }
  for (const p of rated) {
    if (p.verdict === "fail") messages.push(`${p.block}:${p.port} takes ${powerOf(p, basis).toFixed(2)} dBm, above its ${p.ratingDbm} dBm rating by ${(-(p.margin as number)).toFixed(2)} dB`);
    else if (p.verdict === "warn") messages.push(`${p.block}:${p.port} stays within ${p.ratingDbm} dBm on the incoherent sum but the coherent worst case reaches ${p.coherentDbm.toFixed(2)} dBm`);
  }
  for (const c of compressed) {
    messages.push(`${c.block}:${c.port} puts out ${c.outDbm.toFixed(2)} dBm at ${formatHz(c.hz)}, past its P1dB (${c.p1dbOutDbm} dBm) by ${(-c.marginDb).toFixed(2)} dB: it compresses, and the linear figures overstate its output`);
  }
  return {
    verdict,
    basis,
    sources,
    points: ks.length,
    band: opts.band ? [opts.band[0], opts.band[1]] : null,
    ports,
    blocks,
    worst,
    maxDbm: maxP ? powerOf(maxP, basis) : dbmFromWatts(0),
    maxHz: maxP ? (basis === "coherent" ? maxP.coherentHz : maxP.incoherentHz) : solution.frequencies[ks[0]],
    compression,
    cautions: DRIVE_CAUTIONS,
    messages,
  };
}

function powerOf(p: DrivePortResult, basis: DriveResult["basis"]): number {
  return basis === "coherent" ? p.coherentDbm : p.incoherentDbm;
}
