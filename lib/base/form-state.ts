/** What a server action returns to its form (client-safe: types and constants only). */
export type FormState = {
  status: "idle" | "error" | "success";
  message?: string;
  /** Per-field messages, keyed by input name. */
  fields?: Record<string, string>;
  /** What the person typed (never passwords), to refill the form after an error. */
  values?: Record<string, string>;
};

export const IDLE: FormState = { status: "idle" };
