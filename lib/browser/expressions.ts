/**
 * Parameter expressions with units, evaluated with a limited mathjs instance: "2.45 GHz",
 * "0.12 dB/m * 3 m", "L_feed * 2" with project variables. Each parameter field has a target quantity;
 * the result is converted to the unit the scenario stores (Hz, m, deg, dB, dB/m, dBm, Ω) or refused
 * with a message saying what was expected.
 *
 * dB and dBm are not mathjs units: they are defined here as two new base units, so that dB/m · m gives
 * dB and dB never mixes with dBm. A plain number is taken in the field's unit.
 */
import type { MathJsInstance } from "mathjs";
import { formatNumber, formatSi } from "./format";

/** What a parameter field holds, and so which units it accepts. */
export type Quantity = "dB" | "dB/m" | "dBm" | "Hz" | "m" | "deg" | "ohm" | "impedance" | "number" | "integer";

export type Evaluated =
  | { ok: true; value: number | [number, number]; display: string }
  | { ok: false; error: string };

export type VariableTable = Record<string, string | number>;

type Engine = { math: MathJsInstance; evaluate: (text: string, scope: Map<string, unknown>) => unknown };

let engine: Engine | undefined;
let mathjs: typeof import("mathjs") | undefined;
let loading: Promise<void> | undefined;
const listeners = new Set<() => void>();

/**
 * Load mathjs (a large module: a separate chunk, so that the workspace's first paint does not wait for
 * it). The workspace starts this right after its first render (useExpressionsReady); evaluation before
 * it has arrived answers "still loading" instead of a value.
 */
export function loadExpressions(): Promise<void> {
  loading ??= import("mathjs").then((module) => {
    mathjs = module;
    for (const listener of listeners) listener();
  });
  return loading;
}

/** Whether expressions can be evaluated now. */
export function expressionsReady(): boolean {
  return mathjs !== undefined;
}

