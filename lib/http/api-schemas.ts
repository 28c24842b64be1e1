/**
 * Shapes of the v1 API that the routes and the OpenAPI document (lib/http/openapi.ts) share:
 * the problem details every refusal carries, the upload's multipart fields, and the caller's own
 * record (GET /api/v1/me).
 */
import { z } from "zod";
import { ROLES } from "@/db/schema";
import { ACTIONS } from "@/lib/auth/permissions";
import { ERROR_STATUS, type ErrorCode } from "@/lib/errors";

const ERROR_CODES = Object.keys(ERROR_STATUS) as [ErrorCode, ...ErrorCode[]];

/** RFC 9457 problem details, the body of every refusal (lib/http/respond.ts). */
export const problemSchema = z
  .object({
    type: z.string().meta({ description: "The problem type, a URI (tag:tributary,2026:problem:<code>)." }),
    title: z.string().meta({ description: "A short summary of the problem type." }),
    status: z.number().int().min(400).max(599),
    detail: z.string().meta({ description: "What went wrong here and what to do about it; safe to show." }),
    instance: z.string().meta({ description: "The address that was asked." }),
    code: z.enum(ERROR_CODES),
    errors: z
      .record(z.string(), z.array(z.string()))
      .optional()
      .meta({ description: "For bad input: each field's messages, keyed by the field's name." }),
  })
  .meta({ id: "Problem" });

/** The text fields of POST /api/v1/batches; the file comes in the part `file`. */
export const uploadFieldsSchema = z.object({
  study: z.string().trim().min(1, "Name the study by its slug in the field 'study'."),
  batch: z.string().trim().min(1).max(32).optional(),
  label: z.string().trim().max(200, "Keep the label under 200 characters.").optional(),
});

/** What the multipart body of an upload holds, for the document. */
export const uploadBodySchema = uploadFieldsSchema.extend({
  file: z.string().meta({ description: "The CSV file.", contentMediaType: "text/csv" }),
});

/** GET /api/v1/me */
export const meSchema = z
  .object({
    id: z.number().int(),
    email: z.string(),
    name: z.string(),
    role: z.enum(ROLES),
    organisation: z.object({ id: z.number().int(), name: z.string() }).nullable(),
    permissions: z.array(z.enum(ACTIONS)),
    via: z.enum(["session", "token"]),
  })
  .meta({ id: "Me" });
