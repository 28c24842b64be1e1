/**
 * One typed error for the server side. Its message is safe to show; the cause (database
 * detail, stack) is logged and never sent to the browser or an API client.
 */
import { isDbUnavailable } from "@/db/errors";
import type { Result } from "./result";

export const ERROR_STATUS = {
  bad_request: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  too_large: 413,
  unsupported_type: 415,
  invalid: 422,
  rate_limited: 429,
  unavailable: 503,
  internal: 500,
} as const;

export type ErrorCode = keyof typeof ERROR_STATUS;

const DEFAULT_MESSAGES: Record<ErrorCode, string> = {
  bad_request: "The request could not be read; check its syntax.",
  unauthenticated: "Sign in to continue.",
  forbidden: "Your role does not allow this.",
  not_found: "Not found.",
  conflict: "This conflicts with the current state; reload and try again.",
  too_large: "The request is larger than the limit allows.",
  unsupported_type: "This kind of content is not accepted here.",
  invalid: "The request is not valid.",
  rate_limited: "Too many requests. Wait a little and try again.",
  unavailable: "A service this needs is not available right now; try again shortly.",
  internal: "Something went wrong on our side. The error has been logged.",
};

export class AppError extends Error {
  readonly code: ErrorCode;
  readonly fieldErrors?: Record<string, string[]>;
  /** for rate_limited: seconds until the limit's window ends (the Retry-After header) */
  readonly retryAfterSeconds?: number;

  constructor(
    code: ErrorCode,
    message?: string,
    options?: { cause?: unknown; fieldErrors?: Record<string, string[]>; retryAfterSeconds?: number },
  ) {
    super(message ?? DEFAULT_MESSAGES[code], { cause: options?.cause });
    this.name = "AppError";
    this.code = code;
    this.fieldErrors = options?.fieldErrors;
    this.retryAfterSeconds = options?.retryAfterSeconds;
  }

  get status(): number {
    return ERROR_STATUS[this.code];
  }
}

export function isAppError(e: unknown): e is AppError {
  return e instanceof AppError;
}

/** Turns anything thrown into an AppError; unknown errors become "internal" and are logged. */
export function toAppError(e: unknown, context = "request"): AppError {
  if (e instanceof AppError) return e;
  if (isDbUnavailable(e)) {
    console.error(`[tributary] ${context}: the database is unavailable:`, e instanceof Error ? e.message : e);
    return new AppError("unavailable", "The database is not reachable right now. Try again in a moment.", {
      cause: e,
    });
  }
  console.error(`[tributary] ${context} failed:`, e);
  return new AppError("internal", undefined, { cause: e });
}

/** The data of a successful Result; a failed one thrown as an AppError with its code (default "forbidden"). */
export function unwrap<T>(result: Result<T>): T {
  if (result.ok) return result.data;
  throw new AppError(result.code ?? "forbidden", result.message, { fieldErrors: result.fieldErrors });
}
