/**
 * The check queue: jobs live in MariaDB, so nothing is lost while no worker runs.
 * Any number of workers, on any number of machines, claim jobs with
 * SELECT … FOR UPDATE SKIP LOCKED; a job whose worker stopped sending heartbeats is
 * claimed again, and a job that failed MAX_ATTEMPTS times is marked failed.
 *
 * What counts as an attempt: every claim (a worker that dies mid-file — even one killed
 * by the file itself — has used one). A failed check (file not fetchable, plan invalid)
 * uses one. A database outage does not: the worker waits for the database and stores the
 * report it already has. A job handed back at a graceful stop (releaseJob) gets its
 * attempt back.
 */
import { and, asc, eq, sql } from "drizzle-orm";
import type { Db } from "@/db/client";
import { recordAudit } from "@/lib/core/audit";
import { enqueuePoolQuestions } from "@/lib/core/pool-questions-queue";
import { batchVersions, batches, checkJobs, dataPlans, reports } from "@/db/schema";
import type { ReadinessReport } from "@/lib/readiness";
import { now as clockNow } from "@/lib/core/clock";
import { MAX_ATTEMPTS, afterFailure, claimable, giveUpJob, markJobRunning } from "@/lib/core/queue";

export { MAX_ATTEMPTS, STALE_AFTER_MS } from "@/lib/core/queue";

export interface ClaimedJob {
  jobId: number;
  /** the worker holding the claim; heartbeats, completion and release check it */
  workerId: string;
  attempt: number;
  batchVersionId: number;
  batchId: number;
  studyId: number;
  fileKey: string;
  fileName: string;
  fileSize: number;
  plan: unknown;
  planId: number;
}

/** Claim the oldest runnable job, or return null when there is none. */
export async function claimJob(db: Db, workerId: string, now = clockNow()): Promise<ClaimedJob | null> {
  return db.transaction(async (tx) => {
    const [job] = await tx
      .select({ id: checkJobs.id, attempts: checkJobs.attempts, batchVersionId: checkJobs.batchVersionId })
      .from(checkJobs)
      .where(claimable("check", now))
      .orderBy(asc(checkJobs.id))
      .limit(1)
      .for("update", { skipLocked: true });
    // a check job always names its version (only pool-question jobs may not)
    if (!job || job.batchVersionId === null) return null;

    if (job.attempts >= MAX_ATTEMPTS) {
      await giveUpJob(tx, job.id, now, `Gave up after ${job.attempts} attempts.`);
      return null;
    }

    const [row] = await tx
      .select({
        batchId: batchVersions.batchId,
        studyId: batches.studyId,
        fileKey: batchVersions.fileKey,
        fileName: batchVersions.fileName,
        fileSize: batchVersions.fileSize,
        state: batchVersions.state,
        planId: dataPlans.id,
        plan: dataPlans.plan,
      })
      .from(batchVersions)
      .innerJoin(batches, eq(batches.id, batchVersions.batchId))
      .innerJoin(dataPlans, eq(dataPlans.id, batchVersions.planId))
      .where(eq(batchVersions.id, job.batchVersionId));
    if (!row) {
      await giveUpJob(tx, job.id, now, "The batch version no longer exists.");
      return null;
    }

    await markJobRunning(tx, job, workerId, now);
    if (row.state === "received" || row.state === "checking") {
      await tx
        .update(batchVersions)
        .set({ state: "checking", stateChangedAt: now, progressRows: 0, progressBytes: 0 })
        .where(eq(batchVersions.id, job.batchVersionId));
    }
    return {
      jobId: job.id,
      workerId,
      attempt: job.attempts + 1,
      batchVersionId: job.batchVersionId,
      batchId: row.batchId,
      studyId: row.studyId,
      fileKey: row.fileKey,
      fileName: row.fileName,
      fileSize: row.fileSize,
      plan: row.plan,
      planId: row.planId,
    };
  });
}

/** This worker's claim on the job, as a condition: it is still running and still ours. */
function ours(job: ClaimedJob) {
  return and(
    eq(checkJobs.id, job.jobId),
    eq(checkJobs.status, "running"),
    eq(checkJobs.lockedBy, job.workerId),
  );
}

/**
 * Record progress and prove the worker is alive. Returns false when the claim is no longer
 * this worker's (it was taken over as stale, or finished by another worker).
 */
