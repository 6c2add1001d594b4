// Saved rules (isolation, match, insertion loss, drive) evaluated at every plan point inside the band;
// worst value, its frequency and the margin (positive = met).
import { EngineInputError } from "../types";
import type { RuleSpec, SData, Solution } from "../types";
import { lineup } from "../lineup/lineup";
import { noiseFigure, systemNoise } from "../noise";
import { bandIndices, formatHz, portIndex } from "./band";
import { db20, gammaFromVswr, returnLossDb, vswrFromGamma } from "./conversions";
import { driveCheck } from "./drive";
import type { RuleResult, Verdict } from "./types";

/**
 * Name of a rule in messages and errors: its id, or its place in the scenario.
 * @example ruleName({ kind: "match", port: "A", band: [1e9, 2e9], max_vswr: 2 }, 3) // "rules[3]"
 */
export function ruleName(rule: RuleSpec, index: number): string {
  return rule.id ? `rule "${rule.id}"` : `rules[${index}]`;
}

/** |S_ij| at plan index k of a composite. */
function mag(sol: Solution, k: number, i: number, j: number): number {
  const n = sol.s.n;
  const o = 2 * ((k * n + i) * n + j);
  return Math.hypot(sol.s.data[o], sol.s.data[o + 1]);
}

function requireFinite(x: unknown, where: string, what: string): number {
  if (typeof x !== "number" || !Number.isFinite(x)) throw new EngineInputError(where, `${what} must be a finite number, got ${String(x)}`);
  return x;
}

/**
 * Evaluates one rule on a solved composite.
 *
 * - isolation: −20·log10|S_to,from| (and |S_from,to| unless `one_way`), worst = lowest, margin = worst − min_db;
 * - match: return loss −20·log10|S_pp| against the stricter of min_return_loss_db and the return loss of
 *   max_vswr, worst = lowest, margin = worst − limit (dB); `extra.worstVswr` gives the worst VSWR;
 * - insertion_loss: −20·log10|S_to,from|, worst = highest, margin = max_db − worst;
 * - drive: the drive check (see driveCheck), worst = highest incident power against its rating;
 * - noise_figure: NF from `from` to `to` (systemNoise, noiseFigure), worst = highest, margin = max_db − worst;
 * - gain: transducer gain 20·log10|S_to,from|, margin the smaller of value − min_db and max_db − value,
 *   worst = the value with the smallest margin;
 * - headroom: the line-up from `from` to `to` for `input_dbm` (lineup), per plan point the least headroom
 *   over the stages with a P1dB, worst = lowest, margin = worst − min_db.
 *
 * @param solution solved composite (ports named as in the scenario)
 * @param rule the rule
 * @param index its position in scenario.rules (for names in messages)
 * @returns a RuleResult; verdict "pass" when margin ≥ 0
 * @throws EngineInputError naming the rule for unknown ports, empty or reversed bands, missing limits
 * @example evaluateRule(sol, { kind: "isolation", from: "TX", to: "RX", band: [2.4e9, 2.48e9], min_db: 45 }, 0)
 */
