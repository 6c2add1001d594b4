// The spread analysis (docs/checks.md "Spread analysis"): N seeded samples of a scenario's spreads, each
// solved through the one join plan of the nominal system with only the spread blocks re-evaluated; for
// every rule the yield with its Wilson interval, percentile envelopes of its trace, the worst sample and
// a Spearman ranking of the parameters against its margin.
import { evaluateBlock } from "../blocks";
import { evaluateRule } from "../checks/rules";
import { effectiveRuleSet, judgingRules, type NamedRule } from "../checks/rule-set";
import { solveSystem } from "../network";
import { prepareSystem } from "../system/prepare-system";
import type { PartSource } from "../system/parts";
import { EngineInputError, SingularSystemError, type BlockSpec, type PreparedSystem, type SData, type Scenario } from "../types";
import { writeTouchstone } from "../touchstone";
import { createRandom } from "./random";
import { scenarioSpreadParams, type SpreadParam } from "./spec";
import { quantileSorted, spearman, wilsonInterval } from "./statistics";

/** Most samples one analysis takes. */
export const MAX_SPREAD_SAMPLES = 1_000_000;
/** Most bytes of stored rule traces (samples × band points × rules × 8) before an analysis is refused. */
export const MAX_TRACE_BYTES = 512 * 1024 * 1024;

export type SpreadOptions = PartSource & {
  /** number of samples N (1…MAX_SPREAD_SAMPLES) */
  samples: number;
  /** seed of the generator (a safe integer); the same seed gives the same samples */
  seed: number;
  /** the rules judged; default: the scenario's effective rule set without project rules */
  rules?: NamedRule[];
  /** longest time, ms, between progress reports and cancellation checks (default 50) */
  batchMs?: number;
  /** called with the fraction done (0…1) after each batch */
  onProgress?: (fraction: number) => void;
  /** cancels the analysis between batches (the promise rejects with the signal's reason) */
  signal?: AbortSignal;
  /** size limit of the nominal solve (see prepareSystem) */
  maxBytes?: number;
};

/** A sampled parameter as results list it. */
export type SpreadParameter = Pick<SpreadParam, "name" | "blockId" | "param" | "nominal" | "distribution" | "amount" | "unit">;

export type SpreadRuleResult = {
  id: string;
  kind: NamedRule["kind"];
  /** samples that met the rule */
  passed: number;
  total: number;
  /** passed / total */
  yield: number;
  /** 95% Wilson score interval of the yield */
  low: number;
  high: number;
  /** margin of the nominal design (positive = met), in the rule's unit */
  nominal_margin: number;
  /** the sample with the lowest margin, its parameter values by name (null when no sample has a margin) */
  worst: { sample: number; margin: number; values: Record<string, number> } | null;
  /** parameters by |ρ| (Spearman rank correlation of the parameter with the margin), largest first */
  sensitivity: { name: string; rho: number | null }[];
};

/** Percentile envelope of one rule's trace over its band, dB. */
export type SpreadEnvelope = {
  rule: string;
  quantity: string;
  frequencies: number[];
  nominal: number[];
  p5: number[];
  p50: number[];
  p95: number[];
};

export type SpreadResult = {
  scenario: string;
  samples: number;
  seed: number;
  parameters: SpreadParameter[];
  rules: SpreadRuleResult[];
  envelopes: SpreadEnvelope[];
  warnings: string[];
};

/** One value of a parameter drawn from its distribution, clamped into the parameter's range. */
function drawValue(p: SpreadParam, uniform: () => number, normal: () => number): number {
  let v = p.distribution === "uniform" ? p.nominal + p.amount * (2 * uniform() - 1) : p.nominal + p.amount * normal();
  if (v < p.min || (p.minExclusive && v <= p.min)) v = p.minExclusive ? p.min + Math.max(Math.abs(p.min), 1) * 1e-12 : p.min;
  if (v > p.max) v = p.max;
  return v;
}

/** What one spread block needs per sample: how to produce its S from the sampled values. */
type Varied = {
  block: number;
  id: string;
  params: SpreadParam[];
  /** columns of these params in a sample row */
  columns: number[];
  /** touchstone parts: scaled copy of the nominal data (reused) */
  work: SData | null;
};

