import type { z } from "zod";
import { AppError } from "@/lib/errors";
import { fieldErrorsOf } from "@/lib/result";

function check<S extends z.ZodType>(schema: S, value: unknown, what: string): z.infer<S> {
  const r = schema.safeParse(value);
  if (!r.success) {
    const fieldErrors = fieldErrorsOf(r.error.issues);
    const first = r.error.issues[0];
    throw new AppError("invalid", `The ${what} is not valid${first ? `: ${first.message}` : "."}`, {
      fieldErrors,
    });
  }
  return r.data;
}

/** The JSON body checked against `schema`; bad JSON or a bad shape → AppError("invalid"). */
export async function parseJsonBody<S extends z.ZodType>(req: Request, schema: S): Promise<z.infer<S>> {
  const type = req.headers.get("content-type") ?? "";
  if (!type.includes("application/json"))
    throw new AppError("invalid", "Send the request body as JSON (Content-Type: application/json).");
  let body: unknown;
  try {
    body = await req.json();
  } catch {
    throw new AppError("invalid", "The request body is not valid JSON.");
  }
  return check(schema, body, "request body");
}

/** Query-string parameters checked against `schema`. */
export function parseQuery<S extends z.ZodType>(req: Request, schema: S): z.infer<S> {
  return check(schema, Object.fromEntries(new URL(req.url).searchParams), "query string");
}

/** Path parameters checked against `schema`. */
export function parseParams<S extends z.ZodType>(params: unknown, schema: S): z.infer<S> {
  return check(schema, params, "address");
}
