import "server-only";
import { cookies, headers } from "next/headers";
import { getEnv } from "@/lib/base/env";
import { safeRedirectPath } from "@/lib/base/origins";
import { unstable_rethrow } from "next/navigation";
import type { ZodType } from "zod";
import { validationError } from "@/lib/server/api";
import { AppError, isAppError } from "@/lib/base/errors";
import type { FormState } from "@/lib/base/form-state";

/** Fields never sent back to the browser in `values`. */
const SECRET_FIELDS = new Set(["password", "confirmPassword", "token"]);

/** Plain string entries of a form, for validation. */
export function formEntries(formData: FormData): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [key, value] of formData.entries()) {
    if (typeof value === "string" && !key.startsWith("$ACTION")) out[key] = value;
  }
  return out;
}

function safeValues(values: Record<string, string>): Record<string, string> {
  return Object.fromEntries(Object.entries(values).filter(([key]) => !SECRET_FIELDS.has(key)));
}

/** Validate with zod or throw AppError 400 (rendered as field messages by `runAction`). */
export function parseForm<T>(schema: ZodType<T>, values: unknown): T {
  const result = schema.safeParse(values);
  if (!result.success) throw validationError(result.error);
  return result.data;
}

/**
 * Run a server action body and turn AppErrors into form state. Redirects and other Next.js control
 * flow pass through. Unexpected errors are logged without their input and shown as a general message.
 */
export async function runAction(formData: FormData, work: (values: Record<string, string>) => Promise<FormState | void>): Promise<FormState> {
  const values = formEntries(formData);
  try {
    return (await work(values)) ?? { status: "success" };
  } catch (error) {
    unstable_rethrow(error);
    if (isAppError(error)) {
      return { status: "error", message: error.message, fields: error.fields, values: safeValues(values) };
    }
    console.error("[action] unexpected error:", error instanceof Error ? `${error.name}: ${error.message}` : String(error));
    return { status: "error", message: "Something went wrong on the server. Try again.", values: safeValues(values) };
  }
}

/** What sign-in may know about the client of the current request (server actions), for throttling. */
export async function actionSignInClient(): Promise<{ address: string | null; deviceCookie: string | null }> {
  const { clientAddress } = await import("@/lib/server/auth/accounts");
  const { DEVICE_COOKIE_NAME } = await import("@/lib/server/auth/device");
  const store = await cookies();
  return { address: clientAddress(await headers()), deviceCookie: store.get(DEVICE_COOKIE_NAME)?.value ?? null };
}

/**
 * A path on this site to go to after signing in or accepting an invitation, or the fallback: the one
 * helper for every `next` or return target (see lib/base/origins.ts safeRedirectPath).
 */
export function safeNextPath(value: string | null | undefined, fallback = "/projects"): string {
  return safeRedirectPath(value, getEnv().originPolicy.appOrigin, fallback);
}

export { AppError };
