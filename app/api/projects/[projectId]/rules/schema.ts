import { z } from "zod";
import { ruleSpecSchema } from "@/components/rules/rule-spec";

/** POST …/rules and PUT …/rules/:ruleId: `{ spec }`, a project rule (see components/rules/rule-spec.ts). */
export const ruleBodySchema = z.object({ spec: ruleSpecSchema }).strict();
export type RuleBody = z.infer<typeof ruleBodySchema>;