export function evaluateRule(solution: Solution, rule: RuleSpec, index: number, ctx: RuleContext = {}): RuleResult {
  const name = ruleName(rule, index);
  const id = rule.id ?? `rules[${index}]`;
  if (rule.kind === "drive") return evaluateDriveRule(solution, rule, index, id, name);
  if (rule.kind === "headroom") return evaluateHeadroomRule(solution, rule, index, id, name, ctx);
  const band = rule.band;
  if (!Array.isArray(band) || band.length !== 2) throw new EngineInputError(name, "band must be [start, stop] in Hz");
  const ks = bandIndices(solution.frequencies, band, name);
  const freqs = ks.map((k) => solution.frequencies[k]);
  const values: number[] = new Array(ks.length);
  const messages: string[] = [];

  if (rule.kind === "isolation") {
    const limit = requireFinite(rule.min_db, name, "min_db");
    const from = portIndex(solution, rule.from, `${name}.from`);
    const to = portIndex(solution, rule.to, `${name}.to`);
    if (from === to) throw new EngineInputError(name, `isolation needs two different ports, got "${rule.from}" twice`);
    const dirs: string[] = new Array(ks.length);
    for (let q = 0; q < ks.length; q++) {
      const fwd = -db20(mag(solution, ks[q], to, from));
      const rev = rule.one_way ? Infinity : -db20(mag(solution, ks[q], from, to));
      values[q] = Math.min(fwd, rev);
      dirs[q] = rev < fwd ? `${rule.to}→${rule.from}` : `${rule.from}→${rule.to}`;
    }
    const q = argWorst(values, "min");
    return finish({ id, index, kind: rule.kind, quantity: "isolation", unit: "dB", worst: values[q], worstHz: freqs[q], limit, margin: values[q] - limit, direction: dirs[q], points: ks.length, frequenciesHz: freqs, values, messages }, name);
  }

  if (rule.kind === "insertion_loss") {
    const limit = requireFinite(rule.max_db, name, "max_db");
    const from = portIndex(solution, rule.from, `${name}.from`);
    const to = portIndex(solution, rule.to, `${name}.to`);
    if (from === to) throw new EngineInputError(name, `insertion loss needs two different ports, got "${rule.from}" twice`);
    for (let q = 0; q < ks.length; q++) values[q] = -db20(mag(solution, ks[q], to, from));
    const q = argWorst(values, "max");
    return finish({ id, index, kind: rule.kind, quantity: "insertion loss", unit: "dB", worst: values[q], worstHz: freqs[q], limit, margin: limit - values[q], direction: `${rule.from}→${rule.to}`, points: ks.length, frequenciesHz: freqs, values, messages }, name);
  }

  if (rule.kind === "match") {
    const p = portIndex(solution, rule.port, `${name}.port`);
    const hasRl = rule.min_return_loss_db !== undefined;
    const hasVswr = rule.max_vswr !== undefined;
    if (!hasRl && !hasVswr) throw new EngineInputError(name, "match needs min_return_loss_db or max_vswr");
    let limit = -Infinity;
    if (hasRl) limit = requireFinite(rule.min_return_loss_db, name, "min_return_loss_db");
    if (hasVswr) {
      const v = requireFinite(rule.max_vswr, name, "max_vswr");
      if (v < 1) throw new EngineInputError(name, `max_vswr must be at least 1, got ${v}`);
      limit = Math.max(limit, returnLossDb(gammaFromVswr(v)));
    }
    let worstGamma = 0;
    for (let q = 0; q < ks.length; q++) {
      const g = mag(solution, ks[q], p, p);
      values[q] = returnLossDb(g);
      worstGamma = Math.max(worstGamma, g);
    }
    const q = argWorst(values, "min");
    const worstVswr = vswrFromGamma(worstGamma);
    const extra: Record<string, unknown> = { worstVswr: Number.isFinite(worstVswr) ? worstVswr : null };
    if (hasVswr) extra.maxVswr = rule.max_vswr;
    if (hasRl && hasVswr) messages.push(`limit is the stricter of ${rule.min_return_loss_db} dB return loss and VSWR ${rule.max_vswr}`);
    return finish({ id, index, kind: rule.kind, quantity: "return loss", unit: "dB", worst: values[q], worstHz: freqs[q], limit, margin: values[q] - limit, direction: rule.port, points: ks.length, frequenciesHz: freqs, values, messages, extra }, name);
  }

  if (rule.kind === "gain") {
    const from = portIndex(solution, rule.from, `${name}.from`);
    const to = portIndex(solution, rule.to, `${name}.to`);
    if (from === to) throw new EngineInputError(name, `gain needs two different ports, got "${rule.from}" twice`);
    if (rule.min_db === undefined && rule.max_db === undefined) throw new EngineInputError(name, "gain needs min_db or max_db");
    const lo = rule.min_db === undefined ? -Infinity : requireFinite(rule.min_db, name, "min_db");
    const hi = rule.max_db === undefined ? Infinity : requireFinite(rule.max_db, name, "max_db");
    const margins: number[] = new Array(ks.length);
    for (let q = 0; q < ks.length; q++) {
      values[q] = db20(mag(solution, ks[q], to, from));
      margins[q] = Math.min(values[q] - lo, hi - values[q]);
    }
    const q = argWorst(margins, "min");
    const limit = values[q] - lo <= hi - values[q] ? lo : hi;
    return finish({ id, index, kind: rule.kind, quantity: "gain", unit: "dB", worst: values[q], worstHz: freqs[q], limit, margin: margins[q], direction: `${rule.from}→${rule.to}`, points: ks.length, frequenciesHz: freqs, values, messages }, name);
  }

  if (rule.kind === "noise_figure") {
    const limit = requireFinite(rule.max_db, name, "max_db");
    const from = portIndex(solution, rule.from, `${name}.from`);
    const to = portIndex(solution, rule.to, `${name}.to`);
    if (from === to) throw new EngineInputError(name, `a noise figure needs two different ports, got "${rule.from}" twice`);
    const noise = systemNoise(solution.system, { outputs: [to], replace: ctx.replace });
    const f = noiseFigure(noise, from, to);
    for (let q = 0; q < ks.length; q++) values[q] = 10 * Math.log10(f[ks[q]]);
    messages.push(...noise.blocks.notes);
    const q = argWorst(values, "max");
    return finish({ id, index, kind: rule.kind, quantity: "noise figure", unit: "dB", worst: values[q], worstHz: freqs[q], limit, margin: limit - values[q], direction: `${rule.from}→${rule.to}`, points: ks.length, frequenciesHz: freqs, values, messages }, name);
  }

  throw new EngineInputError(name, `unknown rule kind "${(rule as { kind: string }).kind}"`);
}

