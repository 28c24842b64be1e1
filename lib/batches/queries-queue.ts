import "server-only";
import { and, desc, eq, inArray } from "drizzle-orm";
import { alias } from "drizzle-orm/mysql-core";
import { getDb } from "@/db/client";
import { batches, batchVersions, organisations, reports, studies, type BatchState } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session";
import { batchScope } from "@/lib/studies";

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

/**
 * The review queue: the latest version of every batch in the user's scope that waits on
 * the analysts (ready for review, unreadable) or on the checks (received, checking).
 */
export async function listQueueForUser(user: SessionUser): Promise<QueueItem[]> {
  const latest = alias(batchVersions, "queue_version");
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
      reportId: reports.id,
    })
    .from(batches)
    .innerJoin(latest, and(eq(latest.batchId, batches.id), eq(latest.version, batches.latestVersion)))
    .innerJoin(studies, eq(studies.id, batches.studyId))
    .innerJoin(organisations, eq(organisations.id, batches.organisationId))
    .leftJoin(reports, eq(reports.batchVersionId, latest.id))
    .where(and(batchScope(user), inArray(latest.state, [...QUEUE_STATES])))
    .orderBy(latest.stateChangedAt, desc(reports.id))
    .limit(2000);
  // a re-checked version has several reports: keep the newest
  const seen = new Set<string>();
  const out: QueueItem[] = [];
  for (const { reportId: _r, ...row } of rows) {
    const key = `${row.batchId}:${row.version}`;
    if (seen.has(key)) continue;
    seen.add(key);
    out.push(row);
  }
  return out;
}
