import type { ErrorCode } from "./errors";

/**
 * The one result shape of services, server actions and forms: success carries data,
 * failure a message (and field errors shown next to their fields). `code` lets a route
 * handler answer with the right HTTP status (lib/errors.ts ERROR_STATUS).
 */
export type Result<T> =
  | { ok: true; data: T }
  | {
      ok: false;
      message: string;
      fieldErrors?: Record<string, string[]>;
      code?: ErrorCode;
      /** for code rate_limited: seconds until the limit's window ends (Retry-After on the API) */
      retryAfterSeconds?: number;
    };

export function ok<T>(data: T): Result<T> {
  return { ok: true, data };
}

export function fail<T = never>(
  message: string,
  fieldErrors?: Record<string, string[]>,
  code?: ErrorCode,
): Result<T> {
  return {
    ok: false,
    message,
    ...(fieldErrors ? { fieldErrors } : {}),
    ...(code ? { code } : fieldErrors ? { code: "invalid" as const } : {}),
  };
}

/** Field errors from a zod error, keyed by the top-level field name. */
export function fieldErrorsOf(
  issues: ReadonlyArray<{ path: ReadonlyArray<PropertyKey>; message: string }>,
): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const issue of issues) {
    const key = issue.path.length > 0 ? String(issue.path[0]) : "_form";
    (out[key] ??= []).push(issue.message);
  }
  return out;
}
