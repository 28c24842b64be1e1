/**
 * The query-string schemas of the v1 API, one per route that takes a query: the routes parse
 * with them, and the OpenAPI document (lib/http/openapi.ts) describes them.
 */
import { z } from "zod";
import { BATCH_STATES } from "@/db/schema";

const positiveId = (what: string) =>
  z.coerce.number().int().positive(`${what} is a positive whole number.`).optional();

/** GET /api/v1/batches */
export const batchesQuery = z.object({
  studyId: positiveId("studyId"),
  state: z.enum(BATCH_STATES, { error: `state is one of: ${BATCH_STATES.join(", ")}.` }).optional(),
  limit: z.coerce.number().int().min(1).max(2000, "limit is at most 2000.").optional(),
});

/** GET /api/v1/audit */
export const auditQuery = z.object({
  objectType: z.string().max(40, "objectType has at most 40 characters.").optional(),
  objectId: z.string().max(64, "objectId has at most 64 characters.").optional(),
  batchId: positiveId("batchId"),
  studyId: positiveId("studyId"),
  beforeId: positiveId("beforeId"),
  limit: z.coerce.number().int().min(1, "limit is at least 1.").max(500, "limit is at most 500.").optional(),
});

/** GET /api/v1/board */
export const boardQuery = z.object({
  weeks: z.coerce.number().int().min(1, "weeks is at least 1.").max(104, "weeks is at most 104.").default(12),
});

/** GET /api/v1/pool/{slug}/if-accepted */
export const ifAcceptedQuery = z.object({
  batch: z.string().min(1, "batch is the batch's id.").max(32),
  version: z.coerce.number().int().positive("version is a positive whole number."),
});

/** GET /api/v1/pool/{slug}/dictionary */
export const dictionaryQuery = z.object({
  format: z.enum(["json", "csv"], { error: "format is json or csv." }).default("json"),
});
