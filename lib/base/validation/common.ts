import { z } from "zod";

export const emailSchema = z
  .string({ error: "Enter an e-mail address." })
  .trim()
  .toLowerCase()
  .max(254, { error: "That e-mail address is too long." })
  .pipe(z.email({ error: "Enter a valid e-mail address." }));

export const passwordSchema = z
  .string({ error: "Enter a password." })
  .min(8, { error: "Use at least 8 characters." })
  .max(256, { error: "Use at most 256 characters." });

export const personNameSchema = z
  .string({ error: "Enter your name." })
  .trim()
  .min(1, { error: "Enter your name." })
  .max(100, { error: "Use at most 100 characters." });

export const roleSchema = z.enum(["owner", "engineer", "reviewer"], { error: "Choose owner, engineer or reviewer." });

export const idSchema = z.string().min(1).max(100);

/** Random tokens from lib/server/auth/tokens (43 base64url characters); a little slack for other lengths. */
export const tokenSchema = z
  .string({ error: "The link is missing its token." })
  .regex(/^[A-Za-z0-9_-]{20,200}$/, { error: "The link is not valid." });
