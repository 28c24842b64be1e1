/**
 * The query-string schemas of the v1 API, one per route that takes a query: the routes parse
 * with them, and the OpenAPI document (lib/http/openapi.ts) describes them.
 */
import { z } from "zod";
import { BATCH_STATES } from "@/db/schema";
import { pageParams } from "./page";

const positiveId = (what: string) =>
  z.coerce.number().int().positive(`${what} is a positive whole number.`).optional();

/** GET /api/v1/batches */
export const batchesQuery = z.object({
  studyId: positiveId("studyId"),
  state: z.enum(BATCH_STATES, { error: `state is one of: ${BATCH_STATES.join(", ")}.` }).optional(),
  ...pageParams,
});

/** GET /api/v1/queue, GET /api/v1/tokens, GET /api/v1/admin/users: a page and nothing else */
export const pageQuery = z.object(pageParams);

/** GET /api/v1/audit */
export const auditQuery = z.object({
  objectType: z.string().max(40, "objectType has at most 40 characters.").optional(),
  objectId: z.string().max(64, "objectId has at most 64 characters.").optional(),
  batchId: positiveId("batchId"),
  studyId: positiveId("studyId"),
  beforeId: positiveId("beforeId").meta({
    description: "Only events with a smaller id (the older way to page; `next` carries a cursor instead).",
  }),
  ...pageParams,
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
