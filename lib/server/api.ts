import "server-only";
import type { Cookie } from "lucia";
import { z, type ZodType } from "zod";
import { authenticateRequest, type SessionInfo, type SessionUser } from "@/lib/server/auth/session";
import { clientAddress } from "@/lib/server/auth/accounts";
import { authenticateApiToken } from "@/lib/server/auth/api-tokens";
import { runWithTokenScope, type TokenScope } from "@/lib/server/auth/token-scope";
import { getEnv } from "@/lib/base/env";
import { claimedOrigin, isAllowedOrigin } from "@/lib/base/origins";
import { AppError, isAppError } from "@/lib/base/errors";
import { STRICT_TRANSPORT_SECURITY } from "@/lib/base/security-headers";

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
 * Reject cross-site state-changing requests: the whole Origin (else Referer) origin, scheme, host and
 * port, must be APP_URL's (or APP_ORIGIN); X-Forwarded-Host counts only behind TRUST_PROXY. Requests
 * without either header are refused too.
 */
export function assertSameOrigin(request: Request): void {
  if (SAFE_METHODS.has(request.method.toUpperCase())) return;
  if (!claimedOrigin(request.headers)) throw new AppError("forbidden", 403, "Cross-site request refused: the Origin header is missing.");
  if (isAllowedOrigin(request, getEnv().originPolicy)) return;
  throw new AppError("forbidden", 403, "Cross-site request refused: the Origin does not match this site.");
}

/**
 * The token of an `Authorization: Bearer …` header, or null when there is none. Other schemes (a Basic
 * login asked for by a proxy in front of the app, say) are not ours and are ignored.
 */
export function bearerToken(request: Request): string | null {
  const header = request.headers.get("authorization");
  if (!header || !/^Bearer(\s|$)/i.test(header.trim())) return null;
  const match = /^Bearer\s+(\S+)\s*$/i.exec(header.trim());
  if (!match) throw new AppError("unauthenticated", 401, "Send the API token as: Authorization: Bearer <token>.");
  return match[1];
}

/** Personal API tokens work on the project API only: never on account, token, admin or auth routes. */
function acceptsApiTokens(request: Request): boolean {
  return /^\/api\/projects\/[^/]+(\/|$)/.test(new URL(request.url).pathname);
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
  /** Client address for throttling (null unless TRUST_PROXY names the proxies in front of the app). */
  ip: string | null;
  /** The signed-in user (session cookie, or personal API token on the project API) or AppError 401; memoised per request. */
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

export type ApiRouteOptions = {
  /**
   * Public routes (sign-in, sign-up, resets, invitations) run without a signed-in user. Every other route
   * checks the session before its handler runs, so nothing about the body is read or validated for a
   * stranger.
   */
  public?: boolean;
};

/**
 * Wrap a route handler: a readable URL (400), then the Origin check on state-changing methods and the
 * session (or `Authorization: Bearer` token on the project API), then the handler (which reads
 * parse → load → authorise → mutate → respond), with errors rendered as
 * `{ "error": { code, message, fields? } }` and cookies attached.
 */
export function apiRoute<P extends Record<string, string> = Record<string, never>>(
  handler: (ctx: ApiContext<P>) => Promise<Response>,
  options: ApiRouteOptions = {},
): (request: Request, context?: RouteContextIn) => Promise<Response> {
  return async (request, context) => {
    const cookies: Cookie[] = [];
    let response: Response;
    try {
      assertDecodablePath(request);
      const token = bearerToken(request);
      let userPromise: Promise<SessionUser> | null = null;
      let sessionInfo: SessionInfo | null = null;
      let scope: TokenScope | null = null;
      if (token !== null) {
        if (options.public || !acceptsApiTokens(request)) {
          throw new AppError("forbidden", 403, "API tokens work only on the project API (/api/projects/…), never for accounts, tokens or sign-in.");
        }
        // No cookie is involved, so a cross-site page cannot make this request on someone's behalf: no Origin check.
        const authenticated = await authenticateApiToken(token);
        scope = authenticated.scope;
        userPromise = Promise.resolve(authenticated.user);
      } else {
        assertSameOrigin(request);
      }
      const requireUser = () => {
        userPromise ??= authenticateRequest(request).then((result) => {
          if (result.refreshCookie) cookies.push(result.refreshCookie);
          sessionInfo = result.session;
          return result.user;
        });
        return userPromise;
      };
      if (!options.public) await requireUser();
      const rawParams = context ? await context.params : {};
      const params: Record<string, string> = {};
      for (const [key, value] of Object.entries(rawParams ?? {})) {
        const parsed = paramSchema.safeParse(value);
        if (!parsed.success) throw new AppError("not_found", 404, "Not found.");
        params[key] = parsed.data;
      }
      const ctx: ApiContext<P> = {
        request,
        params: params as P,
        ip: clientAddress(request.headers),
        requireUser,
        session: () => sessionInfo,
        setCookie: (cookie) => cookies.push(cookie),
        body: (schema, limit) => readJson(request, schema, limit),
      };
      const tokenScope = scope;
      response = tokenScope ? await runWithTokenScope(tokenScope, () => handler(ctx)) : await handler(ctx);
    } catch (error) {
      if (isAppError(error)) {
        response = errorResponse(error);
      } else if (error instanceof URIError) {
        response = errorResponse(malformedUrl());
      } else {
        // Log the error type and message only: request bodies may carry passwords.
        console.error("[api] unexpected error:", error instanceof Error ? `${error.name}: ${error.message}` : String(error));
        response = errorResponse(new AppError("internal", 500, "Something went wrong on the server."));
      }
    }
    for (const cookie of cookies) response.headers.append("set-cookie", cookie.serialize());
    // the other security headers of the API come from next.config.ts (lib/base/security-headers.ts)
    if (getEnv().originPolicy.appOrigin.startsWith("https:")) response.headers.set("strict-transport-security", STRICT_TRANSPORT_SECURITY);
    return response;
  };
}

function malformedUrl(): AppError {
  return new AppError("bad_request", 400, "The URL has a malformed percent-encoding (a % not followed by two hex digits of valid UTF-8).");
}

/** 400 when the path cannot be percent-decoded, before anything tries to (and fails with a 500). */
function assertDecodablePath(request: Request): void {
  try {
    decodeURIComponent(new URL(request.url).pathname);
  } catch {
    throw malformedUrl();
  }
}
