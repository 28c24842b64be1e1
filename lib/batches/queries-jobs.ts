import "server-only";
import { and, desc, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { batches, batchVersions, checkJobs, organisations, studies } from "@/db/schema";
import { can } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";
import { AppError } from "@/lib/errors";

export type CheckJobItem = {
  id: number;
  status: "queued" | "running" | "done" | "failed";
  attempts: number;
  lockedBy: string | null;
  heartbeatAt: Date | null;
  lastError: string | null;
  createdAt: Date;
  finishedAt: Date | null;
  batchId: string;
  batchTitle: string;
  version: number;
  studyTitle: string;
  organisationName: string;
};

/** How many open check jobs the admins' page lists, newest first. */
export const OPEN_JOBS_SHOWN = 500;

/**
 * Check jobs that are not done (queued, running, failed), newest first — for admins: at most
 * `limit`, and whether there are more, so the page can say so rather than stop silently.
 */
export async function listOpenCheckJobs(
  user: SessionUser,
  limit = OPEN_JOBS_SHOWN,
): Promise<{ jobs: CheckJobItem[]; more: boolean }> {
  if (!can(user.role, "user.manage")) throw new AppError("forbidden");
  const rows = await getDb()
    .select({
      id: checkJobs.id,
      status: checkJobs.status,
      attempts: checkJobs.attempts,
      lockedBy: checkJobs.lockedBy,
      heartbeatAt: checkJobs.heartbeatAt,
      lastError: checkJobs.lastError,
      createdAt: checkJobs.createdAt,
      finishedAt: checkJobs.finishedAt,
      batchId: batches.publicId,
      batchTitle: batches.title,
      version: batchVersions.version,
      studyTitle: studies.title,
      organisationName: organisations.name,
    })
    .from(checkJobs)
    .innerJoin(batchVersions, eq(batchVersions.id, checkJobs.batchVersionId))
    .innerJoin(batches, eq(batches.id, batchVersions.batchId))
    .innerJoin(studies, eq(studies.id, batches.studyId))
    .innerJoin(organisations, eq(organisations.id, batches.organisationId))
    .where(and(eq(checkJobs.kind, "check"), inArray(checkJobs.status, ["queued", "running", "failed"])))
    .orderBy(desc(checkJobs.id))
    .limit(limit + 1);
  return { jobs: rows.slice(0, limit), more: rows.length > limit };
}
