/**
 * The one result shape of services, server actions and forms: success carries data,
 * failure a message (and field errors shown next to their fields).
 */
export type Result<T> = { ok: true; data: T } | { ok: false; message: string; fieldErrors?: Record<string, string[]> };

export function ok<T>(data: T): Result<T> {
  return { ok: true, data };
}

export function fail<T = never>(message: string, fieldErrors?: Record<string, string[]>): Result<T> {
  return fieldErrors ? { ok: false, message, fieldErrors } : { ok: false, message };
}

/** Field errors from a zod error, keyed by the top-level field name. */
export function fieldErrorsOf(issues: ReadonlyArray<{ path: ReadonlyArray<PropertyKey>; message: string }>): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const issue of issues) {
    const key = issue.path.length > 0 ? String(issue.path[0]) : "_form";
    (out[key] ??= []).push(issue.message);
  }
  return out;
}
