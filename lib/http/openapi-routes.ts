/**
 * The reading routes of the v1 API and the upload, as the OpenAPI document (lib/http/openapi.ts)
 * describes them; the routes that do a role's work are in openapi-routes-work.ts.
 */
import { createApiTokenSchema, createUserSchema, updateUserSchema } from "@/lib/people/schemas";
import { meSchema, uploadBodySchema } from "./api-schemas";
import type { Routes } from "./openapi-operation";
import { batchParams, batchVersionParams, idParams, poolParams, studyParams } from "./params";
import { auditQuery, batchesQuery, boardQuery, dictionaryQuery, ifAcceptedQuery, pageQuery } from "./queries";
import {
  auditItemSchema,
  batchItemSchema,
  queueItemSchema,
  tokenItemSchema,
  userItemSchema,
} from "./page-schemas";

const tokenParams = idParams("A token id is a positive whole number.");
const userParams = idParams("A user id is a positive whole number.");

/** Every route of the v1 API: path → method → what it takes and answers. */
export const READ_ROUTES: Routes = {
  "/api/v1/openapi.json": { get: { summary: "This document.", tag: "meta", anonymous: true } },
  "/api/v1/me": {
    get: {
      summary: "The caller, their organisation and what their role allows.",
      tag: "people",
      data: meSchema,
    },
  },
  "/api/v1/studies": { get: { summary: "The studies the caller may see.", tag: "studies" } },
  "/api/v1/studies/{id}": {
    get: {
      summary: "One study, by number or slug, with its current data plan.",
      tag: "studies",
      path: studyParams,
    },
  },
  "/api/v1/studies/{id}/plan": {
    get: {
      summary: "The study's current data plan, its version and hash.",
      tag: "studies",
      path: studyParams,
    },
  },
  "/api/v1/batches": {
    get: {
      summary: "The batches the caller may see, newest first, with their latest state; a page at a time.",
      tag: "batches",
      query: batchesQuery,
      paged: true,
      data: batchItemSchema,
    },
    post: {
      summary: "Upload a batch file (a new batch, or a new version with `batch`).",
      description:
        'Send `Idempotency-Key: "<unique key>"` (1–200 visible ASCII characters) to make retries safe: a repeat with the same key answers the version the first attempt made (with `Idempotent-Replayed: true`), never a second one; the same key with another file, study or batch answers 422.',
      tag: "batches",
      multipart: uploadBodySchema,
      status: 201,
    },
  },
  "/api/v1/batches/{id}": {
    get: { summary: "A batch and its versions.", tag: "batches", path: batchParams },
  },
  "/api/v1/batches/{id}/versions/{version}/report": {
    get: {
      summary: "The version's state, progress while checking, and readiness report.",
      tag: "batches",
      path: batchVersionParams,
    },
  },
  "/api/v1/batches/{id}/versions/{version}/rows-at-fault": {
    get: {
      summary: "The rows behind the report's findings, as formula-safe CSV.",
      tag: "batches",
      path: batchVersionParams,
      raw: "text/csv",
    },
  },
  "/api/v1/batches/{id}/versions/{version}/file": {
    get: {
      summary: "The original file as uploaded.",
      tag: "batches",
      path: batchVersionParams,
      raw: "application/octet-stream",
    },
  },
  "/api/v1/batches/{id}/versions/{version}/changes": {
    get: {
      summary:
        "The change log of a machine-corrected version (row, column, before, after, proposal), as CSV.",
      tag: "batches",
      path: batchVersionParams,
      raw: "text/csv",
    },
  },
  "/api/v1/queue": {
    get: {
      summary: "The review queue (analysts), longest waiting first; a page at a time.",
      tag: "batches",
      query: pageQuery,
      paged: true,
      data: queueItemSchema,
    },
  },
  "/api/v1/pool": { get: { summary: "Each visible study's pool in brief.", tag: "pool" } },
  "/api/v1/pool/{slug}": {
    get: { summary: "The study's pool of accepted data.", tag: "pool", path: poolParams },
  },
  "/api/v1/pool/{slug}/rows": {
    get: {
      summary: "The pool as one CSV with provenance columns.",
      tag: "pool",
      path: poolParams,
      raw: "text/csv",
    },
  },
  "/api/v1/pool/{slug}/dictionary": {
    get: {
      summary: "The pool's data dictionary (JSON, or CSV with format=csv).",
      tag: "pool",
      path: poolParams,
      query: dictionaryQuery,
    },
  },
  "/api/v1/pool/{slug}/if-accepted": {
    get: {
      summary: "The pool's figures if a version were accepted.",
      tag: "pool",
      path: poolParams,
      query: ifAcceptedQuery,
    },
  },
  "/api/v1/pool/{slug}/poolability": {
    get: {
      summary:
        "The pool's questions as the worker last stored them: Chow tests per batch and provider, the whole-pool test, batch influence, the overall F test.",
      tag: "pool",
      path: poolParams,
    },
  },
  "/api/v1/pool/{slug}/selection": {
    get: {
      summary:
        "The selection preview the worker last stored: best subsets by size, forward and backward paths, Cp, AIC, BIC, adjusted R², leave-one-batch-out cross-validation and stability, with the caution.",
      tag: "pool",
      path: poolParams,
    },
  },
  "/api/v1/board": { get: { summary: "The leads' status board.", tag: "board", query: boardQuery } },
  "/api/v1/board/digest": {
    post: { summary: "Queue the weekly digest to every active lead now.", tag: "board", status: 202 },
  },
  "/api/v1/audit": {
    get: {
      summary: "The audit trail, newest first (leads, admins); a page at a time.",
      tag: "people",
      query: auditQuery,
      paged: true,
      data: auditItemSchema,
    },
  },
  "/api/v1/tokens": {
    get: {
      summary: "The caller's API tokens, newest first; a page at a time.",
      tag: "people",
      query: pageQuery,
      paged: true,
      data: tokenItemSchema,
    },
    post: {
      summary: "Create an API token (its value is shown once).",
      tag: "people",
      json: createApiTokenSchema,
      status: 201,
    },
  },
  "/api/v1/tokens/{id}": {
    delete: { summary: "Revoke one of the caller's API tokens.", tag: "people", path: tokenParams },
  },
  "/api/v1/admin/users": {
    get: {
      summary: "Every user (admins), by role and name; a page at a time.",
      tag: "people",
      query: pageQuery,
      paged: true,
      data: userItemSchema,
    },
    post: {
      summary: "Create a user, or invite one (no password: an e-mail link).",
      tag: "people",
      json: createUserSchema,
      status: 201,
    },
  },
  "/api/v1/admin/users/{id}": {
    patch: {
      summary: "Change a user's role and/or active flag (admins).",
      tag: "people",
      path: userParams,
      json: updateUserSchema,
    },
  },
};
