import "server-only";
import type { Cookie } from "lucia";
import { z, type ZodType } from "zod";
import { authenticateRequest, type SessionInfo, type SessionUser } from "@/lib/server/auth/session";
import { clientAddress } from "@/lib/server/auth/accounts";
import { getEnv } from "@/lib/base/env";
import { AppError, isAppError } from "@/lib/base/errors";

/** Default limit for JSON request bodies. */
export const DEFAULT_BODY_LIMIT_BYTES = 64 * 1024;

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

export type ErrorBody = { error: { code: string; message: string; fields?: Record<string, string> } };

/** Turn zod issues into `{ "path.to.field": "message" }` (the first message per path). */
export function zodFields(error: z.ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.length > 0 ? issue.path.map(String).join(".") : "_";
    fields[key] ??= issue.message;
  }
  return fields;
}

export function validationError(error: z.ZodError): AppError {
  return new AppError("validation_failed", 400, "Some fields need attention.", zodFields(error));
}

/** Parse with a zod schema, or throw AppError 400 with per-field messages. */
export function parseWith<T>(schema: ZodType<T>, input: unknown): T {
  const result = schema.safeParse(input);
  if (!result.success) throw validationError(result.error);
  return result.data;
}

/** Read the body as text, refusing more than `limit` bytes (413) before anything is parsed. */
export async function readBodyText(request: Request, limit: number = DEFAULT_BODY_LIMIT_BYTES): Promise<string> {
  return (await readBodyBytes(request, limit)).toString("utf8");
}

/**
 * The body as bytes, refusing more than `limit` bytes with 413 before anything is parsed: first by the
 * declared Content-Length, then while streaming (a client may not declare it, or lie).
 */
export async function readBodyBytes(
  request: Request,
  limit: number,
  tooLarge: () => AppError = () => new AppError("payload_too_large", 413, `The request body is larger than ${limit} bytes.`),
): Promise<Buffer> {
  const declared = Number(request.headers.get("content-length"));
  if (Number.isFinite(declared) && declared > limit) throw tooLarge();
  if (!request.body) return Buffer.alloc(0);
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limit) {
      await reader.cancel().catch(() => undefined);
      throw tooLarge();
    }
    chunks.push(value);
  }
  return Buffer.concat(chunks);
}

/** Read a JSON body within the limit (413), as JSON (400), matching the schema (400 with fields). */
export async function readJson<T>(request: Request, schema: ZodType<T>, limit?: number): Promise<T> {
  const text = await readBodyText(request, limit);
  let data: unknown;
  try {
    data = text.trim() === "" ? undefined : JSON.parse(text);
  } catch {
    throw new AppError("bad_request", 400, "The request body is not valid JSON.");
  }
  if (data === undefined || data === null || typeof data !== "object" || Array.isArray(data)) {
    throw new AppError("bad_request", 400, "Send a JSON object as the request body.");
  }
  return parseWith(schema, data);
}

/**
 * Reject cross-site state-changing requests: Origin (or Referer) must name this host, or APP_ORIGIN.
 * Requests without either header are refused too.
 */
export function assertSameOrigin(request: Request): void {
  if (SAFE_METHODS.has(request.method.toUpperCase())) return;
  const origin = request.headers.get("origin");
  const referer = request.headers.get("referer");
  let claimed: URL | null = null;
  try {
    if (origin && origin !== "null") claimed = new URL(origin);
    else if (referer) claimed = new URL(referer);
  } catch {
    claimed = null;
  }
  if (!claimed) throw new AppError("forbidden", 403, "Cross-site request refused: the Origin header is missing.");
  // A cross-site page cannot set X-Forwarded-Host (not a simple header), so accepting it does not weaken the check.
  const hosts = [request.headers.get("host"), request.headers.get("x-forwarded-host"), new URL(request.url).host].filter(Boolean);
  const allowedOrigin = getEnv().appOrigin;
  if (hosts.includes(claimed.host) || (allowedOrigin !== null && claimed.origin === allowedOrigin)) return;
  throw new AppError("forbidden", 403, "Cross-site request refused: the Origin does not match this site.");
}

