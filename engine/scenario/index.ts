export { parseScenario, parseScenarioText, splitPortRef, SCENARIO_FORMAT } from "./parse-scenario";
export { frequencyPlan } from "./frequency-plan";
export { FREQUENCY_TOLERANCE, sameFrequency, withinRange } from "./frequency-tolerance";
export { formatJsonPath } from "./json-path";
export { placeBlockError } from "./block-errors";
export {
  ScenarioSchema,
  BlockSchema,
  SystemPortSchema,
  RuleSchema,
  RuleOverrideSchema,
  RuleOptOutSchema,
  IsolationRuleSchema,
  MatchRuleSchema,
  InsertionLossRuleSchema,
  DriveRuleSchema,
  FrequencyRangeSchema,
  FrequencyListSchema,
  PortRefSchema,
  BlockIdSchema,
  BlockKindSchema,
  MAX_PLAN_POINTS,
} from "./schema";
export { describeIssue } from "./zod-messages";
