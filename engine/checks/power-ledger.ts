// Power ledger: where the power entering one system port goes, from the internal power waves
// (Kurokawa 1965): a block absorbs Σ_ports(|a|² − |b|²); closure = Σ entries − 1.
import type { InternalWaves, Solution } from "../types";
import { internalWaves, internalWavesMany } from "../network";
import { bandIndices, formatHz, portIndex } from "./band";
import type { Verdict } from "./types";

/** Closure tolerance (relative to the largest entry, at least 1): passive systems close to 1e-9. */
export const LEDGER_TOLERANCE = 1e-9;
/** Above this (relative) closure error the ledger fails; between the two it warns. */
export const LEDGER_FAIL_TOLERANCE = 1e-6;

export type LedgerBlockEntry = {
  block: string;
  kind: string;
  /** "radiated" for antennas and arrays, "added" for amplifiers (and measured data that adds power), else "absorbed" */
  role: "absorbed" | "radiated" | "added";
  /** net power taken by the block, Σ(|a|² − |b|²), as a fraction of the incident power; negative = added */
  fraction: number[];
};

export type LedgerResult = {
  port: string;
  verdict: Verdict;
  frequenciesHz: number[];
  /** |S_mm|²: fraction reflected back out of the driven port */
  reflected: number[];
  /** |S_jm|² for every other system port j */
  outputs: { port: string; fraction: number[] }[];
  blocks: LedgerBlockEntry[];
  /** block ports left open (matched terminations) and the fraction each absorbs, |b|² */
  terminations: { block: string; port: number; fraction: number[] }[];
  /** Σ of all entries − 1 at each frequency (0 for exact bookkeeping) */
  closure: number[];
  worstClosure: number;
  worstClosureHz: number;
  /** closure tolerance actually applied (LEDGER_TOLERANCE × scale of the entries) */
  tolerance: number;
  messages: string[];
};

/**
 * Power ledger for a unit incident wave (1 W) at one system port, the other system ports matched in their
 * own Z0: reflected, out of each other port, absorbed (or radiated, or added) in each block, absorbed in
 * each open block port; and the closure Σ − 1.
 *
 * @param solution solved composite
 * @param port driven system port name
 * @param band optional [lo, hi] Hz; default every plan point
 * @returns fractions per frequency (plain arrays); verdict "pass" when |closure| ≤ 1e-9 × max(1, Σ|entries|),
 *   "warn" up to 1e-6, else "fail" (inconsistent internal waves)
 * @throws EngineInputError for an unknown port or an empty band
 * @example powerLedger(sol, "TX").blocks.find((b) => b.block === "PAD")?.fraction[0] // 0.75 for a matched 6 dB pad
 */
export function powerLedger(solution: Solution, port: string, band?: [number, number]): LedgerResult {
  const m = portIndex(solution, port, "ledger.port");
  const ks = band ? bandIndices(solution.frequencies, band, "ledger.band") : Array.from({ length: solution.frequencies.length }, (_, k) => k);
  return ledgerFromWaves(solution, port, m, ks, internalWaves(solution, unitIncident(solution, m)));
}

/**
 * powerLedger for several driven ports at once: the internal waves of every excitation come from one
 * batched pass over the solver's wave maps (internalWavesMany), cheaper than one internalWaves per port.
 * Each result equals powerLedger(solution, port, band).
 *
 * @param solution solved composite
 * @param ports driven system port names (default: every system port, in solution order)
 * @param band optional [lo, hi] Hz; default every plan point
 * @returns one LedgerResult per port, in the order given
 * @throws EngineInputError for an unknown port or an empty band
 * @example powerLedgers(sol).map((l) => l.verdict) // ["pass", "pass"]
 */
export function powerLedgers(solution: Solution, ports: string[] = solution.ports, band?: [number, number]): LedgerResult[] {
  const ms = ports.map((p) => portIndex(solution, p, "ledger.port"));
  const ks = band ? bandIndices(solution.frequencies, band, "ledger.band") : Array.from({ length: solution.frequencies.length }, (_, k) => k);
  const waves = internalWavesMany(solution, ms.map((m) => unitIncident(solution, m)));
  return ports.map((p, i) => ledgerFromWaves(solution, p, ms[i], ks, waves[i]));
}

