/** Integration checks: pure functions of (scenario or prepared system, solution, inputs) → verdict + figures. */
export * from "./types";
export { db20, magnitude, vswrFromGamma, gammaFromVswr, returnLossDb, gammaFromReturnLoss, mismatchLossDb, wattsFromDbm, dbmFromWatts } from "./conversions";
export { bandIndices, nearestIndex, portIndex, formatHz, BAND_EDGE_TOLERANCE } from "./band";
export { evaluateRule, evaluateRules, ruleName, type RuleContext } from "./rules";
export { portMatrix, portMatrixExtremes, type PortMatrix, type PortMatrixExtremes } from "./port-matrix";
export { powerLedger, powerLedgers, LEDGER_TOLERANCE, LEDGER_FAIL_TOLERANCE, type LedgerResult, type LedgerBlockEntry } from "./power-ledger";
export { dataQuality, MODEL_TOLERANCE, MEASURED_TOLERANCE, type DataQualityResult, type QualityFigures } from "./data-quality";
export { kShortestPaths, createGraph, addEdge, type WeightedGraph, type RankedPath, type KShortestResult } from "./k-shortest-paths";
export { leakTrace, idealS, LEAK_EDGE_FLOOR, type LeakTraceResult, type LeakTraceOptions, type LeakPath, type LeakHop, type LeakWhatIf } from "./leak-trace";
export { sliceS, sliceSystem } from "./slice-system";
export { stateSweep, sweepSwitches, switchStates, combinationStates, countCombinations, ruleIndices, MAX_SWEEP_COMBINATIONS, type StateSweepResult, type SweepRow, type SweepCell } from "./state-sweep";
export { orderDriveRows } from "./drive-order";
export { driveCheck, defaultDriveSources, DRIVE_CAUTIONS, type DriveResult, type DriveOptions, type DriveSource, type DrivePortResult, type DriveBlockResult } from "./drive";
export { stabilityOf, stabilityOfStack, stabilityCheck, PAIR_POINTS_PORT_LIMIT, type StabilityPoint, type StabilityResult } from "./stability";
export { runAllChecks, worstVerdict, type AllChecksResult } from "./run-all";
export {
  effectiveRuleSet,
  normaliseScenarioRules,
  judgingRules,
  ruleSetHashInput,
  rulePorts,
  overrideRule,
  EffectiveRuleSetSchema,
  RULE_SOURCES,
  RULE_SOURCE_LABELS,
  type RuleSource,
  type NamedRule,
  type EffectiveRule,
  type EffectiveRuleSet,
  type OptedOutRule,
} from "./rule-set";
