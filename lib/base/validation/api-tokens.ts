import { z } from "zod";
import { TOKEN_CEILINGS } from "@/db/schema";
import { idSchema, nameSchema } from "./common";

/** Longest lifetime of a personal API token. */
export const API_TOKEN_MAX_DAYS = 365;

export const createApiTokenSchema = z.object({
  name: nameSchema({ required: "Name the token (what script or pipeline uses it).", max: 80 }),
  expiresInDays: z.coerce
    .number({ error: "Choose how many days the token lasts." })
    .int({ error: "Use a whole number of days." })
    .min(1, { error: "A token lasts at least 1 day." })
    .max(API_TOKEN_MAX_DAYS, { error: `A token lasts at most ${API_TOKEN_MAX_DAYS} days.` }),
  projectIds: z
    .array(idSchema, { error: "Choose the projects the token may reach." })
    .min(1, { error: "Choose at least one project." })
    .max(100, { error: "Choose at most 100 projects." }),
  roleCeiling: z.enum(TOKEN_CEILINGS, { error: "Choose read, reviewer, engineer or owner." }),
});
export type CreateApiTokenInput = z.infer<typeof createApiTokenSchema>;
