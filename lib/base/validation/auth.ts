import { z } from "zod";
import { emailSchema, passwordSchema, personNameSchema, tokenSchema } from "./common";

export const signInSchema = z.object({
  email: emailSchema,
  // Sign-in does not enforce the length rules: old passwords must keep working.
  password: z.string({ error: "Enter your password." }).min(1, { error: "Enter your password." }).max(256),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const signUpSchema = z.object({
  name: personNameSchema,
  email: emailSchema,
  password: passwordSchema,
});
export type SignUpInput = z.infer<typeof signUpSchema>;

export const passwordResetRequestSchema = z.object({ email: emailSchema });
export type PasswordResetRequestInput = z.infer<typeof passwordResetRequestSchema>;

export const passwordResetConfirmSchema = z.object({ token: tokenSchema, password: passwordSchema });
export type PasswordResetConfirmInput = z.infer<typeof passwordResetConfirmSchema>;

/** Accepting an invitation: signed-in people send only the token; new people also a name and password. */
export const acceptInvitationSchema = z.object({
  token: tokenSchema,
  name: personNameSchema.optional(),
  password: passwordSchema.optional(),
});
export type AcceptInvitationInput = z.infer<typeof acceptInvitationSchema>;
