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

/**
 * The JSON body checked against `schema`: another content type → 415, a body that is not JSON →
 * 400, JSON of the wrong shape → 422 with the fields named.
 */
export async function parseJsonBody<S extends z.ZodType>(req: Request, schema: S): Promise<z.infer<S>> {
  const type = (req.headers.get("content-type") ?? "").split(";")[0]!.trim().toLowerCase();
  if (type !== "application/json" && !/^application\/[\w.+-]+\+json$/.test(type))
    throw new AppError(
      "unsupported_type",
      "Send the request body as JSON, with the header Content-Type: application/json.",
    );
  let body: unknown;
  try {
    body = await req.json();
  } catch {
    throw new AppError(
      "bad_request",
      "The request body is not valid JSON. Check quotes, commas and brackets (RFC 8259).",
    );
  }
  return check(schema, body, "request body");
}

/**
 * The JSON body as sent, after checking it against `schema` as parseJsonBody does: for a
 * service that parses its input itself (a schema's output need not parse again).
 */
export async function checkedJsonBody(req: Request, schema: z.ZodType): Promise<unknown> {
  const raw = req.clone();
  await parseJsonBody(req, schema);
  return raw.json();
}

/** Query-string parameters checked against `schema`. */
export function parseQuery<S extends z.ZodType>(req: Request, schema: S): z.infer<S> {
  return check(schema, Object.fromEntries(new URL(req.url).searchParams), "query string");
}

/** Path parameters checked against `schema`. */
export function parseParams<S extends z.ZodType>(params: unknown, schema: S): z.infer<S> {
  return check(schema, params, "address");
}