/**
 * The S of one varied block for one sample: built-in kinds evaluated by their model with the sampled
 * values; a part's data (on the plan, at the system z0) scaled by 10^(mag_db/20)·e^(j·phase_deg).
 */
function variedS(v: Varied, sys: PreparedSystem, row: Float64Array): SData {
  const spec = sys.scenario.blocks[v.block];
  if (v.work) {
    let db = 0;
    let deg = 0;
    v.params.forEach((p, k) => {
      if (p.param === "mag_db") db = row[v.columns[k]];
      else deg = row[v.columns[k]];
    });
    const m = 10 ** (db / 20);
    const cr = m * Math.cos((deg * Math.PI) / 180);
    const ci = m * Math.sin((deg * Math.PI) / 180);
    const src = sys.blocks[v.block].s.data;
    const dst = v.work.data;
    for (let j = 0; j < src.length; j += 2) {
      dst[j] = src[j] * cr - src[j + 1] * ci;
      dst[j + 1] = src[j] * ci + src[j + 1] * cr;
    }
    return v.work;
  }
  const params: Record<string, unknown> = { ...(spec.params ?? {}) };
  v.params.forEach((p, k) => (params[p.param] = row[v.columns[k]]));
  return evaluateBlock({ ...spec, params }, sys.frequencies, sys.z0).s;
}

function groupVaried(sys: PreparedSystem, params: SpreadParam[]): Varied[] {
  const byBlock = new Map<number, Varied>();
  params.forEach((p, column) => {
    let v = byBlock.get(p.block);
    if (!v) {
      const s = sys.blocks[p.block].s;
      v = { block: p.block, id: p.blockId, params: [], columns: [], work: sys.scenario.blocks[p.block].kind === "touchstone" ? { n: s.n, nf: s.nf, data: new Float64Array(s.data.length) } : null };
      byBlock.set(p.block, v);
    }
    v.params.push(p);
    v.columns.push(column);
  });
  return [...byBlock.values()];
}

/**
 * A sample that cannot be solved (a sampled value a model refuses, a singular interconnection at some
 * sampled phase) stops the analysis with an input error naming the sample and its values, so that the
 * spread (or the design) can be corrected; a bug stays what it is.
 */
function sampleError(err: unknown, sample: number, params: SpreadParam[], row: Float64Array): unknown {
  if (!(err instanceof EngineInputError) && !(err instanceof SingularSystemError)) return err;
  const values = params.map((p, c) => `${p.name} = ${Number(row[c].toPrecision(8))}`).join(", ");
  return new EngineInputError("spread", `sample ${sample} (${values}) cannot be solved: ${err.message}`);
}

const nextTurn = (): Promise<void> => new Promise((resolve) => setTimeout(resolve, 0));

/**
 * Runs the spread analysis of a scenario.
 *
 * The scenario is prepared once (prepareSystem) and its join plan built by the nominal solve; each
 * sample draws every spread parameter in a fixed order (blocks in scenario order, each block's spread
 * in its object's order) from one xoshiro128** stream seeded by `seed`, re-evaluates only the blocks
 * that have spreads, and solves through the same plan (solveSystem with `replace`; wave maps only when a drive rule needs them). Every
 * rule is evaluated on every sample: passes (margin ≥ 0), margins and the rule's trace in dB over its
 * band. Samples run in batches of at most `batchMs` milliseconds; between batches the progress callback is called, the abort
 * signal checked and the event loop given a turn (so that a worker can receive Cancel).
 *
 * @param scenario - a validated scenario (parseScenario)
 * @param opts - samples, seed, rules, part files, progress, signal
 * @returns yields, envelopes, worst samples and sensitivity rankings per rule
 * @throws EngineInputError for bad options or a scenario without spreads or rules; the signal's reason when aborted
 * @example const r = await runSpread(scenario, { samples: 1000, seed: 1 }); r.rules[0].yield
 */
