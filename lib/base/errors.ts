/** Machine-readable error codes returned in `{ error: { code } }`. */
export type ErrorCode =
  | "bad_request"
  | "validation_failed"
  | "unauthenticated"
  | "forbidden"
  | "not_found"
  | "conflict"
  | "payload_too_large"
  | "unsupported_media_type"
  | "unprocessable"
  | "too_many_requests"
  | "too_large"
  | "job_timeout"
  | "job_cancelled"
  | "internal";

/** One error type for the whole app: a code, an HTTP status and a message a person can act on. */
export class AppError extends Error {
  readonly code: ErrorCode;
  readonly status: number;
  readonly fields?: Record<string, string>;
  readonly retryAfterSeconds?: number;

  constructor(
    code: ErrorCode,
    status: number,
    message: string,
    fields?: Record<string, string>,
    options?: { retryAfterSeconds?: number },
  ) {
    super(message);
    this.name = "AppError";
    this.code = code;
    this.status = status;
    this.fields = fields;
    this.retryAfterSeconds = options?.retryAfterSeconds;
  }
}

export function isAppError(value: unknown): value is AppError {
  return value instanceof AppError;
}

export const notFound = (what = "Not found.") => new AppError("not_found", 404, what);
export const forbidden = (why = "You do not have permission to do that.") => new AppError("forbidden", 403, why);
export const unauthenticated = () => new AppError("unauthenticated", 401, "Sign in to continue.");
export const conflict = (why: string) => new AppError("conflict", 409, why);
