/**
 * Answers of the v1 API: `{ data }` on success; on failure one shape, RFC 9457 problem details
 * (`application/problem+json`): `type`, `title`, `status`, `detail` (what went wrong and what
 * to do), `instance` (the address asked), plus `code` and, for bad input, `errors` (field → messages).
 */
import { AppError, ERROR_STATUS, toAppError, type ErrorCode } from "@/lib/errors";
import type { Result } from "@/lib/result";
import { attachmentDisposition } from "@/lib/batches/intake/file-rules";

const NO_STORE = { "cache-control": "no-store" };

/** The short, fixed summary of each kind of problem (RFC 9457 §3.1.3: the same for every occurrence). */
export const PROBLEM_TITLES: Record<ErrorCode, string> = {
  bad_request: "The request could not be read",
  unauthenticated: "Not signed in",
  forbidden: "Not allowed for this role",
  not_found: "Not found",
  conflict: "Conflicts with the current state",
  too_large: "Too large",
  unsupported_type: "Unsupported content type",
  invalid: "The input is not valid",
  rate_limited: "Too many requests",
  unavailable: "Temporarily unavailable",
  internal: "Internal error",
};

/** The problem type's URI: a tag URI (RFC 4151), an identifier that is not meant to be fetched. */
export const problemType = (code: ErrorCode) => `tag:tributary,2026:problem:${code}`;

/** `{ data }` with `status`; a 201 names what it created in `location` (the Location header). */
export function jsonData(data: unknown, status = 200, location?: string): Response {
  return Response.json({ data }, { status, headers: { ...NO_STORE, ...(location ? { location } : {}) } });
}

/** An AppError as problem details; `instance` is the address that was asked. */
export function problemResponse(err: AppError, instance: string): Response {
  const status = ERROR_STATUS[err.code];
  const headers: Record<string, string> = { ...NO_STORE, "content-type": "application/problem+json" };
  if (err.code === "unauthenticated") headers["www-authenticate"] = 'Bearer realm="tributary"';
  if (err.retryAfterSeconds !== undefined) headers["retry-after"] = String(err.retryAfterSeconds);
  const body = {
    type: problemType(err.code),
    title: PROBLEM_TITLES[err.code],
    status,
    detail: err.message,
    instance,
    code: err.code,
    ...(err.fieldErrors ? { errors: err.fieldErrors } : {}),
  };
  return new Response(JSON.stringify(body), { status, headers });
}

/** Any thrown value as safe problem details; unexpected ones are logged, never echoed. */
export function errorResponse(e: unknown, req: Request): Response {
  const path = new URL(req.url).pathname;
  const err = e instanceof AppError ? e : toAppError(e, `${req.method} ${path}`);
  return problemResponse(err, path);
}

/**
 * A service Result as an answer: its data with `successStatus` (and a Location header from
 * `location` for a 201), or its failure thrown as an AppError (422 by default), which
 * apiRoute answers as problem details.
 */
export function resultResponse<T>(
  result: Result<T>,
  successStatus = 200,
  location?: (data: T) => string,
): Response {
  if (result.ok) return jsonData(result.data, successStatus, location?.(result.data));
  throw new AppError(result.code ?? "invalid", result.message, {
    fieldErrors: result.fieldErrors,
    retryAfterSeconds: result.retryAfterSeconds,
  });
}

/** A CSV download: streamed or whole, never cached, never sniffed; `fileName` through one RFC 6266 header. */
export function csvResponse(
  body: BodyInit,
  fileName: string,
  extraHeaders?: Record<string, string>,
): Response {
  return new Response(body, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": attachmentDisposition(fileName),
      "cache-control": "no-store",
      "x-content-type-options": "nosniff",
      ...extraHeaders,
    },
  });
}
