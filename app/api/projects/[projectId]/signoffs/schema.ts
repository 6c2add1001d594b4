import { z } from "zod";
import { idSchema } from "@/lib/base/validation/common";

export const requestSignoffSchema = z.object({
  scenarioId: idSchema,
  /** the revision to sign off; the latest when left out */
  revisionId: idSchema.optional(),
  reviewerIds: z.array(idSchema, { error: "Choose at least one reviewer." }).min(1, { error: "Choose at least one reviewer." }).max(20, { error: "Ask at most 20 reviewers at once." }),
  note: z.string().trim().max(2000, { error: "Use at most 2000 characters." }).optional(),
});

/** One failing rule (or built-in check) a reviewer waives, and why. */
export const waivedRuleSchema = z
  .object({
    id: z.string({ error: "Name the failing rule." }).trim().min(1, { error: "Name the failing rule." }).max(64),
    reason: z.string({ error: "Give the reason for waiving this rule." }).trim().min(1, { error: "Give the reason for waiving this rule." }).max(2000, { error: "Use at most 2000 characters." }),
  })
  .strict();

export const decideSignoffSchema = z.object({
  decision: z.enum(["approved", "changes_requested"], { error: "Choose approve or request changes." }),
  comment: z.string().trim().max(4000, { error: "Use at most 4000 characters." }).default(""),
  /** to approve a revision whose verdict fails: each failing rule with a reason */
  waiver: z.array(waivedRuleSchema).max(100, { error: "Waive at most 100 rules." }).optional(),
});
