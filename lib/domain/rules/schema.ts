import { z } from "zod";
import {
  DriveRuleSchema,
  GainRuleSchema,
  HeadroomRuleSchema,
  InsertionLossRuleSchema,
  IsolationRuleSchema,
  MatchRuleSchema,
  NoiseFigureRuleSchema,
} from "@/engine/scenario/schema";
import type { RuleSpec } from "@/engine/types";

/** Rule kinds a project can hold, with their names in the interface. */
export const RULE_KINDS = ["isolation", "match", "insertion_loss", "drive", "noise_figure", "gain", "headroom"] as const satisfies readonly RuleSpec["kind"][];
export const RULE_KIND_LABELS: Record<RuleSpec["kind"], string> = {
  isolation: "Isolation",
  match: "Match",
  insertion_loss: "Insertion loss",
  drive: "Drive",
  noise_figure: "Noise figure",
  gain: "Gain",
  headroom: "Headroom",
};

const hz = z.number({ error: "Enter a frequency." }).finite().positive({ error: "A frequency must be above 0 Hz." });
const db = z.number({ error: "Enter a value in dB." }).finite();
/** A band [lo, hi] Hz with hi ≥ lo: the engine's band with the edge order checked and messages for people. */
const bandSchema = z.tuple([hz, hz]).refine(([lo, hi]) => hi >= lo, { error: "The band's upper edge must not be below its lower edge." });
const portName = z.string().trim().min(1, { error: "Name a system port." }).max(64);
/** A rule's name: letters, digits, dots, dashes, underscores (it appears in verdicts and bundles). */
export const ruleNameSchema = z
  .string({ error: "Name the rule." })
  .trim()
  .min(1, { error: "Name the rule." })
  .max(64, { error: "Use at most 64 characters." })
  .regex(/^[A-Za-z0-9][A-Za-z0-9._-]*$/, { error: "Use letters, digits, dots, dashes and underscores." });

/**
 * A match rule needs one of its two limits; the engine reads either, the app asks for one. The message
 * names the return-loss field, which the forms show first.
 */
/** A gain rule needs a least or a largest gain (or both, the least not above the largest). */
export const hasGainLimit = (r: { min_db?: number; max_db?: number }) => r.min_db !== undefined || r.max_db !== undefined;

export const hasMatchLimit = (r: { min_return_loss_db?: number; max_vswr?: number }) => r.min_return_loss_db !== undefined || r.max_vswr !== undefined;

/**
 * A project rule as stored and as the API accepts it: the engine's scenario-file rule
 * (engine/scenario/schema.ts, docs/scenario-format.md) extended with a required name in `id`, strict
 * objects and messages for people. Client-safe: the rules form validates with it too.
 */
export const ruleSpecSchema = z.discriminatedUnion("kind", [
  IsolationRuleSchema.extend({ id: ruleNameSchema, from: portName, to: portName, band: bandSchema, min_db: db }).strict(),
  MatchRuleSchema.extend({
    id: ruleNameSchema,
    port: portName,
    band: bandSchema,
    min_return_loss_db: db.min(0, { error: "Return loss is 0 dB or more." }).optional(),
    max_vswr: z.number().finite().min(1, { error: "VSWR is 1 or more." }).optional(),
  })
    .strict()
    .refine(hasMatchLimit, { error: "Give a least return loss or a largest VSWR.", path: ["min_return_loss_db"] }),
  InsertionLossRuleSchema.extend({ id: ruleNameSchema, from: portName, to: portName, band: bandSchema, max_db: db }).strict(),
  DriveRuleSchema.extend({
    id: ruleNameSchema,
    sources: z
      .array(z.object({ port: portName, dbm: z.number({ error: "Enter a power in dBm." }).finite() }).strict())
      .min(1, { error: "Add at least one source." })
      .max(16),
    band: bandSchema.optional(),
  }).strict(),
  NoiseFigureRuleSchema.extend({ id: ruleNameSchema, from: portName, to: portName, band: bandSchema, max_db: db }).strict(),
  GainRuleSchema.extend({ id: ruleNameSchema, from: portName, to: portName, band: bandSchema, min_db: db.optional(), max_db: db.optional() })
    .strict()
    .refine(hasGainLimit, { error: "Give a least gain or a largest gain.", path: ["min_db"] })
    .refine((r) => r.min_db === undefined || r.max_db === undefined || r.min_db <= r.max_db, { error: "The least gain must not be above the largest.", path: ["max_db"] }),
  HeadroomRuleSchema.extend({
    id: ruleNameSchema,
    from: portName,
    to: portName,
    input_dbm: z.number({ error: "Enter an input level in dBm." }).finite().min(-300).max(100),
    min_db: db,
    band: bandSchema.optional(),
  }).strict(),
]);

/** A project rule: the scenario file's rule with its name required. */
export type NamedRuleSpec = z.infer<typeof ruleSpecSchema>;

/** The system ports a rule names (one definition, beside the effective rule set). */
export { rulePorts } from "@/engine/checks/rule-set";
