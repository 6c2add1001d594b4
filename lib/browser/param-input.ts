/**
 * From the text of one inspector field to the value stored in a block's params: expression evaluation
 * (expressions.ts) plus the catalogue's rules for the parameter (required, range, ∞ allowed).
 */
import type { ParamInfo } from "@/engine/blocks/params";
import { evaluateQuantity, quantityForParam, type Quantity } from "./expressions";
import { formatNumber } from "./format";

export type ParamInput =
  /** `value` undefined means: leave the parameter out (the model's default applies) */
  | { ok: true; value: number | [number, number] | string | null | undefined; display: string }
  | { ok: false; error: string };

const INFINITY_TEXT = /^(∞|inf|infinity|ideal)$/i;

/** Quantity of a catalogue parameter. */
export function paramQuantity(info: ParamInfo): Quantity {
  if (info.kind === "complex") return "impedance";
  if (info.kind === "integer") return "integer";
  return quantityForParam(info.name, info.unit, info.kind);
}

function checkRange(info: ParamInfo, x: number): string | null {
  if (info.min !== undefined) {
    if (info.minExclusive ? !(x > info.min) : !(x >= info.min)) {
      return `Must be ${info.minExclusive ? "greater than" : "at least"} ${formatNumber(info.min)}${info.unit ? ` ${info.unit}` : ""}.`;
    }
  }
  if (info.max !== undefined && x > info.max) return `Must be at most ${formatNumber(info.max)}${info.unit ? ` ${info.unit}` : ""}.`;
  return null;
}

/**
 * Reads one field.
 * @example readParamInput(lossInfo, "0.12 dB/m * 3 m", scope) // { ok: true, value: 0.36, display: "0.36 dB" }
 */
export function readParamInput(info: ParamInfo, text: string, scope: Map<string, unknown>): ParamInput {
  const source = text.trim();
  if (info.kind === "enum") {
    if (source === "") return info.required ? { ok: false, error: "Choose a value." } : { ok: true, value: undefined, display: "default" };
    if (!(info.options ?? []).includes(source)) return { ok: false, error: `Choose one of ${(info.options ?? []).join(", ")}.` };
    return { ok: true, value: source, display: source };
  }
  if (source === "") {
    return info.required ? { ok: false, error: "Required." } : { ok: true, value: undefined, display: "default" };
  }
  if (INFINITY_TEXT.test(source)) {
    return info.infinite ? { ok: true, value: null, display: "∞" } : { ok: false, error: "∞ is not allowed here." };
  }
  const result = evaluateQuantity(source, paramQuantity(info), scope);
  if (!result.ok) return result;
  const x = Array.isArray(result.value) ? result.value[0] : result.value;
  const bad = checkRange(info, x);
  if (bad) return { ok: false, error: bad };
  return result;
}

/** The text a field starts with for a stored value (when no expression text was kept). */
export function valueToText(value: unknown): string {
  if (value === undefined) return "";
  if (value === null) return "∞";
  if (typeof value === "number") return String(value);
  if (Array.isArray(value) && value.length === 2) {
    const [re, im] = value as number[];
    return im === 0 ? String(re) : `${re} ${im < 0 ? "-" : "+"} ${Math.abs(im)}i`;
  }
  return String(value);
}
