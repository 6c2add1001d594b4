export { prepareSystem, type PrepareOptions } from "./prepare-system";
export { solveScenario, type SolveScenarioOptions } from "./solve-scenario";
export { partActivity, gainActivity, largestGain, isActiveBlock, ACTIVE_GAIN_DB } from "./activity";
export { loadPart, partText, pinnedPartPath, parsePinnedPartPath, parseTouchstoneCached, clearPartCache, setPartCacheLimit, partCacheStats, DEFAULT_PART_CACHE_BYTES, type PartSource } from "./parts";
export { solutionToJson, type SolutionJson } from "./solution-json";
export {
  estimateSolve,
  estimateValidScenario,
  checkSolveSize,
  formatBytes,
  SizeLimitError,
  DEFAULT_MAX_SOLVE_BYTES,
  type SolveEstimate,
  type EstimateOptions,
} from "./estimate";
export { resolveTopology, type Topology } from "./topology";