/** What a rule may need beyond the composite: the S used for replaced blocks (a state sweep's switches). */
export type RuleContext = { replace?: Record<string, SData> };

function evaluateHeadroomRule(solution: Solution, rule: Extract<RuleSpec, { kind: "headroom" }>, index: number, id: string, name: string, ctx: RuleContext): RuleResult {
  const limit = requireFinite(rule.min_db, name, "min_db");
  const input = requireFinite(rule.input_dbm, name, "input_dbm");
  const from = portIndex(solution, rule.from, `${name}.from`);
  const to = portIndex(solution, rule.to, `${name}.to`);
  if (from === to) throw new EngineInputError(name, `headroom needs two different ports, got "${rule.from}" twice`);
  const nf = solution.frequencies.length;
  const ks = rule.band ? bandIndices(solution.frequencies, rule.band, name) : Array.from({ length: nf }, (_, k) => k);
  const freqs = ks.map((k) => solution.frequencies[k]);
  const up = lineup(solution.system, { from: rule.from, to: rule.to, inputDbm: input, replace: ctx.replace, noise: false });
  const rated = up.stages.filter((s) => s.headroomDb !== null);
  const messages = [`path ${up.path.text}`, ...up.warnings];
  if (rated.length === 0) {
    messages.push(`${name}: no block on the path carries p1db_out_dbm, so the headroom rule has nothing to check`);
    return { id, index, kind: rule.kind, verdict: "pass", quantity: "headroom", unit: "dB", worst: 0, worstHz: freqs[0], limit, margin: 0, points: ks.length, frequenciesHz: [], values: [], messages };
  }
  const values: number[] = new Array(ks.length);
  const where: string[] = new Array(ks.length);
  ks.forEach((k, q) => {
    values[q] = Infinity;
    for (const s of rated) {
      if (s.headroomDb![k] < values[q]) {
        values[q] = s.headroomDb![k];
        where[q] = s.block;
      }
    }
  });
  const q = argWorst(values, "min");
  return finish({ id, index, kind: rule.kind, quantity: "headroom", unit: "dB", worst: values[q], worstHz: freqs[q], limit, margin: values[q] - limit, direction: where[q], points: ks.length, frequenciesHz: freqs, values, messages, extra: { inputDbm: input } }, name);
}

function evaluateDriveRule(solution: Solution, rule: Extract<RuleSpec, { kind: "drive" }>, index: number, id: string, name: string): RuleResult {
  const drive = driveCheck(solution, { sources: rule.sources, band: rule.band, coherent: rule.coherent, where: name });
  const w = drive.worst;
  const messages = [...drive.messages];
  const result: RuleResult = {
    id,
    index,
    kind: "drive",
    verdict: drive.verdict,
    quantity: "incident power",
    unit: "dBm",
    worst: w ? w.dbm : drive.maxDbm,
    worstHz: w ? w.hz : drive.maxHz,
    limit: w ? w.ratingDbm : NaN,
    margin: w ? w.margin : NaN,
    direction: w ? `${w.block}:${w.port}` : undefined,
    points: drive.points,
    frequenciesHz: [],
    values: [],
    messages,
    extra: { drive },
  };
  if (!w) {
    // No rated block: nothing to compare with; report the highest incident power.
    result.limit = 0;
    result.margin = 0;
    messages.push(`${name}: no block carries rating_dbm, so the drive rule has nothing to check`);
  }
  return result;
}

function argWorst(values: number[], sense: "min" | "max"): number {
  let q = 0;
  for (let i = 1; i < values.length; i++) {
    if (sense === "min" ? values[i] < values[q] : values[i] > values[q]) q = i;
  }
  return q;
}

function finish(r: Omit<RuleResult, "verdict">, name: string): RuleResult {
  const verdict: Verdict = r.margin >= 0 ? "pass" : "fail";
  const dir = r.direction ? ` (${r.direction})` : "";
  r.messages.unshift(
    `${name}: worst ${r.quantity} ${r.worst.toFixed(2)} ${r.unit}${dir} at ${formatHz(r.worstHz)}, limit ${r.limit.toFixed(2)} ${r.unit}, margin ${r.margin >= 0 ? "+" : ""}${r.margin.toFixed(2)} ${r.unit} over ${r.points} point${r.points === 1 ? "" : "s"}`,
  );
  return { ...r, verdict };
}

/**
 * Evaluates every rule of a list (by default the scenario's rules) on a solved composite.
 * @param solution solved composite
 * @param rules rules to evaluate (default: solution.system.scenario.rules)
 * @returns one RuleResult per rule, same order
 * @throws EngineInputError naming the first bad rule
 * @example evaluateRules(sol).filter((r) => r.verdict === "fail")
 */
export function evaluateRules(solution: Solution, rules: RuleSpec[] = solution.system.scenario.rules ?? [], ctx: RuleContext = {}): RuleResult[] {
  return rules.map((r, i) => evaluateRule(solution, r, i, ctx));
}
