import "server-only";
import { and, asc, eq, gt, inArray, isNull } from "drizzle-orm";
import { alias } from "drizzle-orm/mysql-core";
import { getDb } from "@/db/client";
import { batches, batchVersions, organisations, reports, studies, type BatchState } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session";
import { batchScope } from "@/lib/studies";
import { afterKey, keysetList, pageOf, rowsToRead, type Page, type PageRequest } from "@/lib/http/keyset";
import { PAGE_MAX } from "@/lib/http/page";

export type QueueItem = {
  batchId: string;
  title: string;
  version: number;
  state: BatchState;
  studyId: number;
  studyTitle: string;
  organisationName: string;
  fileName: string;
  uploadedAt: Date;
  /** when the version entered its current state (the wait starts here) */
  since: Date;
  blockers: number | null;
  warnings: number | null;
  notes: number | null;
  completeCases: number | null;
  residualDf: number | null;
};

export const QUEUE_STATES = [
  "ready",
  "unreadable",
  "checking",
  "received",
] as const satisfies readonly BatchState[];

/** The queue pages oldest wait first by (state since, version id): the version id breaks ties. */
export const QUEUE_LIST = keysetList<[Date, number]>("queue", ["date", "int"]);

/**
 * A page of the review queue: the latest version of every batch in the user's scope that waits
 * on the analysts (ready for review, unreadable) or on the checks (received, checking), longest
 * waiting first, each with its newest report (a re-checked version has several).
 */
export async function pageQueueForUser(
  user: SessionUser,
  page: PageRequest<[Date, number]>,
): Promise<Page<QueueItem, [Date, number]>> {
  const latest = alias(batchVersions, "queue_version");
  const newer = alias(reports, "newer_report");
  const rows = await getDb()
    .select({
      batchId: batches.publicId,
      title: batches.title,
      version: latest.version,
      state: latest.state,
      studyId: batches.studyId,
      studyTitle: studies.title,
      organisationName: organisations.name,
      fileName: latest.fileName,
      uploadedAt: latest.uploadedAt,
      since: latest.stateChangedAt,
      blockers: reports.blockers,
      warnings: reports.warnings,
      notes: reports.notes,
      completeCases: reports.completeCases,
      residualDf: reports.residualDf,
      versionId: latest.id,
    })
    .from(batches)
    .innerJoin(latest, and(eq(latest.batchId, batches.id), eq(latest.version, batches.latestVersion)))
    .innerJoin(studies, eq(studies.id, batches.studyId))
    .innerJoin(organisations, eq(organisations.id, batches.organisationId))
    .leftJoin(reports, eq(reports.batchVersionId, latest.id))
    // no newer report of the same version: the newest one, or none yet
    .leftJoin(newer, and(eq(newer.batchVersionId, latest.id), gt(newer.id, reports.id)))
    .where(
      and(
        batchScope(user),
        inArray(latest.state, [...QUEUE_STATES]),
        isNull(newer.id),
        afterKey([latest.stateChangedAt, latest.id], page.after, "asc"),
      ),
    )
    .orderBy(asc(latest.stateChangedAt), asc(latest.id))
    .limit(rowsToRead(page.limit));
  const got = pageOf(rows, page.limit, (r) => [r.since, r.versionId] as [Date, number]);
  return { ...got, rows: got.rows.map(({ versionId: _v, ...row }) => row) };
}

/** The first `limit` rows of the queue (the whole of it for a small one). */
export async function listQueueForUser(user: SessionUser, limit = PAGE_MAX): Promise<QueueItem[]> {
  return (await pageQueueForUser(user, { limit })).rows;
}
