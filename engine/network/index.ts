/** Interconnection of blocks: composite S by planned sub-network growth, the dense reference, internal waves. */
export { solveSystem, planFor, primeSolver, ILL_CONDITIONED, type SolveOptions } from "./solve-system";
export { solveDense } from "./dense";
export { internalWaves, internalWavesMany } from "./internal-waves";
export { buildPlan, type Plan, type Step, type JoinStep, type CloseStep, type Leaf } from "./plan";
export { z0Step } from "./z0-step";
