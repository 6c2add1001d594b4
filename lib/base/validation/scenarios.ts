import { z } from "zod";
import { BlockSchema, FrequencyListSchema, FrequencyRangeSchema, ScenarioSchema, SystemPortSchema } from "@/engine/scenario/schema";
import { idSchema, nameSchema } from "./common";

/** Largest scenario JSON accepted in one save (inline part data can make it large). */
export const SCENARIO_BODY_LIMIT_BYTES = 2 * 1024 * 1024;

export const scenarioNameSchema = nameSchema({ required: "Enter a scenario name.", max: 200 });

/**
 * A scenario as the workspace saves it: the scenario file's structure (engine/scenario/schema.ts), except
 * that a draft may have no blocks or no system ports yet, and each block may keep the expression text
 * typed for its parameters (`expr`). References (links to missing ports, rules naming missing ports) are
 * not checked here: the engine reports them as warnings when the revision is saved.
 */
export const draftScenarioSchema = ScenarioSchema.extend({
  frequency: z.union([FrequencyRangeSchema, FrequencyListSchema]),
  blocks: z.array(BlockSchema.extend({ expr: z.record(z.string(), z.string()).optional() })).max(2000),
  ports: z.array(SystemPortSchema).max(500),
});
export type DraftScenario = z.infer<typeof draftScenarioSchema>;

export const SCENARIO_TEMPLATES = ["blank", "pad-chain", "tr-switch"] as const;
export type ScenarioTemplate = (typeof SCENARIO_TEMPLATES)[number];

export const createScenarioSchema = z.object({
  name: scenarioNameSchema,
  template: z.enum(SCENARIO_TEMPLATES, { error: "Choose a template: blank, pad-chain or tr-switch." }).optional(),
  /** Content to start from instead of a template ("save as new scenario" after a conflict). */
  scenario: draftScenarioSchema.optional(),
});

export const renameScenarioSchema = z.object({ name: scenarioNameSchema });

export const duplicateScenarioSchema = z.object({ name: scenarioNameSchema.optional() });

export const saveRevisionSchema = z.object({
  baseRevisionId: idSchema,
  scenario: draftScenarioSchema,
});

export const solveQuerySchema = z.object({
  format: z.enum(["json", "touchstone", "csv"], { error: "Choose format json, touchstone or csv." }).default("json"),
  revision: idSchema.optional(),
});