/** Be told once mathjs has loaded (for useSyncExternalStore); returns the unsubscribe. */
export function subscribeExpressionsReady(listener: () => void): () => void {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

class ExpressionsLoading extends Error {
  constructor() {
    super("The expression reader is still loading; try again in a moment.");
  }
}

function getEngine(): Engine {
  if (engine) return engine;
  if (!mathjs) {
    void loadExpressions();
    throw new ExpressionsLoading();
  }
  const { all, create } = mathjs;
  const math = create(all, {});
  math.createUnit("dB");
  math.createUnit("dBm");
  const evaluate = math.evaluate.bind(math) as Engine["evaluate"];
  // Expressions may not reach the parser, unit creation or imports (mathjs security guidance).
  const refuse = (name: string) => () => {
    throw new Error(`${name} is not available in parameter expressions`);
  };
  math.import(
    {
      import: refuse("import"),
      createUnit: refuse("createUnit"),
      evaluate: refuse("evaluate"),
      parse: refuse("parse"),
      compile: refuse("compile"),
      simplify: refuse("simplify"),
      derivative: refuse("derivative"),
      resolve: refuse("resolve"),
      reviver: refuse("reviver"),
    },
    { override: true },
  );
  engine = { math, evaluate };
  return engine;
}

const UNIT_OF: Partial<Record<Quantity, string>> = {
  dB: "dB",
  "dB/m": "dB/m",
  dBm: "dBm",
  Hz: "Hz",
  m: "m",
  deg: "deg",
  ohm: "ohm",
  impedance: "ohm",
};

const NAMES: Record<Quantity, string> = {
  dB: "a level in dB",
  "dB/m": "a loss per length in dB/m",
  dBm: "a power in dBm (or W)",
  Hz: "a frequency (Hz)",
  m: "a length (m)",
  deg: "an angle (deg)",
  ohm: "a resistance (Ω)",
  impedance: "an impedance (Ω, complex allowed: 50 - 10i)",
  number: "a plain number",
  integer: "a whole number",
};

/** Which quantity a parameter holds, from its catalogue unit and, failing that, its name. */
export function quantityForParam(name: string, unit?: string, kind?: string): Quantity {
  if (kind === "integer") return "integer";
  if (name === "impedance" || kind === "impedance") return "impedance";
  const u = (unit ?? "").trim();
  if (u === "dB/m" || name.endsWith("_db_per_m")) return "dB/m";
  if (u === "dBm" || name.endsWith("_dbm")) return "dBm";
  if (u === "dB" || name.endsWith("_db")) return "dB";
  if (u === "Hz" || name.endsWith("_hz")) return "Hz";
  if (u === "m" || name.endsWith("_m")) return "m";
  if (u === "deg" || u === "°" || name.endsWith("_deg")) return "deg";
  if (u === "Ω" || u === "ohm") return "ohm";
  if (["order", "throws", "elements"].includes(name)) return "integer";
  return "number";
}

const IDENTIFIER = /^[A-Za-z_][A-Za-z0-9_]*$/;

/** Why `name` cannot be a variable name (null when it can). */
export function validateVariableName(name: string): string | null {
  if (!IDENTIFIER.test(name)) return "Use letters, digits and _ , starting with a letter or _.";
  if (!expressionsReady()) return new ExpressionsLoading().message;
  const { math } = getEngine();
  if (math.Unit.isValuelessUnit(name)) return `${name} is a unit name; choose another name.`;
  if (name in math) return `${name} is a function or constant name; choose another name.`;
  return null;
}

function prepareText(text: string): string {
  // Ω (Greek capital omega or the ohm sign) as a unit suffix, e.g. "1 kΩ"
  return text.replace(/[\u03A9\u2126]/g, "ohm");
}

/**
 * Resolves project variables (numbers or expressions that may use each other) into a mathjs scope.
 * Variables that cannot be evaluated, including cycles, are reported in `errors`.
 * @example resolveVariables({ L_feed: "0.35 m", L2: "2 * L_feed" }).scope.get("L2") // 0.7 m
 */
export function resolveVariables(variables: VariableTable = {}): { scope: Map<string, unknown>; errors: Record<string, string> } {
  const scope = new Map<string, unknown>();
  const errors: Record<string, string> = {};
  let pending = Object.entries(variables);
  // The workspace resolves the scope on its first render: without variables, building the mathjs
  // instance (about a tenth of a second of the page's start, tests/bench/pages.ts) waits for a first expression.
  if (pending.length === 0) return { scope, errors };
  if (!expressionsReady()) {
    void loadExpressions();
    for (const [name, raw] of pending) if (typeof raw === "number") scope.set(name, raw);
    for (const [name, raw] of pending) if (typeof raw !== "number") errors[name] = new ExpressionsLoading().message;
    return { scope, errors };
  }
  const { evaluate } = getEngine();
  for (const [name] of pending) {
    const bad = validateVariableName(name);
    if (bad) errors[name] = bad;
  }
  pending = pending.filter(([name]) => !errors[name]);
  const lastError: Record<string, string> = {};
  let progress = true;
  while (pending.length > 0 && progress) {
    progress = false;
    const still: [string, string | number][] = [];
    for (const [name, raw] of pending) {
      if (typeof raw === "number") {
        scope.set(name, raw);
        progress = true;
        continue;
      }
      try {
        const value = evaluate(prepareText(raw), new Map(scope));
        if (typeof value === "function" || value === undefined) throw new Error("expected a value");
        scope.set(name, value);
        progress = true;
      } catch (e) {
        lastError[name] = e instanceof Error ? e.message : String(e);
        still.push([name, raw]);
      }
    }
    pending = still;
  }
  for (const [name] of pending) {
    errors[name] = /Undefined symbol/.test(lastError[name] ?? "")
      ? `${lastError[name]} (or a cycle between variables)`
      : (lastError[name] ?? "cannot be evaluated");
  }
  return { scope, errors };
}

function fail(q: Quantity, detail?: string): Evaluated {
  return { ok: false, error: `Expected ${NAMES[q]}${detail ? `; ${detail}` : ""}.` };
}

function display(value: number, q: Quantity): string {
  switch (q) {
    case "Hz":
      return formatSi(value, "Hz", 6);
    case "m":
      return `${formatNumber(value, 6)} m`;
    case "number":
    case "integer":
      return formatNumber(value, 6);
    case "ohm":
    case "impedance":
      // a real impedance is still ohms: "= 75 Ω", never "= 75 impedance"
      return `${formatNumber(value, 6)} Ω`;
    case "deg":
      return `${formatNumber(value, 6)}°`;
    default:
      return `${formatNumber(value, 6)} ${q}`;
  }
}

function finishNumber(value: number, q: Quantity): Evaluated {
  if (!Number.isFinite(value)) return fail(q, "the result is not a finite number");
  if (q === "integer" && !Number.isInteger(value)) return fail(q, `got ${formatNumber(value, 6)}`);
  return { ok: true, value, display: display(value, q) };
}

/**
 * Evaluates `text` as quantity `q`, in the scope of resolved variables.
 * @returns the value in the stored unit (Hz, m, deg, dB, dB/m, dBm, Ω; impedance may be [re, im]) or an error
 * @example evaluateQuantity("2.45 GHz", "Hz") // { ok: true, value: 2.45e9, display: "2.45 GHz" }
 * @example evaluateQuantity("0.12 dB/m * 3 m", "dB") // { ok: true, value: 0.36, … }
 */
export function evaluateQuantity(text: string, q: Quantity, scope: Map<string, unknown> = new Map()): Evaluated {
  const source = text.trim();
  if (source.length === 0) return { ok: false, error: "Enter a value." };
  if (!expressionsReady()) {
    void loadExpressions();
    return { ok: false, error: new ExpressionsLoading().message };
  }
  const { math, evaluate } = getEngine();
  let result: unknown;
  try {
    result = evaluate(prepareText(source), new Map(scope));
  } catch (e) {
    return { ok: false, error: e instanceof Error ? e.message : String(e) };
  }
  if (typeof result === "number") return finishNumber(result, q);
  if (math.isComplex(result)) {
    const c = result as unknown as { re: number; im: number };
    if (q !== "impedance") return fail(q, "got a complex number");
    if (!Number.isFinite(c.re) || !Number.isFinite(c.im)) return fail(q, "the result is not finite");
    if (c.im === 0) return finishNumber(c.re, q);
    return { ok: true, value: [c.re, c.im], display: `${formatNumber(c.re, 6)} ${c.im < 0 ? "−" : "+"} j${formatNumber(Math.abs(c.im), 6)} Ω` };
  }
  if (math.isUnit(result)) {
    const u = result as unknown as import("mathjs").Unit;
    if (q === "dBm" && u.equalBase(math.unit("W"))) {
      const watts = u.toNumber("W");
      if (!(watts > 0)) return fail(q, "a power in W must be positive");
      return finishNumber(10 * Math.log10(watts / 1e-3), q);
    }
    const target = UNIT_OF[q];
    if (!target) return fail(q, `got a value in ${u.formatUnits()}`);
    if (!u.equalBase(math.unit(target))) return fail(q, `got a value in ${u.formatUnits()}`);
    try {
      // 15 significant digits drop the conversion noise (35 cm → 0.35, not 0.35000000000000003)
      return finishNumber(Number(u.toNumber(target).toPrecision(15)), q);
    } catch (e) {
      return { ok: false, error: e instanceof Error ? e.message : String(e) };
    }
  }
  if (math.isBigNumber(result) || math.isFraction(result)) return finishNumber(Number(result), q);
  return fail(q, "the expression does not give a value");
}

/**
 * Re-evaluates every stored expression (`block.expr`) against the scenario's variables, e.g. after a
 * variable changed. Parameters whose expression no longer evaluates keep their last number and are
 * reported in `errors` by block id and parameter name. `rating_dbm` is kept on the block, not in params.
 */
export function reevaluateExpressions(scenario: import("@/engine/types").Scenario): {
  scenario: import("@/engine/types").Scenario;
  errors: Record<string, Record<string, string>>;
} {
  const { scope } = resolveVariables(scenario.variables);
  const errors: Record<string, Record<string, string>> = {};
  let changed = false;
  const blocks = scenario.blocks.map((block) => {
    const expr = (block as { expr?: Record<string, string> }).expr;
    if (!expr) return block;
    let next = block;
    for (const [name, text] of Object.entries(expr)) {
      const result = evaluateQuantity(text, name === "rating_dbm" ? "dBm" : quantityForParam(name), scope);
      if (!result.ok) {
        (errors[block.id] ??= {})[name] = result.error;
        continue;
      }
      const current = name === "rating_dbm" ? next.rating_dbm : next.params?.[name];
      if (JSON.stringify(current) === JSON.stringify(result.value)) continue;
      changed = true;
      next =
        name === "rating_dbm" && typeof result.value === "number"
          ? { ...next, rating_dbm: result.value }
          : { ...next, params: { ...next.params, [name]: result.value } };
    }
    return next;
  });
  return { scenario: changed ? { ...scenario, blocks } : scenario, errors };
}