export function errorResponse(error: AppError): Response {
  const body: ErrorBody = { error: { code: error.code, message: error.message, ...(error.fields ? { fields: error.fields } : {}) } };
  const headers = new Headers({ "content-type": "application/json; charset=utf-8", "cache-control": "no-store" });
  if (error.retryAfterSeconds !== undefined) headers.set("retry-after", String(error.retryAfterSeconds));
  return new Response(JSON.stringify(body), { status: error.status, headers });
}

export function json(data: unknown, init: { status?: number; headers?: HeadersInit } = {}): Response {
  const headers = new Headers(init.headers);
  headers.set("content-type", "application/json; charset=utf-8");
  headers.set("cache-control", "no-store");
  return new Response(JSON.stringify(data), { status: init.status ?? 200, headers });
}

export function noContent(): Response {
  return new Response(null, { status: 204, headers: { "cache-control": "no-store" } });
}

/** What every handler receives. */
export type ApiContext<P extends Record<string, string>> = {
  request: Request;
  /** Route parameters, already checked to be short non-empty strings. */
  params: P;
  /** Client address for throttling. */
  ip: string;
  /** The signed-in user or AppError 401; memoised per request. */
  requireUser: () => Promise<SessionUser>;
  /** The session of the signed-in user (after requireUser). */
  session: () => SessionInfo | null;
  /** Cookies to add to the response (sign-in, sign-out, sliding expiry). */
  setCookie: (cookie: Cookie) => void;
  /** Parse the body: byte limit (413), JSON (400), schema (400 with fields). */
  body: <T>(schema: ZodType<T>, limit?: number) => Promise<T>;
};

type RouteContextIn = { params: Promise<Record<string, string | string[] | undefined>> };

const paramSchema = z.string().min(1).max(100);

/**
 * Wrap a route handler: Origin check on state-changing methods, then the handler (which reads
 * parse → authenticate → load → authorise → mutate → respond), with errors rendered as
 * `{ "error": { code, message, fields? } }` and cookies attached.
 */
export function apiRoute<P extends Record<string, string> = Record<string, never>>(
  handler: (ctx: ApiContext<P>) => Promise<Response>,
): (request: Request, context?: RouteContextIn) => Promise<Response> {
  return async (request, context) => {
    const cookies: Cookie[] = [];
    let response: Response;
    try {
      assertSameOrigin(request);
      const rawParams = context ? await context.params : {};
      const params: Record<string, string> = {};
      for (const [key, value] of Object.entries(rawParams ?? {})) {
        const parsed = paramSchema.safeParse(value);
        if (!parsed.success) throw new AppError("not_found", 404, "Not found.");
        params[key] = parsed.data;
      }
      let userPromise: Promise<SessionUser> | null = null;
      let sessionInfo: SessionInfo | null = null;
      const ctx: ApiContext<P> = {
        request,
        params: params as P,
        ip: clientAddress(request.headers),
        requireUser: () => {
          userPromise ??= authenticateRequest(request).then((result) => {
            if (result.refreshCookie) cookies.push(result.refreshCookie);
            sessionInfo = result.session;
            return result.user;
          });
          return userPromise;
        },
        session: () => sessionInfo,
        setCookie: (cookie) => cookies.push(cookie),
        body: (schema, limit) => readJson(request, schema, limit),
      };
      response = await handler(ctx);
    } catch (error) {
      if (isAppError(error)) {
        response = errorResponse(error);
      } else {
        // Log the error type and message only: request bodies may carry passwords.
        console.error("[api] unexpected error:", error instanceof Error ? `${error.name}: ${error.message}` : String(error));
        response = errorResponse(new AppError("internal", 500, "Something went wrong on the server."));
      }
    }
    for (const cookie of cookies) response.headers.append("set-cookie", cookie.serialize());
    return response;
  };
}
