import { z } from "zod";

export const SIGNUP_MODES = ["open", "invite"] as const;
export type SignupMode = (typeof SIGNUP_MODES)[number];

export const updateSettingsSchema = z.object({
  signupMode: z.enum(SIGNUP_MODES, { error: "Choose open or invite." }),
});

export const updateUserSchema = z.object({
  isSiteAdmin: z.boolean({ error: "isSiteAdmin must be true or false." }),
});

export const setAccountActiveSchema = z
  .object({
    /** false deactivates the account (its sessions end at once), true reactivates it */
    active: z.boolean({ error: "active must be true or false." }),
  })
  .strict();
