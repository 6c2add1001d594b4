/**
 * The scenario's frequency plan as an array of hertz.
 */
import { EngineInputError, type FrequencyPlanSpec } from "../types";
import { MAX_PLAN_POINTS } from "./schema";

/**
 * Frequencies of a plan: `{ start, stop, points }` spaced linearly (both ends included), or `{ list }`
 * as given. Points are in hertz, positive and strictly increasing; at most 100 001 of them.
 *
 * @param spec - the scenario's `frequency`
 * @returns Float64Array of nf frequencies, Hz
 * @throws EngineInputError (`where` = `frequency.points`, `frequency.list[3]`, ...) for an unusable plan
 * @example
 * frequencyPlan({ start: 1e9, stop: 2e9, points: 3 }); // Float64Array [1e9, 1.5e9, 2e9]
 */
export function frequencyPlan(spec: FrequencyPlanSpec): Float64Array {
  if ("list" in spec) {
    const list = spec.list;
    if (!Array.isArray(list) || list.length < 1) throw new EngineInputError("frequency.list", "expected at least one frequency");
    if (list.length > MAX_PLAN_POINTS) throw new EngineInputError("frequency.list", `expected at most ${MAX_PLAN_POINTS} frequencies`);
    const out = new Float64Array(list.length);
    for (let k = 0; k < list.length; k++) {
      const f = list[k];
      if (typeof f !== "number" || !Number.isFinite(f) || f <= 0) {
        throw new EngineInputError(`frequency.list[${k}]`, `expected a frequency in Hz > 0, got ${JSON.stringify(f)}`);
      }
      if (k > 0 && f <= out[k - 1]) {
        throw new EngineInputError(`frequency.list[${k}]`, `frequencies must increase strictly: ${f} Hz follows ${out[k - 1]} Hz`);
      }
      out[k] = f;
    }
    return out;
  }
  const { start, stop, points } = spec;
  for (const [name, v] of [["start", start], ["stop", stop]] as const) {
    if (typeof v !== "number" || !Number.isFinite(v) || v <= 0) {
      throw new EngineInputError(`frequency.${name}`, `expected a frequency in Hz > 0, got ${JSON.stringify(v)}`);
    }
  }
  if (!Number.isInteger(points) || points < 1 || points > MAX_PLAN_POINTS) {
    throw new EngineInputError("frequency.points", `expected a whole number from 1 to ${MAX_PLAN_POINTS}, got ${JSON.stringify(points)}`);
  }
  if (points === 1) {
    if (stop !== start) throw new EngineInputError("frequency.points", "a single point needs start = stop");
    return Float64Array.of(start);
  }
  if (!(stop > start)) throw new EngineInputError("frequency.stop", `expected stop > start (${start} Hz), got ${stop} Hz`);
  const out = new Float64Array(points);
  const step = (stop - start) / (points - 1);
  for (let k = 0; k < points; k++) out[k] = start + k * step;
  // land exactly on the stated end, free of rounding in the step
  out[points - 1] = stop;
  return out;
}