export async function heartbeat(
  db: Db,
  job: ClaimedJob,
  progress: { rows: number; bytes: number },
): Promise<boolean> {
  const now = clockNow();
  const [res] = await db.update(checkJobs).set({ heartbeatAt: now }).where(ours(job));
  if (res.affectedRows === 0) return false;
  await db
    .update(batchVersions)
    .set({ progressRows: progress.rows, progressBytes: progress.bytes })
    .where(and(eq(batchVersions.id, job.batchVersionId), eq(batchVersions.state, "checking")));
  return true;
}

/**
 * Store the report and move the version on, all in one transaction: a report is either
 * written whole with its state change and audit row, or not at all. Safe to repeat: when
 * the job is already done (a retry after a COMMIT whose answer was lost, or another worker
 * that took the job over finished first) nothing is written and false is returned.
 */
export async function completeJob(db: Db, job: ClaimedJob, report: ReadinessReport): Promise<boolean> {
  const now = clockNow();
  return db.transaction(async (tx) => {
    const [jobRow] = await tx
      .select({ status: checkJobs.status })
      .from(checkJobs)
      .where(eq(checkJobs.id, job.jobId))
      .for("update");
    if (!jobRow || jobRow.status === "done") return false;
    const [current] = await tx
      .select({ state: batchVersions.state })
      .from(batchVersions)
      .where(eq(batchVersions.id, job.batchVersionId))
      .for("update");
    const { state: engineState, ...reportBody } = report;
    await tx.insert(reports).values({
      batchVersionId: job.batchVersionId,
      planId: job.planId,
      status: report.status,
      report: reportBody,
      engineState: engineState ?? null,
      blockers: report.counts.blocker,
      warnings: report.counts.warning,
      notes: report.counts.note,
      completeCases: report.rows.complete,
      residualDf: report.model.residualDf,
      engineVersion: report.engineVersion,
    });
    // A version superseded or decided while it was being checked keeps its state.
    const next = report.status === "unreadable" ? "unreadable" : "ready";
    const moves = current?.state === "checking" || current?.state === "received";
    if (moves) {
      await tx
        .update(batchVersions)
        .set({ state: next, stateChangedAt: now, progressRows: report.rows.total })
        .where(eq(batchVersions.id, job.batchVersionId));
      if (next === "ready") await enqueuePoolQuestions(tx, job.studyId, job.batchVersionId);
    }
    await tx
      .update(checkJobs)
      .set({ status: "done", finishedAt: now, lastError: null })
      .where(eq(checkJobs.id, job.jobId));
    await recordAudit(tx, {
      actorId: null,
      action: "batch.checked",
      objectType: "batch_version",
      objectId: String(job.batchVersionId),
      studyId: job.studyId,
      batchId: job.batchId,
      before: { state: current?.state ?? null },
      after: {
        state: moves ? next : (current?.state ?? null),
        blockers: report.counts.blocker,
        warnings: report.counts.warning,
        notes: report.counts.note,
        engineVersion: report.engineVersion,
      },
    });
    return true;
  });
}

/**
 * A failed attempt: back off and let another attempt (or worker) try again; after
 * MAX_ATTEMPTS the job is marked failed. Does nothing when the claim is no longer ours.
 */
export async function failJob(db: Db, job: ClaimedJob, error: unknown): Promise<void> {
  await db.update(checkJobs).set(afterFailure(job.attempt, error)).where(ours(job));
}

/**
 * Hand a claimed job back to the queue at a graceful stop: runnable at once by any worker,
 * with its attempt given back (the stop was ours, not the file's), and its version shown as
 * received again. Returns false when the claim was no longer ours.
 */
export async function releaseJob(db: Db, job: ClaimedJob): Promise<boolean> {
  return db.transaction(async (tx) => {
    const [res] = await tx
      .update(checkJobs)
      .set({
        status: "queued",
        attempts: sql`GREATEST(${checkJobs.attempts} - 1, 0)`,
        lockedBy: null,
        heartbeatAt: null,
        runAfter: clockNow(),
      })
      .where(ours(job));
    if (res.affectedRows === 0) return false;
    await tx
      .update(batchVersions)
      .set({ state: "received", stateChangedAt: clockNow(), progressRows: 0, progressBytes: 0 })
      .where(and(eq(batchVersions.id, job.batchVersionId), eq(batchVersions.state, "checking")));
    return true;
  });
}
