import { z } from "zod";
import { InsertionLossRuleSchema, IsolationRuleSchema, MatchRuleSchema } from "@/engine/scenario/schema";
import { hasMatchLimit } from "@/lib/domain/rules/schema";

/** Every check a run can hold (the check-runs route's `check`). */
export const CHECK_NAMES = ["isolation", "match", "insertion_loss", "leak_trace", "power_ledger", "drive", "state_sweep", "stability", "all_rules", "lineup", "spread"] as const;
export type CheckName = (typeof CHECK_NAMES)[number];

/** Names in the interface (helm, results panel, history). */
export const CHECK_TITLES: Record<CheckName, string> = {
  isolation: "Isolation check",
  match: "Match check",
  insertion_loss: "Insertion loss check",
  leak_trace: "Leak trace",
  power_ledger: "Power ledger",
  drive: "Drive check",
  state_sweep: "State sweep",
  stability: "Stability check",
  all_rules: "All rules",
  lineup: "Line-up",
  spread: "Spread analysis",
};

const hz = z.number().finite().positive();
const band = z.tuple([hz, hz]).refine(([lo, hi]) => hi >= lo, { error: "The band's upper edge must not be below its lower edge." });
const port = z.string().trim().min(1).max(64);
const dbValue = z.number().finite();

/** Default and largest sample count of a spread analysis run on the server (the CLI allows more). */
export const SPREAD_DEFAULT_SAMPLES = 500;
export const SPREAD_MAX_SAMPLES = 20_000;

/**
 * Inputs per check; every object is strict, so a misspelt field is a 400, not a silent default. The
 * three rule checks take the engine's rule (engine/scenario/schema.ts) without its kind and name.
 */
export const checkInputSchemas = {
  isolation: IsolationRuleSchema.omit({ kind: true, id: true }).extend({ from: port, to: port, band, min_db: dbValue }).strict(),
  match: MatchRuleSchema.omit({ kind: true, id: true })
    .extend({ port, band, min_return_loss_db: dbValue.min(0).optional(), max_vswr: z.number().finite().min(1).optional() })
    .strict()
    .refine(hasMatchLimit, { error: "Give min_return_loss_db or max_vswr.", path: ["min_return_loss_db"] }),
  insertion_loss: InsertionLossRuleSchema.omit({ kind: true, id: true }).extend({ from: port, to: port, band, max_db: dbValue }).strict(),
  leak_trace: z
    .object({ from: port, to: port, frequencyHz: hz.optional(), band: band.optional(), k: z.number().int().min(1).max(50).optional(), min_db: dbValue.optional() })
    .strict(),
  power_ledger: z.object({ port, band: band.optional() }).strict(),
  drive: z
    .object({ sources: z.array(z.object({ port, dbm: dbValue }).strict()).min(1).max(16).optional(), band: band.optional(), coherent: z.boolean().optional() })
    .strict(),
  state_sweep: z.object({}).strict(),
  stability: z.object({}).strict(),
  all_rules: z.object({}).strict(),
  lineup: z
    .object({
      from: port,
      to: port,
      input_dbm: z.number().finite().min(-300).max(100).optional(),
      blocks: z.array(z.string().trim().min(1).max(64)).min(1).max(200).optional(),
    })
    .strict(),
  // the seed is drawn on the server when absent and stored with the run's inputs, so every run can be repeated
  spread: z
    .object({
      samples: z.number().int().min(1).max(SPREAD_MAX_SAMPLES).default(SPREAD_DEFAULT_SAMPLES),
      seed: z.number().int().min(0).max(Number.MAX_SAFE_INTEGER).optional(),
    })
    .strict(),
} as const satisfies Record<CheckName, z.ZodType>;

/** POST …/check-runs body: the check, its inputs, and the revision (default: the latest). */
export const checkRunRequestSchema = z.discriminatedUnion("check", [
  z.object({ check: z.literal("isolation"), inputs: checkInputSchemas.isolation, revisionId: z.string().min(1).max(100).optional() }).strict(),
  z.object({ check: z.literal("match"), inputs: checkInputSchemas.match, revisionId: z.string().min(1).max(100).optional() }).strict(),
  z.object({ check: z.literal("insertion_loss"), inputs: checkInputSchemas.insertion_loss, revisionId: z.string().min(1).max(100).optional() }).strict(),
  z.object({ check: z.literal("leak_trace"), inputs: checkInputSchemas.leak_trace, revisionId: z.string().min(1).max(100).optional() }).strict(),
  z.object({ check: z.literal("power_ledger"), inputs: checkInputSchemas.power_ledger, revisionId: z.string().min(1).max(100).optional() }).strict(),
  z.object({ check: z.literal("drive"), inputs: checkInputSchemas.drive.default({}), revisionId: z.string().min(1).max(100).optional() }).strict(),
  z.object({ check: z.literal("state_sweep"), inputs: checkInputSchemas.state_sweep.default({}), revisionId: z.string().min(1).max(100).optional() }).strict(),
  z.object({ check: z.literal("stability"), inputs: checkInputSchemas.stability.default({}), revisionId: z.string().min(1).max(100).optional() }).strict(),
  z.object({ check: z.literal("all_rules"), inputs: checkInputSchemas.all_rules.default({}), revisionId: z.string().min(1).max(100).optional() }).strict(),
  z.object({ check: z.literal("lineup"), inputs: checkInputSchemas.lineup, revisionId: z.string().min(1).max(100).optional() }).strict(),
  z.object({ check: z.literal("spread"), inputs: checkInputSchemas.spread.default({ samples: SPREAD_DEFAULT_SAMPLES }), revisionId: z.string().min(1).max(100).optional() }).strict(),
]);
export type CheckRunRequest = z.infer<typeof checkRunRequestSchema>;
