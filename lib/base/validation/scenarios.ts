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

/** A revision's note: optional, one short paragraph. */
export const revisionNoteSchema = z.string().trim().max(2000, { error: "Keep the note under 2000 characters." });

export const saveRevisionSchema = z.object({
  baseRevisionId: idSchema,
  scenario: draftScenarioSchema,
  note: revisionNoteSchema.nullable().optional(),
  /** after a 409: mine or theirs for each conflict key it listed */
  resolutions: z.record(z.string().min(1).max(400), z.enum(["mine", "theirs"], { error: "Choose mine or theirs." })).optional(),
});

/** The person's working draft of a scenario (autosave): the edited scenario and the revision it started from. */
export const putDraftSchema = z.object({
  baseRevisionId: idSchema,
  scenario: draftScenarioSchema,
});

export const solveQuerySchema = z.object({
  format: z.enum(["json", "touchstone", "csv"], { error: "Choose format json, touchstone or csv." }).default("json"),
  revision: idSchema.optional(),
});
