/**
 * zod schema of the scenario file (docs/scenario-format.md; the type `Scenario` in engine/types.ts).
 * Structure only: references between blocks, links and ports are checked by parseScenario.
 */
import { z } from "zod";

/** Most frequency points a plan may have. */
export const MAX_PLAN_POINTS = 100_001;

const finite = z.number();
const positiveHz = z.number().positive();

/** "BLOCK:PORT" with PORT a 1-based integer */
export const PortRefSchema = z
  .string()
  .regex(/^[^:]+:[1-9][0-9]*$/, { error: 'expected "BLOCK:PORT" with PORT a whole number from 1' });

export const BlockIdSchema = z
  .string()
  .min(1)
  .max(64)
  .regex(/^[^:\s](?:[^:]*[^:\s])?$/, { error: "expected a block id without ':' and without leading or trailing spaces" });

/** `{ start, stop, points }`, Hz, linear */
export const FrequencyRangeSchema = z.strictObject({
  start: positiveHz,
  stop: positiveHz,
  points: z.number().int().min(1).max(MAX_PLAN_POINTS),
});

/** `{ list: [...] }`, Hz */
export const FrequencyListSchema = z.strictObject({ list: z.array(positiveHz).min(1).max(MAX_PLAN_POINTS) });

export const BlockKindSchema = z.enum([
  "load",
  "antenna",
  "attenuator",
  "line",
  "phase_shifter",
  "isolator",
  "amplifier",
  "filter",
  "splitter",
  "tee",
  "circulator",
  "coupler",
  "hybrid90",
  "hybrid180",
  "switch",
  "array",
  "touchstone",
]);

export const BlockSchema = z.object({
  id: BlockIdSchema,
  kind: BlockKindSchema,
  params: z.record(z.string(), z.unknown()).optional(),
  state: z.number().int().min(1).optional(),
  file: z.string().min(1).optional(),
  data: z.string().min(1).optional(),
  /** touchstone: version of the library part `file` names (absent = 1; docs/scenario-format.md#part-versions) */
  part_version: z.number().int().min(1).max(1_000_000).optional(),
  ports: z.number().int().min(1).max(1024).optional(),
  rating_dbm: finite.optional(),
  /** touchstone parts: marks the part active (or, false, passive); built-in kinds may only repeat their model */
  active: z.boolean().optional(),
  temperature_k: z.number().nonnegative().max(1e6).optional(),
  p1db_out_dbm: finite.optional(),
  oip3_dbm: finite.optional(),
  position: z.object({ x: finite, y: finite }).optional(),
  label: z.string().optional(),
  /** the expressions the user typed for params (the web app evaluates them; the engine ignores them) */
  expr: z.record(z.string(), z.string().max(500)).optional(),
  // checked by parseScenario (engine/spread/spec.ts), so that the message names the block's parameters
  spread: z.record(z.string(), z.unknown()).optional(),
});

export const SystemPortSchema = z.object({
  name: z.string().min(1).max(64),
  at: PortRefSchema,
  z0: z.number().positive().optional(),
});

const band = z.tuple([positiveHz, positiveHz]);

/**
 * The rule kinds of a scenario file, each its own object so that the web app's rule forms and
 * check inputs extend them instead of restating them. `RuleSpec` in engine/types.ts
 * is inferred from `RuleSchema`.
 */
export const IsolationRuleSchema = z.object({
  kind: z.literal("isolation"),
  id: z.string().optional(),
  from: z.string().min(1),
  to: z.string().min(1),
  band,
  min_db: finite,
  one_way: z.boolean().optional(),
});

export const MatchRuleSchema = z.object({
  kind: z.literal("match"),
  id: z.string().optional(),
  port: z.string().min(1),
  band,
  min_return_loss_db: finite.optional(),
  max_vswr: z.number().min(1).optional(),
});

export const InsertionLossRuleSchema = z.object({
  kind: z.literal("insertion_loss"),
  id: z.string().optional(),
  from: z.string().min(1),
  to: z.string().min(1),
  band,
  max_db: finite,
});

