import "server-only";
import { desc, eq, inArray } from "drizzle-orm";
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

/** Check jobs that are not done (queued, running, failed), newest first — for admins. */
export async function listOpenCheckJobs(user: SessionUser): Promise<CheckJobItem[]> {
  if (!can(user.role, "user.manage")) throw new AppError("forbidden");
  return getDb()
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
    .where(inArray(checkJobs.status, ["queued", "running", "failed"]))
    .orderBy(desc(checkJobs.id))
    .limit(500);
}
