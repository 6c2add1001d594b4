// What a solver keeps beside a Solution so that internal waves need no new solve.

import type { SData, Solution } from "../types";
import type { Plan } from "./plan";

/** A system's plan with the layout of its wave maps and the map buffer reused from solve to solve. */
export type PlanEntry = {
  plan: Plan;
  /** step i's map stack (rows: step.inner, columns: step.ports, per frequency) starts at mapOffset[i] */
  mapOffset: Int32Array;
  mapTotal: number;
  arena: Float64Array | null;
  /** bumped by every solve that writes into `arena` */
  generation: number;
};

export type GrowthWaveState = {
  kind: "growth";
  entry: PlanEntry;
  /** entry.generation when `maps` was written; −1 once the maps are private to this solution */
  generation: number;
  maps: Float64Array;
  /** S used for each block (after replacements) */
  blockS: SData[];
};

export type DenseWaveState = {
  kind: "dense";
  /** linked block ports (rows of w) and system-port block ports (columns) */
  inner: Int32Array;
  ext: Int32Array;
  /** per frequency (Γ − S_ii)⁻¹ S_ie, 2·nf·|inner|·|ext| */
  w: Float64Array;
  /** composite referenced to the system Z0, before the Z0 steps */
  s0: Float64Array;
  rho: Float64Array;
  t: Float64Array;
  blockS: SData[];
};

export type WaveState = GrowthWaveState | DenseWaveState;

export const waveStates = new WeakMap<Solution, WaveState>();
