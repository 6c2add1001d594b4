export { runSpread, sampleScenario, MAX_SPREAD_SAMPLES, MAX_TRACE_BYTES, type SpreadOptions, type SpreadResult, type SpreadRuleResult, type SpreadEnvelope, type SpreadParameter } from "./analyse";
export { blockSpreadParams, scenarioSpreadParams, spreadSpecOf, PART_SPREAD_PARAMS, type SpreadParam } from "./spec";
export { createRandom, type Random } from "./random";
export { wilsonInterval, quantileSorted, spearman, averageRanks, Z95 } from "./statistics";
