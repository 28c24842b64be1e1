/**
 * Shapes of the v1 API that the routes and the OpenAPI document (lib/http/openapi.ts) share:
 * the error body every refusal carries, the upload's multipart fields, and the caller's own
 * record (GET /api/v1/me).
 */
import { z } from "zod";
import { ROLES } from "@/db/schema";
import { ACTIONS } from "@/lib/auth/permissions";
import { ERROR_STATUS, type ErrorCode } from "@/lib/errors";

const ERROR_CODES = Object.keys(ERROR_STATUS) as [ErrorCode, ...ErrorCode[]];

/** `{ error: { code, message, fieldErrors? } }` (lib/http/respond.ts). */
export const errorBodySchema = z
  .object({
    error: z.object({
      code: z.enum(ERROR_CODES),
      message: z.string().meta({ description: "What went wrong and what to do; safe to show." }),
      fieldErrors: z.record(z.string(), z.array(z.string())).optional(),
    }),
  })
  .meta({ id: "Error" });

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
