import { z } from "zod";
import { CONTROL_CHARACTER_MESSAGE, refuseControlCharacters } from "./common";

/** Largest Touchstone file accepted for upload. */
export const PART_MAX_BYTES = 5 * 1024 * 1024;

/** Touchstone 1.1 names its port count in the extension (.s1p … .sNp); 2.0 files may be .ts. */
export const PART_FILE_NAME_PATTERN = /^[A-Za-z0-9][A-Za-z0-9._ -]{0,150}\.(s[1-9][0-9]?p|ts)$/i;

export const partFileNameSchema = z
  .string({ error: "Choose a Touchstone file." })
  .trim()
  .regex(PART_FILE_NAME_PATTERN, {
    error: "Use a Touchstone file name ending .s1p … .sNp or .ts (letters, digits, spaces, dots, dashes and underscores).",
  });

export const partNameSchema = z
  .string()
  .trim()
  .max(120, { error: "Use at most 120 characters." })
  .refine(refuseControlCharacters, { error: CONTROL_CHARACTER_MESSAGE });
