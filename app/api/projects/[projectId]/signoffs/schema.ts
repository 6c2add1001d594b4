import { z } from "zod";
import { idSchema } from "@/lib/base/validation/common";

export const requestSignoffSchema = z.object({
  scenarioId: idSchema,
  /** the revision to sign off; the latest when left out */
  revisionId: idSchema.optional(),
  reviewerIds: z.array(idSchema, { error: "Choose at least one reviewer." }).min(1, { error: "Choose at least one reviewer." }).max(20, { error: "Ask at most 20 reviewers at once." }),
  note: z.string().trim().max(2000, { error: "Use at most 2000 characters." }).optional(),
});

export const decideSignoffSchema = z.object({
  decision: z.enum(["approved", "changes_requested"], { error: "Choose approve or request changes." }),
  comment: z.string().trim().max(4000, { error: "Use at most 4000 characters." }).default(""),
});