export async function runSpread(scenario: Scenario, opts: SpreadOptions): Promise<SpreadResult> {
  const { samples: N, seed } = opts;
  if (!Number.isInteger(N) || N < 1 || N > MAX_SPREAD_SAMPLES) throw new EngineInputError("samples", `expected a whole number from 1 to ${MAX_SPREAD_SAMPLES}, got ${N}`);
  if (!Number.isSafeInteger(seed)) throw new EngineInputError("seed", `expected a whole number (a safe integer), got ${seed}`);
  const batchMs = Math.max(1, opts.batchMs ?? 50);
  opts.signal?.throwIfAborted();

  // drive rules read internal waves, which need the wave maps; the other rules read the composite alone
  const waves = (opts.rules ?? scenario.rules ?? []).some((r) => r.kind === "drive") || (scenario.rule_overrides ?? []).some((r) => r.kind === "drive");
  const sys = prepareSystem(scenario, { readFile: opts.readFile, parts: opts.parts, maxBytes: opts.maxBytes, waves });
  const params = scenarioSpreadParams(sys.scenario.blocks);
  if (params.length === 0) throw new EngineInputError("blocks", "no block has a spread: give at least one block a `spread` object (docs/scenario-format.md \"Spreads\")");
  const rules = opts.rules ?? judgingRules(effectiveRuleSet([], sys.scenario));
  if (rules.length === 0) throw new EngineInputError("rules", "the scenario has no rules to judge: a spread analysis needs at least one rule");

  const nominalSolution = solveSystem(sys, { waves });
  const nominal = rules.map((rule, i) => evaluateRule(nominalSolution, rule, i));
  const points = nominal.map((r) => r.values.length);
  const traceBytes = points.reduce((a, b) => a + b, 0) * N * 8;
  if (traceBytes > MAX_TRACE_BYTES) {
    throw new EngineInputError("samples", `${N} samples of ${points.reduce((a, b) => a + b, 0)} rule points need ${Math.round(traceBytes / 2 ** 20)} MiB of traces (limit ${MAX_TRACE_BYTES / 2 ** 20} MiB); take fewer samples or narrower bands`);
  }

  const P = params.length;
  const values = new Float64Array(N * P);
  const margins = rules.map(() => new Float64Array(N));
  const passed = new Int32Array(rules.length);
  const traces = points.map((n) => new Float64Array(n * N));
  const varied = groupVaried(sys, params);
  const random = createRandom(seed);
  const replace: Record<string, SData> = {};
  const row = new Float64Array(P);

  let s = 0;
  while (s < N) {
    const started = performance.now();
    // a batch ends after batchMs (checked every sample: one sample is one solve, far above the clock's cost)
    do {
      for (let c = 0; c < P; c++) row[c] = drawValue(params[c], random.uniform, random.normal);
      values.set(row, s * P);
      try {
        for (const v of varied) replace[v.id] = variedS(v, sys, row);
        const sol = solveSystem(sys, { replace, waves });
        rules.forEach((rule, i) => {
          const r = evaluateRule(sol, rule, i);
          margins[i][s] = r.margin;
          if (r.verdict !== "fail") passed[i]++;
          traces[i].set(r.values, s * points[i]);
        });
      } catch (err) {
        throw sampleError(err, s, params, row);
      }
      s++;
    } while (s < N && performance.now() - started < batchMs);
    opts.onProgress?.(s / N);
    if (s < N) {
      await nextTurn();
      opts.signal?.throwIfAborted();
    }
  }

  const column = (c: number): Float64Array => {
    const out = new Float64Array(N);
    for (let s = 0; s < N; s++) out[s] = values[s * P + c];
    return out;
  };
  const columns = params.map((_, c) => column(c));
  const sampleValues = (s: number): Record<string, number> => Object.fromEntries(params.map((p, c) => [p.name, values[s * P + c]]));

  const ruleResults: SpreadRuleResult[] = rules.map((rule, i) => {
    const m = margins[i];
    let worst = -1;
    for (let s = 0; s < N; s++) if (Number.isFinite(m[s]) && (worst < 0 || m[s] < m[worst])) worst = s;
    const finite = Array.from(m).every(Number.isFinite);
    const sensitivity = params
      .map((p, c) => ({ name: p.name, rho: finite ? spearman(columns[c], m) : null }))
      .sort((a, b) => Math.abs(b.rho ?? 0) - Math.abs(a.rho ?? 0));
    const { low, high } = wilsonInterval(passed[i], N);
    return {
      id: rule.id,
      kind: rule.kind,
      passed: passed[i],
      total: N,
      yield: passed[i] / N,
      low,
      high,
      nominal_margin: nominal[i].margin,
      worst: worst < 0 ? null : { sample: worst, margin: m[worst], values: sampleValues(worst) },
      sensitivity,
    };
  });

  const envelopes: SpreadEnvelope[] = [];
  const sorted = new Float64Array(N);
  rules.forEach((rule, i) => {
    const n = points[i];
    if (n === 0) return; // the drive rule has no trace over a band
    const p5: number[] = new Array(n);
    const p50: number[] = new Array(n);
    const p95: number[] = new Array(n);
    const t = traces[i];
    for (let q = 0; q < n; q++) {
      for (let s = 0; s < N; s++) sorted[s] = t[s * n + q];
      sorted.sort();
      p5[q] = quantileSorted(sorted, 0.05);
      p50[q] = quantileSorted(sorted, 0.5);
      p95[q] = quantileSorted(sorted, 0.95);
    }
    envelopes.push({ rule: rule.id, quantity: nominal[i].quantity, frequencies: nominal[i].frequenciesHz, nominal: nominal[i].values, p5, p50, p95 });
  });

  return {
    scenario: sys.scenario.name,
    samples: N,
    seed,
    parameters: params.map(({ name, blockId, param, nominal: v, distribution, amount, unit }) => ({ name, blockId, param, nominal: v, distribution, amount, unit })),
    rules: ruleResults,
    envelopes,
    warnings: [...sys.warnings],
  };
}

