/**
 * The job queue's rules, shared by every job kind in check_jobs (a batch's check, a study's
 * pool questions) and so kept outside both features (no `server-only`: the worker loads it): how many
 * attempts, when a running job's worker counts as gone, which jobs may be claimed, and what a
 * failed attempt leaves behind.
 */
import os from "node:os";
import { and, eq, lte, or, sql } from "drizzle-orm";
import type { DbOrTx } from "@/db/client";
import { checkJobs, type JOB_KINDS } from "@/db/schema";
import { now as clockNow } from "@/lib/core/clock";
import { msFromEnv } from "@/lib/env";

export const MAX_ATTEMPTS = 3;

/**
 * A running job without a heartbeat for this long belongs to a dead worker and is claimed
 * again. TRIBUTARY_JOB_STALE_MS (default 60 000); workers send heartbeats every quarter of it.
 */
export const STALE_AFTER_MS = msFromEnv("TRIBUTARY_JOB_STALE_MS", 60_000);

/** Jobs of a kind that may be claimed now: queued and due, or running without a heartbeat for STALE_AFTER_MS. */
export function claimable(kind: (typeof JOB_KINDS)[number], now: Date) {
  const staleBefore = new Date(now.getTime() - STALE_AFTER_MS);
  return and(
    eq(checkJobs.kind, kind),
    or(
      and(eq(checkJobs.status, "queued"), lte(checkJobs.runAfter, now)),
      and(eq(checkJobs.status, "running"), lte(checkJobs.heartbeatAt, staleBefore)),
    ),
  );
}

/** The job's row after a failed attempt: queued again after a back-off, or failed after MAX_ATTEMPTS. */
export function afterFailure(attempt: number, error: unknown) {
  const message = error instanceof Error ? error.message : String(error);
  const final = attempt >= MAX_ATTEMPTS;
  const backoffMs = 2_000 * 2 ** (attempt - 1);
  return {
    status: final ? ("failed" as const) : ("queued" as const),
    lastError: message.slice(0, 4000),
    runAfter: new Date(clockNow().getTime() + backoffMs),
    finishedAt: final ? clockNow() : null,
    lockedBy: null,
  };
}

/** Marks a claimed job failed for good, adding why to its errors (a job that can never run). */
export async function giveUpJob(tx: DbOrTx, jobId: number, now: Date, why: string): Promise<void> {
  await tx
    .update(checkJobs)
    .set({
      status: "failed",
      finishedAt: now,
      lastError: sql`CONCAT(COALESCE(${checkJobs.lastError}, ''), ${`\n${why}`})`,
    })
    .where(eq(checkJobs.id, jobId));
}

/** Marks a claimed job running for this worker: one more attempt, a fresh heartbeat. */
export async function markJobRunning(
  tx: DbOrTx,
  job: { id: number; attempts: number },
  workerId: string,
  now: Date,
): Promise<void> {
  await tx
    .update(checkJobs)
    .set({ status: "running", attempts: job.attempts + 1, lockedBy: workerId, heartbeatAt: now })
    .where(eq(checkJobs.id, job.id));
}

/** A worker's name in locked_by: host, process id and a random tag. */
export function defaultWorkerId(): string {
  return `${os.hostname()}:${process.pid}:${Math.random().toString(36).slice(2, 8)}`;
}
