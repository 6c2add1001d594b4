import { z } from "zod";
import type { RuleSpec } from "@/engine/types";

/** Rule kinds a project can hold, with their names in the interface. */
export const RULE_KINDS = ["isolation", "match", "insertion_loss", "drive"] as const satisfies readonly RuleSpec["kind"][];
export const RULE_KIND_LABELS: Record<RuleSpec["kind"], string> = {
  isolation: "Isolation",
  match: "Match",
  insertion_loss: "Insertion loss",
  drive: "Drive",
};

const hz = z.number({ error: "Enter a frequency." }).finite().positive({ error: "A frequency must be above 0 Hz." });
const db = z.number({ error: "Enter a value in dB." }).finite();
const band = z.tuple([hz, hz]).refine(([lo, hi]) => hi >= lo, { error: "The band's upper edge must not be below its lower edge." });
const portName = z.string().trim().min(1, { error: "Name a system port." }).max(64);
/** A rule's name: letters, digits, dots, dashes, underscores (it appears in verdicts and bundles). */
export const ruleNameSchema = z
  .string({ error: "Name the rule." })
  .trim()
  .min(1, { error: "Name the rule." })
  .max(64, { error: "Use at most 64 characters." })
  .regex(/^[A-Za-z0-9][A-Za-z0-9._-]*$/, { error: "Use letters, digits, dots, dashes and underscores." });

/**
 * A project rule as stored and as the API accepts it: the scenario file's `RuleSpec` (DESIGN "Scenario
 * file") with a required name in `id`. Client-safe: the rules form validates with it too.
 */
export const ruleSpecSchema = z
  .discriminatedUnion("kind", [
    z.object({ kind: z.literal("isolation"), id: ruleNameSchema, from: portName, to: portName, band, min_db: db, one_way: z.boolean().optional() }).strict(),
    z
      .object({
        kind: z.literal("match"),
        id: ruleNameSchema,
        port: portName,
        band,
        min_return_loss_db: db.min(0, { error: "Return loss is 0 dB or more." }).optional(),
        max_vswr: z.number().finite().min(1, { error: "VSWR is 1 or more." }).optional(),
      })
      .strict()
      .refine((r) => r.min_return_loss_db !== undefined || r.max_vswr !== undefined, { error: "Give a least return loss or a largest VSWR.", path: ["min_return_loss_db"] }),
    z.object({ kind: z.literal("insertion_loss"), id: ruleNameSchema, from: portName, to: portName, band, max_db: db }).strict(),
    z
      .object({
        kind: z.literal("drive"),
        id: ruleNameSchema,
        sources: z.array(z.object({ port: portName, dbm: z.number({ error: "Enter a power in dBm." }).finite() }).strict()).min(1, { error: "Add at least one source." }).max(16),
        band: band.optional(),
        coherent: z.boolean().optional(),
      })
      .strict(),
  ])
  .transform((r) => r as RuleSpec & { id: string });

export type RuleSpecInput = z.input<typeof ruleSpecSchema>;

/** The system ports a rule names. */
export function rulePorts(rule: RuleSpec): string[] {
  switch (rule.kind) {
    case "match":
      return [rule.port];
    case "drive":
      return rule.sources.map((s) => s.port);
    default:
      return [rule.from, rule.to];
  }
}

/** Where a rule in a merged list came from. */
export type RuleSource = "project" | "scenario" | "scenario-override";

export type MergedRule = { spec: RuleSpec; source: RuleSource };

function canonical(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonical).join(",")}]`;
  if (value && typeof value === "object") {
    return `{${Object.keys(value)
      .sort()
      .map((k) => `${JSON.stringify(k)}:${canonical((value as Record<string, unknown>)[k])}`)
      .join(",")}}`;
  }
  return JSON.stringify(value);
}

/**
 * The rules "Run all rules" evaluates: the project's rules merged with the scenario's own `rules`.
 * - project rules come first, in their order;
 * - a scenario rule whose `id` equals a project rule's replaces it in place (the scenario is more specific);
 * - a scenario rule identical to a project rule (same fields) is not repeated;
 * - every other scenario rule follows, in the scenario's order.
 */
export function mergeRules(projectRules: readonly RuleSpec[], scenarioRules: readonly RuleSpec[] = []): MergedRule[] {
  const merged: MergedRule[] = projectRules.map((spec) => ({ spec, source: "project" }));
  const seen = new Set(projectRules.map(canonical));
  for (const rule of scenarioRules) {
    const at = rule.id === undefined ? -1 : merged.findIndex((m) => m.source === "project" && m.spec.id === rule.id);
    if (at >= 0) {
      if (canonical(merged[at].spec) !== canonical(rule)) merged[at] = { spec: rule, source: "scenario-override" };
      continue;
    }
    if (seen.has(canonical(rule))) continue;
    seen.add(canonical(rule));
    merged.push({ spec: rule, source: "scenario" });
  }
  return merged;
}
