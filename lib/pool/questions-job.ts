/**
 * The worker's loop for pool-questions jobs (kind "pool_questions" in check_jobs): claim,
 * compute from the stored states, store with the job marked done. Runs beside the check loop
 * in the worker process; any number of workers may run it. At its start it queues the studies
 * whose stored figures do not match their pool (a database from before this job kind, or a
 * pool changed by a path that queued nothing).
 */
import { and, eq, isNull } from "drizzle-orm";
import type { Db } from "@/db/client";
import { isDbUnavailable } from "@/db/errors";
import { batches, batchVersions, ifAcceptedQuestions, poolQuestions, studies } from "@/db/schema";
import { defaultWorkerId } from "@/lib/core/queue";
import { sleep } from "@/lib/sleep";
import { acceptedVersionIds, describesPool } from "./questions";
import { rebuildStalePools } from "./stored";
import { computeStudyQuestions, storeStudyQuestions } from "./questions-compute";
import { claimPoolQuestionsJob, failPoolQuestionsJob, type PoolQuestionsJob } from "./questions-claim";
import { enqueuePoolQuestions } from "@/lib/core/pool-questions-queue";

type Log = (line: string) => void;

const describe = (e: unknown) => (e instanceof Error ? e.message.split("\n")[0] : String(e));

/** Runs one claimed job to its end: figures stored, or the attempt recorded as failed. */
export async function runPoolQuestionsJob(
  db: Db,
  job: PoolQuestionsJob,
  log: Log = () => undefined,
): Promise<boolean> {
  const what =
    job.candidateVersionId === null
      ? `study ${job.studyId}`
      : `version ${job.candidateVersionId} of study ${job.studyId}`;
  try {
    const started = Date.now();
    const q = await computeStudyQuestions(db, job.studyId, job.candidateVersionId);
    const stored = await storeStudyQuestions(db, job, q);
    log(
      stored
        ? `pool questions job ${job.jobId} done: ${what}, ${q ? `${q.versionIds.length} accepted, ${q.candidates.length} under review` : "no plan yet"} (${Date.now() - started} ms)`
        : `pool questions job ${job.jobId}: the claim was taken over; not stored`,
    );
    return stored;
  } catch (error) {
    log(`pool questions job ${job.jobId} (${what}) attempt ${job.attempt} failed: ${describe(error)}`);
    await failPoolQuestionsJob(db, job, error).catch((e: unknown) =>
      log(`pool questions job ${job.jobId}: recording the failure failed: ${describe(e)}`),
    );
    return false;
  }
}

/**
 * Queues a whole-study job for every study with a plan whose stored pool questions are
 * missing, computed under another plan version or over other accepted versions, or that
 * lack "if accepted" figures for a version ready for review. Returns how many were queued.
 */
export async function enqueueStalePools(db: Db): Promise<number> {
  const withPlan = await db.select({ id: studies.id, planVersion: studies.currentPlanVersion }).from(studies);
  const stored = new Map(
    (
      await db
        .select({
          studyId: poolQuestions.studyId,
          planVersion: poolQuestions.planVersion,
          versionIds: poolQuestions.versionIds,
        })
        .from(poolQuestions)
    ).map((r) => [r.studyId, r]),
  );
  const accepted = await acceptedVersionIds(db);
  const unanswered = await db
    .select({ studyId: batches.studyId })
    .from(batchVersions)
    .innerJoin(batches, eq(batches.id, batchVersions.batchId))
    .leftJoin(ifAcceptedQuestions, eq(ifAcceptedQuestions.batchVersionId, batchVersions.id))
    .where(and(eq(batchVersions.state, "ready"), isNull(ifAcceptedQuestions.id)));
  const lacking = new Set(unanswered.map((r) => r.studyId));
  let queued = 0;
  for (const s of withPlan) {
    if (s.planVersion == null) continue;
    const row = stored.get(s.id);
    const covers =
      row && describesPool(row, { planVersion: s.planVersion, versionIds: accepted.get(s.id) ?? [] });
    if (covers && !lacking.has(s.id)) continue;
    await db.transaction((tx) => enqueuePoolQuestions(tx, s.id));
    queued++;
  }
  return queued;
}

export interface PoolQuestionsWorkerOptions {
  db: Db;
  workerId?: string;
  signal?: AbortSignal;
  pollMs?: number;
  log?: Log;
}

/** Claims and runs pool-questions jobs until the signal aborts; database errors pause the loop, never end it. */
export async function runPoolQuestionsWorker(opts: PoolQuestionsWorkerOptions): Promise<void> {
  const workerId = opts.workerId ?? defaultWorkerId();
  const log = opts.log ?? (() => undefined);
  const pollMs = opts.pollMs ?? 1000;
  try {
    const r = await rebuildStalePools(opts.db);
    if (r)
      log(`stored pools: rebuilt ${r} ${r === 1 ? "study's" : "studies'"} pool from the accepted versions`);
  } catch (error) {
    log(`stored pools: could not rebuild out-of-date pools (${describe(error)}); pages merge them afresh`);
  }
  try {
    const n = await enqueueStalePools(opts.db);
    if (n)
      log(
        `pool questions: queued ${n} ${n === 1 ? "study" : "studies"} whose stored figures do not match the pool`,
      );
  } catch (error) {
    log(
      `pool questions: could not look for out-of-date pools (${describe(error)}); new changes are still queued`,
    );
  }
  let down = 0;
  while (!opts.signal?.aborted) {
    let job: PoolQuestionsJob | null = null;
    try {
      job = await claimPoolQuestionsJob(opts.db, workerId);
      down = 0;
    } catch (error) {
      if (down === 0 || !isDbUnavailable(error))
        log(`could not claim a pool questions job: ${describe(error)}`);
      down++;
      await sleep(Math.min(5_000, pollMs * 2 ** Math.min(down - 1, 3)), opts.signal);
      continue;
    }
    if (job) await runPoolQuestionsJob(opts.db, job, log);
    else await sleep(pollMs, opts.signal);
  }
}