/** The blocks of a scenario with one sample's values put in (built-in parameters only). */
function withValues(blocks: readonly BlockSpec[], params: SpreadParam[], values: Record<string, number>): BlockSpec[] {
  return blocks.map((b, i) => {
    const { spread: _spread, ...rest } = b;
    void _spread;
    const mine = params.filter((p) => p.block === i && b.kind !== "touchstone");
    if (mine.length === 0) return rest;
    const params2: Record<string, unknown> = { ...(b.params ?? {}) };
    for (const p of mine) params2[p.param] = values[p.name] ?? p.nominal;
    return { ...rest, params: params2 };
  });
}

/**
 * One sample of a spread analysis as a scenario of its own (the worst sample of a rule, to be opened and
 * inspected): every sampled built-in parameter set to its sampled value, every part with a spread
 * replaced by inline Touchstone data on the plan at the system z0 with its offsets applied, every
 * `spread` removed, the name marked. Solving it gives the sample's result.
 *
 * @param system - the prepared nominal system (prepareSystem of the analysed scenario)
 * @param values - the sample's values by parameter name (SpreadRuleResult.worst.values); absent names keep the nominal value
 * @returns the scenario, plain JSON
 * @example JSON.stringify(sampleScenario(sys, result.rules[0].worst!.values), null, 2)
 */
export function sampleScenario(system: PreparedSystem, values: Record<string, number>): Scenario {
  const scenario = system.scenario;
  const params = scenarioSpreadParams(scenario.blocks);
  const blocks = withValues(scenario.blocks, params, values);
  const row = new Float64Array(params.length);
  params.forEach((p, c) => (row[c] = values[p.name] ?? p.nominal));
  for (const v of groupVaried(system, params)) {
    if (!v.work) continue;
    const s = variedS(v, system, row);
    const text = writeTouchstone(
      { frequencies: system.frequencies, s, z0: system.z0, comments: [`block ${v.id} of "${scenario.name}" with spread offsets ${v.params.map((p, k) => `${p.param} ${row[v.columns[k]]}`).join(", ")}, on the plan at the system z0`] },
      { version: "1.1" },
    );
    const { file: _file, ...rest } = blocks[v.block];
    void _file;
    blocks[v.block] = { ...rest, data: text, ports: s.n };
  }
  return { ...scenario, name: `${scenario.name} (spread sample)`.slice(0, 200), blocks };
}
