/**
 * Jobs of kind "pool_questions" in the check queue (check_jobs): a study's pool changed (a
 * version accepted or superseded, a plan published), or a version became ready for review.
 * Claimed like check jobs, with SELECT … FOR UPDATE SKIP LOCKED; a job whose worker went
 * quiet is claimed again after the stale timeout. No `server-only`: the worker writes here.
 */
import { and, asc, desc, eq, gt, inArray, isNull, lte, or, sql } from "drizzle-orm";
import type { Db } from "@/db/client";
import { checkJobs } from "@/db/schema";
import { MAX_ATTEMPTS, STALE_AFTER_MS } from "@/lib/jobs/check-jobs";
import type { DbOrTx } from "@/lib/services/audit";

export const POOL_QUESTIONS_JOB = "pool_questions" as const;

export type PoolQuestionsJob = {
  jobId: number;
  workerId: string;
  attempt: number;
  studyId: number;
  /** the version under review to add ("if accepted"); null: the whole study */
  batchVersionId: number | null;
};

const ofKind = eq(checkJobs.kind, POOL_QUESTIONS_JOB);

/** Jobs whose work includes the given version's (a whole-study job includes every version's). */
const covering = (batchVersionId: number | null) =>
  batchVersionId === null ? isNull(checkJobs.batchVersionId) : or(isNull(checkJobs.batchVersionId), eq(checkJobs.batchVersionId, batchVersionId));

/**
 * Queue the pool questions of a study (no version: the pool and every version under review),
 * or of one version under review. Call it inside the transaction that changes the pool. A job
 * already waiting that covers the same work makes a second one needless.
 */
export async function enqueuePoolQuestions(tx: DbOrTx, studyId: number, batchVersionId: number | null = null): Promise<void> {
  const [waiting] = await tx
    .select({ id: checkJobs.id })
    .from(checkJobs)
    .where(and(ofKind, eq(checkJobs.studyId, studyId), eq(checkJobs.status, "queued"), eq(checkJobs.attempts, 0), covering(batchVersionId)))
    .limit(1)
    // a locking read: a job a worker has just claimed (and may be computing from the old pool) does not count
    .for("update", { skipLocked: true });
  if (waiting) return;
  await tx.insert(checkJobs).values({ kind: POOL_QUESTIONS_JOB, studyId, batchVersionId });
}

/** Claim the oldest runnable pool-questions job, or null when there is none. */
export async function claimPoolQuestionsJob(db: Db, workerId: string, now = new Date()): Promise<PoolQuestionsJob | null> {
  const staleBefore = new Date(now.getTime() - STALE_AFTER_MS);
  return db.transaction(async (tx) => {
    const [job] = await tx
      .select({ id: checkJobs.id, attempts: checkJobs.attempts, studyId: checkJobs.studyId, batchVersionId: checkJobs.batchVersionId })
      .from(checkJobs)
      .where(
        and(
          ofKind,
          or(
            and(eq(checkJobs.status, "queued"), lte(checkJobs.runAfter, now)),
            and(eq(checkJobs.status, "running"), lte(checkJobs.heartbeatAt, staleBefore)),
          ),
        ),
      )
      .orderBy(asc(checkJobs.id))
      .limit(1)
      .for("update", { skipLocked: true });
    if (!job) return null;
    if (job.studyId === null || job.attempts >= MAX_ATTEMPTS) {
      const why = job.studyId === null ? "The job names no study." : `Gave up after ${job.attempts} attempts.`;
      await tx
        .update(checkJobs)
        .set({ status: "failed", finishedAt: now, lastError: sql`CONCAT(COALESCE(${checkJobs.lastError}, ''), ${`\n${why}`})` })
        .where(eq(checkJobs.id, job.id));
      return null;
    }
    await tx
      .update(checkJobs)
      .set({ status: "running", attempts: job.attempts + 1, lockedBy: workerId, heartbeatAt: now })
      .where(eq(checkJobs.id, job.id));
    return { jobId: job.id, workerId, attempt: job.attempts + 1, studyId: job.studyId, batchVersionId: job.batchVersionId };
  });
}

/** The job is still running and still this worker's. */
export function stillOurs(job: PoolQuestionsJob) {
  return and(eq(checkJobs.id, job.jobId), eq(checkJobs.status, "running"), eq(checkJobs.lockedBy, job.workerId));
}

/** Mark the job done (inside the transaction that stores its figures). False when it is no longer ours. */
export async function finishPoolQuestionsJob(tx: DbOrTx, job: PoolQuestionsJob): Promise<boolean> {
  const [res] = await tx.update(checkJobs).set({ status: "done", finishedAt: new Date(), lastError: null }).where(stillOurs(job));
  return res.affectedRows > 0;
}

/** A failed attempt: back off and try again; after MAX_ATTEMPTS the job is marked failed. */
export async function failPoolQuestionsJob(db: Db, job: PoolQuestionsJob, error: unknown): Promise<void> {
  const message = error instanceof Error ? error.message : String(error);
  const final = job.attempt >= MAX_ATTEMPTS;
  await db
    .update(checkJobs)
    .set({
      status: final ? "failed" : "queued",
      lastError: message.slice(0, 4000),
      runAfter: new Date(Date.now() + 2_000 * 2 ** (job.attempt - 1)),
      finishedAt: final ? new Date() : null,
      lockedBy: null,
    })
    .where(stillOurs(job));
}

/**
 * Whether a pool-questions job newer than `afterJobId` is waiting or running for the study
 * (for one version: a job for that version or for the whole study). Pages say "being
 * recomputed" while one is.
 */
export async function pendingPoolQuestions(db: DbOrTx, studyId: number, afterJobId: number, batchVersionId: number | null = null): Promise<boolean> {
  const [row] = await db
    .select({ id: checkJobs.id })
    .from(checkJobs)
    .where(and(ofKind, eq(checkJobs.studyId, studyId), inArray(checkJobs.status, ["queued", "running"]), gt(checkJobs.id, afterJobId), covering(batchVersionId)))
    .orderBy(desc(checkJobs.id))
    .limit(1);
  return Boolean(row);
}
