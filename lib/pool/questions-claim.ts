/**
 * Claiming pool-questions jobs: like check jobs, with SELECT … FOR UPDATE SKIP LOCKED, any
 * number of workers; a job whose worker went quiet is claimed again after the stale timeout,
 * and one that failed MAX_ATTEMPTS times is marked failed.
 */
import { and, asc, eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { checkJobs } from "@/db/schema";
import { MAX_ATTEMPTS, afterFailure, claimable, giveUpJob, markJobRunning } from "@/lib/core/queue";
import type { DbOrTx } from "@/db/client";
import { POOL_QUESTIONS_JOB } from "@/lib/core/pool-questions-queue";

export type PoolQuestionsJob = {
  jobId: number;
  workerId: string;
  attempt: number;
  studyId: number;
  /** the version under review to add ("if accepted"); null: the whole study */
  candidateVersionId: number | null;
};

/** Claim the oldest runnable pool-questions job, or null when there is none. */
export async function claimPoolQuestionsJob(
  db: Db,
  workerId: string,
  now = new Date(),
): Promise<PoolQuestionsJob | null> {
  return db.transaction(async (tx) => {
    const [job] = await tx
      .select({
        id: checkJobs.id,
        attempts: checkJobs.attempts,
        studyId: checkJobs.studyId,
        candidateVersionId: checkJobs.candidateVersionId,
      })
      .from(checkJobs)
      .where(claimable(POOL_QUESTIONS_JOB, now))
      .orderBy(asc(checkJobs.id))
      .limit(1)
      .for("update", { skipLocked: true });
    if (!job) return null;
    if (job.studyId === null || job.attempts >= MAX_ATTEMPTS) {
      const why =
        job.studyId === null ? "The job names no study." : `Gave up after ${job.attempts} attempts.`;
      await giveUpJob(tx, job.id, now, why);
      return null;
    }
    await markJobRunning(tx, job, workerId, now);
    return {
      jobId: job.id,
      workerId,
      attempt: job.attempts + 1,
      studyId: job.studyId,
      candidateVersionId: job.candidateVersionId,
    };
  });
}

/** The job is still running and still this worker's. */
export function stillOurs(job: PoolQuestionsJob) {
  return and(
    eq(checkJobs.id, job.jobId),
    eq(checkJobs.status, "running"),
    eq(checkJobs.lockedBy, job.workerId),
  );
}

/** Mark the job done (inside the transaction that stores its figures). False when it is no longer ours. */
export async function finishPoolQuestionsJob(tx: DbOrTx, job: PoolQuestionsJob): Promise<boolean> {
  const [res] = await tx
    .update(checkJobs)
    .set({ status: "done", finishedAt: new Date(), lastError: null })
    .where(stillOurs(job));
  return res.affectedRows > 0;
}

/** A failed attempt: back off and try again; after MAX_ATTEMPTS the job is marked failed. */
export async function failPoolQuestionsJob(db: Db, job: PoolQuestionsJob, error: unknown): Promise<void> {
  await db.update(checkJobs).set(afterFailure(job.attempt, error)).where(stillOurs(job));
}
