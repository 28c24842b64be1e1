import "server-only";
import { and, desc, eq, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/mysql-core";
import { getDb } from "@/db/client";
import { batches, batchVersions, organisations, studies, users, type BatchState } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session";
import { batchScope } from "@/lib/studies";
import { afterKey, keysetList, pageOf, rowsToRead, type Page, type PageRequest } from "@/lib/http/keyset";

export type BatchSummary = {
  id: number;
  publicId: string;
  title: string;
  studyId: number;
  studySlug: string;
  studyTitle: string;
  organisationId: number;
  organisationName: string;
  latestVersion: number;
  /** state of the latest version; null while no version has arrived */
  state: BatchState | null;
  fileName: string | null;
  uploadedAt: Date | null;
  stateChangedAt: Date | null;
  createdAt: Date;
};

export type BatchVersionSummary = {
  id: number;
  version: number;
  planId: number;
  fileName: string;
  fileSize: number;
  contentHash: string | null;
  state: BatchState;
  progressRows: number;
  progressBytes: number;
  uploadedById: number | null;
  uploadedByName: string | null;
  uploadedAt: Date;
  stateChangedAt: Date;
};

export type BatchDetail = BatchSummary & { versions: BatchVersionSummary[] };

const latest = alias(batchVersions, "latest_version");
const orgs = alias(organisations, "batch_org");

const batchColumns = {
  id: batches.id,
  publicId: batches.publicId,
  title: batches.title,
  studyId: batches.studyId,
  studySlug: studies.slug,
  studyTitle: studies.title,
  organisationId: batches.organisationId,
  organisationName: orgs.name,
  latestVersion: batches.latestVersion,
  state: latest.state,
  fileName: latest.fileName,
  uploadedAt: latest.uploadedAt,
  stateChangedAt: latest.stateChangedAt,
  createdAt: batches.createdAt,
};

function batchQuery(where: SQL | undefined) {
  return getDb()
    .select(batchColumns)
    .from(batches)
    .innerJoin(studies, eq(studies.id, batches.studyId))
    .innerJoin(orgs, eq(orgs.id, batches.organisationId))
    .leftJoin(latest, and(eq(latest.batchId, batches.id), eq(latest.version, batches.latestVersion)))
    .where(where);
}

type BatchFilter = { studyId?: number; state?: BatchState };

/** The batch list pages newest first by (created, id): the id breaks ties between batches of one moment. */
export const BATCH_LIST = keysetList<[Date, number]>("batches", ["date", "int"]);

/**
 * A page of the batches the user may see, newest first, each with its latest version's state.
 * Providers see their organisation's, analysts those of their assigned studies, leads and admins all.
 */
export async function pageBatchesForUser(
  user: SessionUser,
  opts: BatchFilter & PageRequest<[Date, number]>,
): Promise<Page<BatchSummary, [Date, number]>> {
  const where = and(
    batchScope(user),
    opts.studyId !== undefined ? eq(batches.studyId, opts.studyId) : undefined,
    opts.state !== undefined ? eq(latest.state, opts.state) : undefined,
    afterKey([batches.createdAt, batches.id], opts.after, "desc"),
  );
  const rows = await batchQuery(where)
    .orderBy(desc(batches.createdAt), desc(batches.id))
    .limit(rowsToRead(opts.limit));
  return pageOf(rows, opts.limit, (b) => [b.createdAt, b.id]);
}

/** The first `limit` (default 500) batches of pageBatchesForUser, for summaries that show a few. */
export async function listBatchesForUser(
  user: SessionUser,
  opts: BatchFilter & { limit?: number } = {},
): Promise<BatchSummary[]> {
  return (await pageBatchesForUser(user, { ...opts, limit: opts.limit ?? 500 })).rows;
}

/**
 * One batch by its public id with all its versions, or null when it does not exist or is
 * outside the user's scope (callers answer 404 either way, so existence does not leak).
 */
export async function getBatchForUser(user: SessionUser, publicId: string): Promise<BatchDetail | null> {
  if (!/^[A-Za-z0-9_-]{1,32}$/.test(publicId)) return null;
  const rows = await batchQuery(and(eq(batches.publicId, publicId), batchScope(user))).limit(1);
  const batch = rows[0];
  if (!batch) return null;
  const versions = await getDb()
    .select({
      id: batchVersions.id,
      version: batchVersions.version,
      planId: batchVersions.planId,
      fileName: batchVersions.fileName,
      fileSize: batchVersions.fileSize,
      contentHash: batchVersions.contentHash,
      state: batchVersions.state,
      progressRows: batchVersions.progressRows,
      progressBytes: batchVersions.progressBytes,
      uploadedById: batchVersions.uploadedById,
      uploadedByName: users.name,
      uploadedAt: batchVersions.uploadedAt,
      stateChangedAt: batchVersions.stateChangedAt,
    })
    .from(batchVersions)
    .leftJoin(users, eq(users.id, batchVersions.uploadedById))
    .where(eq(batchVersions.batchId, batch.id))
    .orderBy(desc(batchVersions.version));
  return { ...batch, versions };
}
