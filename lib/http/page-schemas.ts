/**
 * The items of the five paged lists (lib/http/page.ts), as the OpenAPI document describes them
 * (lib/http/openapi-routes.ts); moments are ISO 8601 text in UTC, as JSON.stringify writes a Date.
 */
import { z } from "zod";
import { BATCH_STATES, ROLES } from "@/db/schema";

const int = z.number().int();
const moment = z.iso.datetime();
const count = int.nullable();

/** An item of GET /api/v1/batches (lib/batches/queries.ts). */
export const batchItemSchema = z
  .object({
    id: int,
    publicId: z.string(),
    title: z.string(),
    studyId: int,
    studySlug: z.string(),
    studyTitle: z.string(),
    organisationId: int,
    organisationName: z.string(),
    latestVersion: int,
    state: z
      .enum(BATCH_STATES)
      .nullable()
      .meta({ description: "The latest version's; null before one arrives." }),
    fileName: z.string().nullable(),
    uploadedAt: moment.nullable(),
    stateChangedAt: moment.nullable(),
    createdAt: moment,
  })
  .meta({ id: "BatchItem" });

/** An item of GET /api/v1/queue (lib/batches/queries-queue.ts). */
export const queueItemSchema = z
  .object({
    batchId: z.string(),
    title: z.string(),
    version: int,
    state: z.enum(BATCH_STATES),
    studyId: int,
    studyTitle: z.string(),
    organisationName: z.string(),
    fileName: z.string(),
    uploadedAt: moment,
    since: moment.meta({ description: "When the version entered its current state." }),
    blockers: count,
    warnings: count,
    notes: count,
    completeCases: count,
    residualDf: count,
  })
  .meta({ id: "QueueItem" });

/** An item of GET /api/v1/audit (lib/people/queries-audit.ts). */
export const auditItemSchema = z
  .object({
    id: int,
    action: z.string(),
    objectType: z.string(),
    objectId: z.string(),
    studyId: int.nullable(),
    batchId: int.nullable(),
    before: z.unknown(),
    after: z.unknown(),
    actorId: int.nullable(),
    actorName: z.string().nullable(),
    createdAt: moment,
  })
  .meta({ id: "AuditEvent" });

/** An item of GET /api/v1/tokens (lib/people/queries.ts): never the token or its hash. */
export const tokenItemSchema = z
  .object({
    id: int,
    name: z.string(),
    prefix: z.string(),
    createdAt: moment,
    lastUsedAt: moment.nullable(),
    revokedAt: moment.nullable(),
  })
  .meta({ id: "TokenItem" });

/** An item of GET /api/v1/admin/users (lib/people/queries.ts): never a password hash. */
export const userItemSchema = z
  .object({
    id: int,
    email: z.string(),
    name: z.string(),
    role: z.enum(ROLES),
    organisationId: int.nullable(),
    organisationName: z.string().nullable(),
    active: z.boolean(),
    createdAt: moment,
    updatedAt: moment,
  })
  .meta({ id: "UserItem" });
