/**
 * Jobs of kind "pool_questions" in the check queue (check_jobs), queued inside the transaction
 * that changes a study's pool (a version accepted or superseded, a plan published) or makes a
 * version ready for review. No `server-only`: services and the worker both queue them.
 */
import { and, desc, eq, gt, inArray, isNull, or } from "drizzle-orm";
import { checkJobs } from "@/db/schema";
import type { DbOrTx } from "@/db/client";

export const POOL_QUESTIONS_JOB = "pool_questions" as const;

const ofKind = eq(checkJobs.kind, POOL_QUESTIONS_JOB);

/** Jobs whose work includes the given version's (a whole-study job includes every version's). */
const covering = (candidateVersionId: number | null) =>
  candidateVersionId === null
    ? isNull(checkJobs.candidateVersionId)
    : or(isNull(checkJobs.candidateVersionId), eq(checkJobs.candidateVersionId, candidateVersionId));

/** This study's pool-questions jobs whose work includes the given version's (or the whole study's). */
const jobsFor = (studyId: number, candidateVersionId: number | null) =>
  and(ofKind, eq(checkJobs.studyId, studyId), covering(candidateVersionId));

/**
 * Queue the pool questions of a study (no version: the pool and every version under review),
 * or of one version under review. Call it inside the transaction that changes the pool. A job
 * already waiting that covers the same work makes a second one needless.
 */
export async function enqueuePoolQuestions(
  tx: DbOrTx,
  studyId: number,
  candidateVersionId: number | null = null,
): Promise<void> {
  const [waiting] = await tx
    .select({ id: checkJobs.id })
    .from(checkJobs)
    .where(
      and(jobsFor(studyId, candidateVersionId), eq(checkJobs.status, "queued"), eq(checkJobs.attempts, 0)),
    )
    .limit(1)
    // a locking read: a job a worker has just claimed (and may be computing from the old pool) does not count
    .for("update", { skipLocked: true });
  if (waiting) return;
  await tx.insert(checkJobs).values({ kind: POOL_QUESTIONS_JOB, studyId, candidateVersionId });
}

/**
 * Whether a pool-questions job newer than `afterJobId` is waiting or running for the study
 * (for one version: a job for that version or for the whole study). Pages say "being
 * recomputed" while one is.
 */
export async function pendingPoolQuestions(
  db: DbOrTx,
  studyId: number,
  afterJobId: number,
  candidateVersionId: number | null = null,
): Promise<boolean> {
  const [row] = await db
    .select({ id: checkJobs.id })
    .from(checkJobs)
    .where(
      and(
        jobsFor(studyId, candidateVersionId),
        inArray(checkJobs.status, ["queued", "running"]),
        gt(checkJobs.id, afterJobId),
      ),
    )
    .orderBy(desc(checkJobs.id))
    .limit(1);
  return Boolean(row);
}
