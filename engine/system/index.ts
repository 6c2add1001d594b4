export { prepareSystem, type PrepareOptions } from "./prepare-system";
export { solveScenario, type SolveScenarioOptions } from "./solve-scenario";
export { partActivity, gainActivity, largestGain, isActiveBlock, ACTIVE_GAIN_DB } from "./activity";
export { loadPart, partText, parseTouchstoneCached, clearPartCache, type PartSource } from "./parts";
