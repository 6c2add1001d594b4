import { z } from "zod";
import { emailSchema, passwordSchema, personNameSchema, tokenSchema } from "./common";

export const changePasswordSchema = z
  .object({
    currentPassword: z.string({ error: "Enter your current password." }).min(1, { error: "Enter your current password." }).max(256),
    newPassword: passwordSchema,
  })
  .strict()
  .refine((v) => v.currentPassword !== v.newPassword, { error: "The new password is the same as the current one.", path: ["newPassword"] });

export const updateProfileSchema = z.object({ name: personNameSchema }).strict();

/** A session as the account page names it: a short public handle, never the stored session id. */
export const sessionHandleSchema = z.string().regex(/^[0-9a-f]{24}$/, { error: "Not a session handle." });

export const changeEmailSchema = z
  .object({
    newEmail: emailSchema,
    currentPassword: z.string({ error: "Enter your current password." }).min(1, { error: "Enter your current password." }).max(256),
  })
  .strict();

export const confirmEmailSchema = z.object({ token: tokenSchema }).strict();
