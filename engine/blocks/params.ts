/**
 * Reading and validating block parameters against the catalogue's declarations.
 *
 * Every error names the block, the parameter and what was expected, so that a person can fix the
 * scenario file without reading the engine.
 */
import { EngineInputError } from "../types";

/** Units of block parameters as shown in the inspector. */
export type ParamUnit = "dB" | "dB/m" | "deg" | "Hz" | "m" | "Ω" | "K" | "";

/** How a parameter is entered. `complex` is `[re, im]` (a plain number means `[re, 0]`). */
export type ParamKind = "number" | "enum" | "integer" | "complex";

/** Declaration of one block parameter (BLOCK_CATALOGUE). */
export type ParamInfo = {
  name: string;
  label: string;
  unit: ParamUnit;
  kind: ParamKind;
  /** value used when an optional parameter is omitted; `null` means ∞ (ideal) */
  default?: unknown;
  /** the parameter must be present (it may still be `null` when `infinite` is set) */
  required: boolean;
  min?: number;
  max?: number;
  /** `min` itself is not allowed (for example coupling_db > 0) */
  minExclusive?: boolean;
  options?: string[];
  /** `null` or `Infinity` is accepted and means ∞ dB (ideal) */
  infinite?: boolean;
  /** a sensible starting value for a new block (required parameters only) */
  suggested?: unknown;
  help: string;
};

function describe(info: ParamInfo): string {
  if (info.kind === "enum") return `one of ${(info.options ?? []).map((o) => `"${o}"`).join(", ")}`;
  const unit = info.unit === "" ? "" : ` ${info.unit}`;
  const what = info.kind === "integer" ? "an integer" : info.kind === "complex" ? `[re, im] in${unit || " Ω"}` : `a number${unit ? ` in${unit}` : ""}`;
  const range: string[] = [];
  if (info.min !== undefined) range.push(`${info.kind === "complex" ? "re " : ""}${info.minExclusive ? ">" : "≥"} ${info.min}`);
  if (info.max !== undefined) range.push(`≤ ${info.max}`);
  const inf = info.infinite ? " (or null for ∞)" : "";
  return `${what}${range.length ? ` ${range.join(" and ")}` : ""}${inf}`;
}

function show(v: unknown): string {
  if (typeof v === "string") return JSON.stringify(v);
  if (typeof v === "number") return String(v);
  try {
    return JSON.stringify(v) ?? String(v);
  } catch {
    return String(v);
  }
}

/**
 * Validated access to one block's parameters. Construction rejects unknown parameter names.
 *
 * @example
 * const r = new ParamReader("PAD", "attenuator", { loss_db: 6 }, BLOCK_CATALOGUE.attenuator.params);
 * r.number("loss_db"); // 6
 */
export class ParamReader {
  readonly blockId: string;
  readonly kind: string;
  private readonly params: Record<string, unknown>;
  private readonly infos: Map<string, ParamInfo>;

  constructor(blockId: string, kind: string, params: Record<string, unknown> | undefined, infos: readonly ParamInfo[]) {
    this.blockId = blockId;
    this.kind = kind;
    this.params = params ?? {};
    this.infos = new Map(infos.map((p) => [p.name, p]));
    if (typeof this.params !== "object" || Array.isArray(this.params)) {
      throw new EngineInputError(`block ${blockId}, params`, "expected an object of named parameters");
    }
    for (const name of Object.keys(this.params)) {
      if (this.infos.has(name)) continue;
      const known = infos.map((p) => p.name);
      const hint = name === "state" && kind === "switch" ? "; the selected throw goes on the block as \"state\", not in params" : "";
      throw new EngineInputError(
        this.where(name),
        `unknown parameter for a ${kind} block${hint}; expected ${known.length ? known.join(", ") : "no parameters"}`,
      );
    }
  }

  /** "block ID, parameter NAME", the `where` of every error about that parameter. */
  where(name: string): string {
    return `block ${this.blockId}, parameter ${name}`;
  }

