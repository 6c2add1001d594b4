import type { LedgerResult } from "@/engine/checks";

/** One row of the ledger as people read it: relative to the power that actually entered the port. */
export type LedgerShare = {
  label: string;
  role: string;
  /** fraction of the 1 W incident wave (what the engine reports) */
  ofIncident: number;
  /** fraction of the power entering the port (incident − reflected); null for the reflected row itself */
  ofEntering: number | null;
  /** 10·log10(|share|) against the entering power (against the incident power for the reflected row) */
  db: number;
};

/** The power that enters the driven port, as a fraction of the incident wave: 1 − |S_mm|². */
export function enteringFraction(result: LedgerResult, k: number): number {
  return 1 - result.reflected[k];
}

function toDb(x: number): number {
  return x > 0 ? 10 * Math.log10(x) : -Infinity;
}

/**
 * The ledger's shares at plan point k, largest first. A percentage of 1 W incident means nothing to a
 * reader when the port reflects most of it or an amplifier adds power, so every share after the
 * reflection is given against the power that entered (the reflection against the incident wave).
 */
export function ledgerShares(result: LedgerResult, k: number): LedgerShare[] {
  const entering = enteringFraction(result, k);
  const rel = (f: number) => (entering > 1e-15 ? f / entering : null);
  const row = (label: string, role: string, f: number): LedgerShare => {
    const r = rel(f);
    return { label, role, ofIncident: f, ofEntering: r, db: toDb(Math.abs(r ?? f)) };
  };
  const rows: LedgerShare[] = [];
  for (const o of result.outputs) rows.push(row(`out of ${o.port}`, "output", o.fraction[k]));
  for (const b of result.blocks) rows.push(row(`${b.block} (${b.role})`, b.role, b.fraction[k]));
  for (const t of result.terminations) rows.push(row(`open port ${t.block}:${t.port}`, "termination", t.fraction[k]));
  rows.sort((a, b) => Math.abs(b.ofIncident) - Math.abs(a.ofIncident));
  const reflected = result.reflected[k];
  return [{ label: `reflected at ${result.port}`, role: "reflected", ofIncident: reflected, ofEntering: null, db: toDb(reflected) }, ...rows];
}

/** Watts with a sensible number of digits for a 1 W reference ("0.316 W", "3.2e-7 W"). */
function watts(x: number): string {
  const a = Math.abs(x);
  if (a === 0) return "0 W";
  if (a >= 1e-3 && a < 1e4) return `${x.toPrecision(3)} W`;
  return `${x.toExponential(1)} W`;
}

/**
 * The closure at plan point k as an energy balance in words: 1 W in = reflected + out + absorbed − added,
 * and what is left over. Added power (a negative block share) is named as such.
 */
export function describeBalance(result: LedgerResult, k: number): string {
  const reflected = result.reflected[k];
  const out = result.outputs.reduce((s, o) => s + o.fraction[k], 0);
  let absorbed = 0;
  let added = 0;
  for (const b of result.blocks) {
    const f = b.fraction[k];
    if (f >= 0) absorbed += f;
    else added += -f;
  }
  for (const t of result.terminations) absorbed += t.fraction[k];
  const residual = result.closure[k];
  const parts = [`${watts(reflected)} reflected`, `${watts(out)} out of the other system ports`, `${watts(absorbed)} absorbed in blocks and open ports`];
  const sum = added > 0 ? `${parts.join(" + ")} − ${watts(added)} added by active blocks` : parts.join(" + ");
  const balanced = Math.abs(residual) <= result.tolerance;
  const left = balanced ? `the books balance (left over ${residual === 0 ? "0" : Math.abs(residual).toExponential(1)} W)` : `${Math.abs(residual).toExponential(1)} W is unaccounted for, more than the ${result.tolerance.toExponential(0)} W tolerance`;
  return `1 W incident at ${result.port} = ${sum}; ${left}.`;
}