export const DriveRuleSchema = z.object({
  kind: z.literal("drive"),
  id: z.string().optional(),
  sources: z.array(z.object({ port: z.string().min(1), dbm: finite })).min(1),
  band: band.optional(),
  coherent: z.boolean().optional(),
});

/** Noise figure from one system port to another (docs/scenario-format.md#noise) at most max_db over the band. */
export const NoiseFigureRuleSchema = z.object({
  kind: z.literal("noise_figure"),
  id: z.string().optional(),
  from: z.string().min(1),
  to: z.string().min(1),
  band,
  max_db: finite,
});

/** Transducer gain 20·log10|S_to,from| within [min_db, max_db] over the band (at least one limit). */
export const GainRuleSchema = z.object({
  kind: z.literal("gain"),
  id: z.string().optional(),
  from: z.string().min(1),
  to: z.string().min(1),
  band,
  min_db: finite.optional(),
  max_db: finite.optional(),
});

/** Line-up headroom to every stated P1dB along the path from→to for input_dbm at `from`, at least min_db. */
export const HeadroomRuleSchema = z.object({
  kind: z.literal("headroom"),
  id: z.string().optional(),
  from: z.string().min(1),
  to: z.string().min(1),
  input_dbm: finite,
  min_db: finite,
  band: band.optional(),
});

export const RuleSchema = z.discriminatedUnion("kind", [
  IsolationRuleSchema,
  MatchRuleSchema,
  InsertionLossRuleSchema,
  DriveRuleSchema,
  NoiseFigureRuleSchema,
  GainRuleSchema,
  HeadroomRuleSchema,
]);

/** Who changed a rule and when (ISO 8601), shown beside overrides and opt-outs. */
const changedBy = { by: z.string().max(200).optional(), at: z.string().max(40).optional() };
const namedRule = { id: z.string().min(1).max(64) };

/**
 * A scenario's replacement of a project rule (docs/scenario-format.md "Rules"): the whole rule, named
 * by the project rule's `id`, with who changed it. The engine itself ignores overrides: the app's
 * effective rule set (lib/domain/rules/effective.ts) decides which rules judge a revision.
 */
export const RuleOverrideSchema = z.discriminatedUnion("kind", [
  IsolationRuleSchema.extend({ ...namedRule, ...changedBy }),
  MatchRuleSchema.extend({ ...namedRule, ...changedBy }),
  InsertionLossRuleSchema.extend({ ...namedRule, ...changedBy }),
  DriveRuleSchema.extend({ ...namedRule, ...changedBy }),
  NoiseFigureRuleSchema.extend({ ...namedRule, ...changedBy }),
  GainRuleSchema.extend({ ...namedRule, ...changedBy }),
  HeadroomRuleSchema.extend({ ...namedRule, ...changedBy }),
]);

/** A scenario's visible opt-out of a project rule: the rule's `id` and why. */
export const RuleOptOutSchema = z.object({
  id: z.string().min(1).max(64),
  reason: z.string().trim().min(1, { error: "give the reason for opting out" }).max(2000),
  ...changedBy,
});

export const ScenarioSchema = z.object({
  format: z.literal("portolan.scenario/1"),
  name: z.string().min(1).max(200),
  z0: z.number().positive(),
  // checked by parseScenario with FrequencyRangeSchema or FrequencyListSchema, so that the message names one form
  frequency: z.record(z.string(), z.unknown()),
  blocks: z.array(BlockSchema).min(1),
  links: z.array(z.tuple([PortRefSchema, PortRefSchema])),
  ports: z.array(SystemPortSchema).min(1),
  /** scenario-only rules (a project rule of the same id is overridden only through `rule_overrides`) */
  rules: z.array(RuleSchema).optional(),
  rule_overrides: z.array(RuleOverrideSchema).max(200).optional(),
  rule_opt_outs: z.array(RuleOptOutSchema).max(200).optional(),
  extrapolate: z.enum(["error", "hold"]).optional(),
  temperature_k: z.number().nonnegative().max(1e6).optional(),
  variables: z.record(z.string(), z.union([z.string(), finite])).optional(),
});
