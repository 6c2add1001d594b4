/**
 * Turns a zod issue into one sentence a person can act on ("expected a number ≥ 0, got -1").
 */
import type { z } from "zod";

function describeValue(value: unknown): string {
  if (value === undefined) return "nothing";
  if (value === null) return "null";
  if (Array.isArray(value)) return "an array";
  if (typeof value === "object") return "an object";
  const text = JSON.stringify(value);
  return text.length > 40 ? `${text.slice(0, 37)}...` : text;
}

function article(type: string): string {
  const names: Record<string, string> = {
    number: "a number",
    string: "a string",
    object: "an object",
    array: "an array",
    boolean: "true or false",
    int: "an integer",
    tuple: "an array",
    record: "an object",
  };
  return names[type] ?? type;
}

function valueAt(root: unknown, path: readonly PropertyKey[]): unknown {
  let at: unknown = root;
  for (const key of path) {
    if (at === null || typeof at !== "object") return undefined;
    at = (at as Record<PropertyKey, unknown>)[key as string];
  }
  return at;
}

/**
 * Message for one zod issue, without its path.
 *
 * @param issue - a zod v4 issue
 * @param root - the value that was validated, to quote what was given
 * @returns e.g. `expected a number ≥ 0, got -1`
 * @example
 * describeIssue(issue, input); // "expected one of \"error\", \"hold\", got \"maybe\""
 */
export function describeIssue(issue: z.core.$ZodIssue, root: unknown): string {
  const given = valueAt(root, issue.path);
  switch (issue.code) {
    case "invalid_type":
      if (given === undefined) return `required: expected ${article(issue.expected)}`;
      return `expected ${article(issue.expected)}, got ${describeValue(given)}`;
    case "too_small": {
      if (issue.origin === "array") return `expected at least ${issue.minimum} item${Number(issue.minimum) === 1 ? "" : "s"}`;
      if (issue.origin === "string") return issue.minimum === 1 ? "must not be empty" : `expected at least ${issue.minimum} characters`;
      return `expected a number ${issue.inclusive ? "≥" : ">"} ${issue.minimum}, got ${describeValue(given)}`;
    }
    case "too_big": {
      if (issue.origin === "array") return `expected at most ${issue.maximum} items`;
      if (issue.origin === "string") return `expected at most ${issue.maximum} characters`;
      return `expected a number ${issue.inclusive ? "≤" : "<"} ${issue.maximum}, got ${describeValue(given)}`;
    }
    case "invalid_value":
      return issue.values.length === 1
        ? `expected ${JSON.stringify(issue.values[0])}, got ${describeValue(given)}`
        : `expected one of ${issue.values.map((v) => JSON.stringify(v)).join(", ")}, got ${describeValue(given)}`;
    case "unrecognized_keys":
      return `unknown field${issue.keys.length === 1 ? "" : "s"} ${issue.keys.map((k) => `"${k}"`).join(", ")}`;
    case "invalid_union":
      if ("options" in issue && Array.isArray((issue as { options?: unknown[] }).options)) {
        const options = (issue as { options: unknown[] }).options;
        return `expected one of ${options.map((v) => JSON.stringify(v)).join(", ")}, got ${describeValue(given)}`;
      }
      return issue.message;
    case "invalid_format":
      return issue.message;
    default:
      return issue.message;
  }
}
