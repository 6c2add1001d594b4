import { z } from "zod";
import { ruleSpecSchema } from "@/lib/domain/rules/schema";

/** POST …/rules and PUT …/rules/:ruleId: `{ spec }`, a project rule (see lib/domain/rules/schema.ts). */
export const ruleBodySchema = z.object({ spec: ruleSpecSchema }).strict();
