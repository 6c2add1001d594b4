// A block's `spread` object (docs/scenario-format.md "Spreads"): which parameters vary, how, and their
// nominal values; validated here so that parseScenario's messages name the block's own parameters.
import { BLOCK_CATALOGUE, isBuiltInKind } from "../blocks";
import type { ParamInfo } from "../blocks";
import { EngineInputError, type BlockSpec, type SpreadSpec } from "../types";

/** The spread parameters a touchstone part takes: one offset of all its data in dB and in degrees. */
export const PART_SPREAD_PARAMS = ["mag_db", "phase_deg"] as const;

/** One sampled parameter of a scenario. */
export type SpreadParam = {
  /** index of the block in scenario.blocks */
  block: number;
  blockId: string;
  param: string;
  /** "BLOCK.param", the name in results */
  name: string;
  /** the value the scenario gives (0 for a part's offsets) */
  nominal: number;
  distribution: "uniform" | "normal";
  /** plus_minus for uniform, sigma for normal, in the parameter's unit */
  amount: number;
  unit: string;
  /** range of the parameter (samples outside it are clamped; see docs/checks.md "Spread analysis") */
  min: number;
  max: number;
  minExclusive: boolean;
};

function isRecord(x: unknown): x is Record<string, unknown> {
  return x !== null && typeof x === "object" && !Array.isArray(x);
}

/** Reads one `{ plus_minus }` or `{ sigma }` object; `where` is its JSON path. */
function readSpreadSpec(raw: unknown, where: string): { distribution: "uniform" | "normal"; amount: number } {
  if (!isRecord(raw)) throw new EngineInputError(where, 'expected { "plus_minus": x } (uniform) or { "sigma": s } (normal)');
  const keys = Object.keys(raw);
  const unknown = keys.filter((k) => k !== "plus_minus" && k !== "sigma");
  if (unknown.length > 0) throw new EngineInputError(`${where}.${unknown[0]}`, 'unknown field; a spread is { "plus_minus": x } or { "sigma": s }');
  if ("plus_minus" in raw && "sigma" in raw) throw new EngineInputError(where, "give plus_minus (uniform) or sigma (normal), not both");
  const field = "plus_minus" in raw ? "plus_minus" : "sigma" in raw ? "sigma" : null;
  if (field === null) throw new EngineInputError(where, 'expected { "plus_minus": x } (uniform) or { "sigma": s } (normal)');
  const amount = raw[field];
  if (typeof amount !== "number" || !Number.isFinite(amount)) throw new EngineInputError(`${where}.${field}`, `expected a finite number ≥ 0, got ${JSON.stringify(amount)}`);
  if (amount < 0) throw new EngineInputError(`${where}.${field}`, `a spread cannot be negative, got ${amount}`);
  return { distribution: field === "plus_minus" ? "uniform" : "normal", amount };
}

/**
 * The sampled parameters of one block, validated: every name is a numeric parameter of the block's kind
 * (a part's: mag_db, phase_deg) with a finite nominal value, every spread one of the two forms, ≥ 0.
 *
 * @param block - the block
 * @param index - its place in scenario.blocks (for JSON paths)
 * @returns one SpreadParam per entry of `block.spread`, in the object's order
 * @throws EngineInputError at `blocks[i].spread.NAME…` naming what is wrong
 * @example blockSpreadParams({ id: "PAD", kind: "attenuator", params: { loss_db: 3 }, spread: { loss_db: { plus_minus: 1 } } }, 0)[0].nominal // 3
 */
export function blockSpreadParams(block: BlockSpec, index: number): SpreadParam[] {
  const where = `blocks[${index}].spread`;
  const spread: unknown = block.spread;
  if (spread === undefined) return [];
  if (!isRecord(spread)) throw new EngineInputError(where, "expected an object of spreads by parameter name");
  const out: SpreadParam[] = [];
  for (const [param, raw] of Object.entries(spread)) {
    const at = `${where}.${param}`;
    let info: Pick<ParamInfo, "unit" | "min" | "max" | "minExclusive">;
    let nominal: number;
    if (block.kind === "touchstone") {
      if (!(PART_SPREAD_PARAMS as readonly string[]).includes(param)) {
        throw new EngineInputError(at, `unknown spread parameter "${param}"; a touchstone part takes ${PART_SPREAD_PARAMS.join(" and ")} (offsets of all its data)`);
      }
      info = { unit: param === "mag_db" ? "dB" : "deg" };
      nominal = 0;
    } else if (isBuiltInKind(block.kind)) {
      const declared = BLOCK_CATALOGUE[block.kind].params;
      const found = declared.find((p) => p.name === param);
      const numeric = declared.filter((p) => p.kind === "number").map((p) => p.name);
      if (!found) throw new EngineInputError(at, `unknown parameter "${param}" for kind ${block.kind}; parameters that take a spread: ${numeric.join(", ") || "none"}`);
      if (found.kind !== "number") throw new EngineInputError(at, `parameter "${param}" is not a number and takes no spread; parameters that take one: ${numeric.join(", ") || "none"}`);
      const given = block.params?.[param] ?? found.default;
      if (typeof given !== "number" || !Number.isFinite(given)) {
        throw new EngineInputError(at, `parameter "${param}" needs a finite value to spread around (it is ${given === null || given === undefined ? "∞ (ideal) or absent" : JSON.stringify(given)})`);
      }
      info = found;
      nominal = given;
    } else {
      throw new EngineInputError(at, `unknown block kind "${block.kind}"`);
    }
    const { distribution, amount } = readSpreadSpec(raw, at);
    out.push({
      block: index,
      blockId: block.id,
      param,
      name: `${block.id}.${param}`,
      nominal,
      distribution,
      amount,
      unit: info.unit,
      min: info.min ?? -Infinity,
      max: info.max ?? Infinity,
      minExclusive: info.minExclusive ?? false,
    });
  }
  return out;
}

/**
 * Every sampled parameter of a scenario, blocks in order.
 * @example scenarioSpreadParams(scenario).map((p) => p.name) // ["PAD.loss_db", "ANT.phase_deg"]
 */
export function scenarioSpreadParams(blocks: readonly BlockSpec[]): SpreadParam[] {
  return blocks.flatMap((b, i) => blockSpreadParams(b, i));
}

/** The `spread` object's entry for one parameter, as written. */
export function spreadSpecOf(p: SpreadParam): SpreadSpec {
  return p.distribution === "uniform" ? { plus_minus: p.amount } : { sigma: p.amount };
}