/** A unit incident wave (1 √W) at system port m at every frequency, zero elsewhere. */
function unitIncident(solution: Solution, m: number): Float64Array {
  const nf = solution.frequencies.length;
  const nsp = solution.ports.length;
  const incident = new Float64Array(2 * nf * nsp);
  for (let k = 0; k < nf; k++) incident[2 * (k * nsp + m)] = 1;
  return incident;
}

function ledgerFromWaves(solution: Solution, port: string, m: number, ks: number[], w: InternalWaves): LedgerResult {
  const sys = solution.system;
  const nsp = solution.ports.length;
  const np = sys.blockPorts.length;
  const s = solution.s;

  const sq = (d: Float64Array, o: number) => d[o] * d[o] + d[o + 1] * d[o + 1];
  const reflected = ks.map((k) => sq(s.data, 2 * ((k * nsp + m) * nsp + m)));
  const outputs = solution.ports
    .map((name, j) => ({ name, j }))
    .filter(({ j }) => j !== m)
    .map(({ name, j }) => ({ port: name, fraction: ks.map((k) => sq(s.data, 2 * ((k * nsp + j) * nsp + m))) }));
  const blocks: LedgerBlockEntry[] = sys.blocks.map((b, bi) => {
    const off = sys.blockOffset[bi];
    const n = b.s.n;
    const fraction = ks.map((k) => {
      let acc = 0;
      for (let p = off; p < off + n; p++) acc += sq(w.a, 2 * (k * np + p)) - sq(w.b, 2 * (k * np + p));
      return acc;
    });
    // Measured data carries no passivity trait: it reads "added" only where it actually adds power.
    const adds = b.kind === "touchstone" ? fraction.some((x) => x < -LEDGER_TOLERANCE) : !b.traits.passive;
    const role: LedgerBlockEntry["role"] = b.traits.radiates ? "radiated" : adds ? "added" : "absorbed";
    return { block: b.id, kind: b.kind, role, fraction };
  });
  const terminations = sys.unterminated.map((p) => ({
    block: sys.blockPorts[p].block,
    port: sys.blockPorts[p].port,
    fraction: ks.map((k) => sq(w.b, 2 * (k * np + p))),
  }));

  const closure: number[] = [];
  let worst = 0, worstQ = 0, scale = 1;
  for (let q = 0; q < ks.length; q++) {
    let sum = reflected[q], mag = reflected[q];
    for (const o of outputs) { sum += o.fraction[q]; mag += Math.abs(o.fraction[q]); }
    for (const b of blocks) { sum += b.fraction[q]; mag += Math.abs(b.fraction[q]); }
    for (const t of terminations) { sum += t.fraction[q]; mag += t.fraction[q]; }
    const c = sum - 1;
    closure.push(c);
    scale = Math.max(scale, mag);
    if (!(Math.abs(c) <= Math.abs(worst))) { worst = c; worstQ = q; }
  }
  const tolerance = LEDGER_TOLERANCE * scale;
  const a = Math.abs(worst);
  const verdict: Verdict = a <= tolerance ? "pass" : a <= LEDGER_FAIL_TOLERANCE * scale ? "warn" : "fail";
  const worstHz = solution.frequencies[ks[worstQ]];
  const messages = [
    `ledger ${port}: closure ${worst.toExponential(2)} at ${formatHz(worstHz)} over ${ks.length} points (tolerance ${tolerance.toExponential(1)})`,
  ];
  if (verdict !== "pass") messages.push(`ledger ${port}: the power entering does not balance the power leaving and absorbed; the internal waves are inconsistent`);
  return {
    port,
    verdict,
    frequenciesHz: ks.map((k) => solution.frequencies[k]),
    reflected,
    outputs,
    blocks,
    terminations,
    closure,
    worstClosure: worst,
    worstClosureHz: worstHz,
    tolerance,
    messages,
  };
}
