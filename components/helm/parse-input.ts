import { evaluateQuantity } from "@/lib/browser/expressions";
import { formatHz } from "@/engine/format";

export type Parsed<T> = { ok: true; value: T } | { ok: false; error: string };

const UNIT_TAIL = /([a-zA-Z]+)\s*$/;

/** A frequency such as "2.45 GHz", "2450 MHz" or "2.45e9" (Hz). */
export function parseFrequency(text: string): Parsed<number> {
  const r = evaluateQuantity(text, "Hz");
  if (!r.ok) return { ok: false, error: r.error };
  if (typeof r.value !== "number" || !(r.value > 0)) return { ok: false, error: "A frequency must be above 0 Hz." };
  return { ok: true, value: r.value };
}

/**
 * A band "2.4 GHz to 2.48 GHz", "2.4–2.48 GHz", "2.4 - 2.48 GHz" or "2.4e9, 2.48e9": two frequencies; a
 * unit written once at the end applies to both.
 */
export function parseBand(text: string): Parsed<[number, number]> {
  const parts = text.split(/\s*(?:–|—|\bto\b|\.\.|,|\s-\s)\s*/).filter((p) => p.trim() !== "");
  if (parts.length !== 2) return { ok: false, error: "Give two frequencies, e.g. 2.4 GHz to 2.48 GHz." };
  const hi = parts[1];
  let lo = parts[0];
  const unit = hi.match(UNIT_TAIL)?.[1];
  if (unit && !UNIT_TAIL.test(lo)) lo = `${lo} ${unit}`;
  const a = parseFrequency(lo);
  if (!a.ok) return { ok: false, error: `Lower edge: ${a.error}` };
  const b = parseFrequency(hi);
  if (!b.ok) return { ok: false, error: `Upper edge: ${b.error}` };
  if (b.value < a.value) return { ok: false, error: "The upper edge is below the lower edge." };
  return { ok: true, value: [a.value, b.value] };
}

/** A level in dB, e.g. "30" or "30 dB". */
export function parseDb(text: string): Parsed<number> {
  const r = evaluateQuantity(text.replace(/\s*dB\s*$/i, ""), "number");
  if (!r.ok || typeof r.value !== "number") return { ok: false, error: r.ok ? "Enter a number of dB." : r.error };
  return { ok: true, value: r.value };
}

/** Source powers "TX 30 dBm, ANT-A 10 dBm" (or "TX 1 W"): port names with powers, in dBm. */
/** `ports` null accepts any port name (the rules form: rules name ports of scenarios not yet made). */
export function parseSources(text: string, ports: readonly string[] | null): Parsed<{ port: string; dbm: number }[]> {
  const items = text.split(/\s*[,;]\s*/).filter((s) => s.trim() !== "");
  if (items.length === 0) return { ok: false, error: "Give at least one source, e.g. TX 30 dBm." };
  const out: { port: string; dbm: number }[] = [];
  for (const item of items) {
    const m = item.trim().match(/^(\S+)\s+(.+)$/);
    if (!m) return { ok: false, error: `"${item}": write a port name, then its power.` };
    const [, port, power] = m;
    if (ports && !ports.includes(port)) return { ok: false, error: `"${port}" is not a system port (${ports.join(", ")}).` };
    // a bare number or "30 dBm" is dBm; "1 W" or "500 mW" converts
    const r = evaluateQuantity(power.replace(/\s*dBm\s*$/i, ""), "dBm");
    if (!r.ok || typeof r.value !== "number") return { ok: false, error: `"${item}": ${r.ok ? "not a power" : r.error}` };
    out.push({ port, dbm: r.value });
  }
  return { ok: true, value: out };
}

/** A band as people write it: "2.4 GHz to 2.48 GHz". */
export function formatBand([lo, hi]: readonly [number, number]): string {
  return `${formatHz(lo)} to ${formatHz(hi)}`;
}
