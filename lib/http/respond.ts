/** JSON answers of the v1 API: `{ data }` on success, `{ error: { code, message, fieldErrors? } }` on failure. */
import { AppError, ERROR_STATUS, toAppError, type ErrorCode } from "@/lib/errors";
import type { Result } from "@/lib/result";
import { attachmentDisposition } from "@/lib/batches/intake/file-rules";

const NO_STORE = { "cache-control": "no-store" };

/** `{ data }` with `status`; a 201 names what it created in `location` (the Location header). */
export function jsonData(data: unknown, status = 200, location?: string): Response {
  return Response.json({ data }, { status, headers: { ...NO_STORE, ...(location ? { location } : {}) } });
}

export function jsonError(
  code: ErrorCode,
  message: string,
  fieldErrors?: Record<string, string[]>,
  extraHeaders?: Record<string, string>,
): Response {
  return Response.json(
    { error: { code, message, ...(fieldErrors ? { fieldErrors } : {}) } },
    { status: ERROR_STATUS[code], headers: { ...NO_STORE, ...extraHeaders } },
  );
}

/** Any thrown value as a safe JSON error; unexpected ones are logged, never echoed. */
export function errorResponse(e: unknown, context: string): Response {
  const err = e instanceof AppError ? e : toAppError(e, context);
  const headers: Record<string, string> = {};
  if (err.code === "unauthenticated") headers["www-authenticate"] = 'Bearer realm="tributary"';
  if (err.retryAfterSeconds !== undefined) headers["retry-after"] = String(err.retryAfterSeconds);
  return jsonError(err.code, err.message, err.fieldErrors, headers);
}

/** A service Result as JSON: data with `successStatus`, or the failure's code (422 by default). */
export function resultResponse<T>(result: Result<T>, successStatus = 200): Response {
  if (result.ok) return jsonData(result.data, successStatus);
  return jsonError(result.code ?? "invalid", result.message, result.fieldErrors);
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
