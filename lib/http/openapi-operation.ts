/**
 * One operation of the OpenAPI document (lib/http/openapi.ts) from a short description: what it
 * takes (path, query, JSON or multipart body) and answers, and every refusal it can give, each
 * as RFC 9457 problem details (`application/problem+json`, lib/http/respond.ts).
 */
import { z } from "zod";
import type { ZodOpenApiOperationObject } from "zod-openapi";
import { problemSchema } from "./api-schemas";

export type Op = {
  summary: string;
  tag: string;
  description?: string;
  path?: z.ZodObject;
  query?: z.ZodObject;
  json?: z.ZodType;
  multipart?: z.ZodType;
  status?: 200 | 201 | 202;
  /** the `data` of the answer; an open object when not described */
  data?: z.ZodType;
  /** a CSV or file answer instead of JSON */
  raw?: "text/csv" | "application/octet-stream";
  anonymous?: boolean;
  /** when the operation can answer 409: what conflicts */
  conflict?: string;
  /** a list with a cursor (lib/http/page.ts): `data` is an array of items of `data`, and the answer carries `next` */
  paged?: boolean;
};

const problem = (description: string) => ({
  description,
  content: { "application/problem+json": { schema: problemSchema } },
});

const LOCATION = {
  Location: { description: "The address of what was created.", schema: { type: "string" as const } },
};

const LINK = {
  Link: {
    description:
      'RFC 8288: `<next address>; rel="next"` while another page follows; absent on the last page.',
    schema: { type: "string" as const },
  },
};

/** A page of a list: its items, and the address of the next page (lib/http/page.ts). */
function pageSchema(item: z.ZodType) {
  return z.object({
    data: z.array(item),
    next: z.string().nullable().meta({
      description:
        "The address of the next page (relative to the server; the query kept, the cursor moved on), or null on the last page.",
    }),
  });
}

/** The success answer and every refusal the operation can give. */
function responses(op: Op): ZodOpenApiOperationObject["responses"] {
  const status = op.status ?? 200;
  const success = op.raw
    ? { description: "The file.", content: { [op.raw]: { schema: z.string() } } }
    : op.paged
      ? {
          description: "A page of the list.",
          headers: LINK,
          content: { "application/json": { schema: pageSchema(op.data ?? z.looseObject({})) } },
        }
      : {
          description: status === 201 ? "Created." : status === 202 ? "Accepted." : "Done.",
          ...(status === 201 ? { headers: LOCATION } : {}),
          content: { "application/json": { schema: z.object({ data: op.data ?? z.looseObject({}) }) } },
        };
  const body = op.json || op.multipart;
  return {
    [status]: success,
    ...(body
      ? {
          400: problem(
            op.json ? "The body is not valid JSON." : "The multipart body could not be read (RFC 7578).",
          ),
          415: problem(
            op.json
              ? "The body is not sent as application/json."
              : "The body is not multipart/form-data, or the file is not a CSV file.",
          ),
        }
      : {}),
    ...(op.paged
      ? { 400: problem("The cursor is not one this list gave out; follow `next` unchanged.") }
      : {}),
    ...(op.anonymous
      ? {}
      : {
          401: problem("Not signed in, or the API token is unknown or revoked."),
          403: problem("The role may not do this."),
          429: problem("Too many calls; wait the seconds in Retry-After."),
        }),
    ...(op.path
      ? { 404: problem("Not found, or outside the caller's scope (never 403, so existence does not leak).") }
      : {}),
    ...(op.conflict ? { 409: problem(op.conflict) } : {}),
    ...(op.multipart ? { 413: problem("The file is larger than the upload limit (MAX_UPLOAD_MB).") } : {}),
    ...(op.query || body || op.path
      ? { 422: problem("The input is not valid; `errors` names the fields and what to fix.") }
      : {}),
  };
}

export function operation(op: Op): ZodOpenApiOperationObject {
  return {
    summary: op.summary,
    ...(op.description ? { description: op.description } : {}),
    tags: [op.tag],
    ...(op.anonymous ? { security: [] } : {}),
    requestParams: { ...(op.path ? { path: op.path } : {}), ...(op.query ? { query: op.query } : {}) },
    ...(op.json
      ? { requestBody: { required: true, content: { "application/json": { schema: op.json } } } }
      : {}),
    ...(op.multipart
      ? { requestBody: { required: true, content: { "multipart/form-data": { schema: op.multipart } } } }
      : {}),
    responses: responses(op),
  };
}

/** Path → method → operation. */
export type Routes = Record<string, Partial<Record<"get" | "post" | "put" | "patch" | "delete", Op>>>;
