// What a solver keeps beside a Solution so that internal waves need no new solve.

import type { SData, Solution } from "../types";
import type { Plan } from "./plan";

export type GrowthWaveState = {
  kind: "growth";
  plan: Plan;
  /** all wave maps; step i's stack (rows: step.inner, columns: step.ports, per frequency) starts at mapOffset[i] */
  maps: Float64Array;
  mapOffset: Int32Array;
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