  /** Whether the parameter was given (not undefined; null counts as given). */
  has(name: string): boolean {
    return this.params[name] !== undefined;
  }

  /** An error about one parameter. */
  error(name: string, message: string): EngineInputError {
    return new EngineInputError(this.where(name), message);
  }

  private info(name: string): ParamInfo {
    const info = this.infos.get(name);
    if (!info) throw new Error(`internal: parameter ${name} is not declared for ${this.kind}`);
    return info;
  }

  private missing(info: ParamInfo): EngineInputError {
    return this.error(info.name, `required; expected ${describe(info)}`);
  }

  private checkRange(info: ParamInfo, v: number, raw: unknown): void {
    const low = info.min !== undefined && (info.minExclusive ? v <= info.min : v < info.min);
    const high = info.max !== undefined && v > info.max;
    if (low || high) throw this.error(info.name, `expected ${describe(info)}, got ${show(raw)}`);
  }

  /**
   * A number parameter. Returns the default when omitted (Infinity for a `null` default of an
   * `infinite` parameter), `undefined` when omitted without a default.
   */
  numberOrUndefined(name: string): number | undefined {
    const info = this.info(name);
    const raw = this.params[name];
    if (raw === undefined || (raw === null && !info.infinite)) {
      if (info.required) throw this.missing(info);
      if (info.default === undefined) return undefined;
      if (info.default === null) return Infinity;
      return info.default as number;
    }
    if (raw === null) return Infinity;
    if (typeof raw !== "number" || Number.isNaN(raw)) throw this.error(name, `expected ${describe(info)}, got ${show(raw)}`);
    if (raw === Infinity && info.infinite) return Infinity;
    if (!Number.isFinite(raw)) throw this.error(name, `expected ${describe(info)}, got ${show(raw)}`);
    if (info.kind === "integer" && !Number.isInteger(raw)) throw this.error(name, `expected ${describe(info)}, got ${show(raw)}`);
    this.checkRange(info, raw, raw);
    return raw;
  }

  /** A number parameter that must resolve to a value (required, or optional with a default). */
  number(name: string): number {
    const v = this.numberOrUndefined(name);
    if (v === undefined) throw this.missing(this.info(name));
    return v;
  }

  /** An enum parameter (string from `options`). */
  choice<T extends string>(name: string): T {
    const info = this.info(name);
    const raw = this.params[name];
    if (raw === undefined || raw === null) {
      if (info.required || info.default === undefined) throw this.missing(info);
      return info.default as T;
    }
    if (typeof raw !== "string" || !(info.options ?? []).includes(raw)) {
      throw this.error(name, `expected ${describe(info)}, got ${show(raw)}`);
    }
    return raw as T;
  }

  /** A complex parameter `[re, im]` (a plain number is `[re, 0]`), or undefined when omitted. */
  complexOrUndefined(name: string): [number, number] | undefined {
    const info = this.info(name);
    const raw = this.params[name];
    if (raw === undefined || raw === null) {
      if (info.required) throw this.missing(info);
      return undefined;
    }
    let re: unknown;
    let im: unknown;
    if (typeof raw === "number") {
      re = raw;
      im = 0;
    } else if (Array.isArray(raw) && raw.length === 2) {
      [re, im] = raw;
    } else {
      throw this.error(name, `expected ${describe(info)}, got ${show(raw)}`);
    }
    if (typeof re !== "number" || typeof im !== "number" || !Number.isFinite(re) || !Number.isFinite(im)) {
      throw this.error(name, `expected ${describe(info)} with finite numbers, got ${show(raw)}`);
    }
    this.checkRange(info, re, raw);
    return [re, im];
  }
}

/**
 * 10^(−dB/20): the amplitude of a loss, isolation or return loss in dB (∞ dB → 0).
 *
 * @example
 * dbToAmplitude(20); // 0.1
 */
export function dbToAmplitude(db: number): number {
  return db === Infinity ? 0 : Math.pow(10, -db / 20);
}
