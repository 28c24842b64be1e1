/**
 * The check worker: claims a job, streams the stored file through the readiness engine,
 * records progress as it goes and stores the report. Safe to run several at once.
 */
import os from "node:os";
import type { Db } from "@/db/client";
import { checkBatch } from "@/lib/readiness";
import { parsePlan } from "@/lib/readiness/plan";
import type { ReadinessReport } from "@/lib/readiness/report";
import { sleep } from "@/lib/sleep";
import { claimJob, completeJob, failJob, heartbeat, type ClaimedJob } from "./check-jobs";

export type OpenFile = (key: string) => Promise<ReadableStream<Uint8Array>>;

export interface WorkerOptions {
  db: Db;
  openFile: OpenFile;
  workerId?: string;
  signal?: AbortSignal;
  pollMs?: number;
  /** how often progress is written, at most */
  progressEveryMs?: number;
  log?: (line: string) => void;
}

export function defaultWorkerId(): string {
  return `${os.hostname()}:${process.pid}:${Math.random().toString(36).slice(2, 8)}`;
}

/** Run one claimed job to its end (report stored, or the attempt recorded as failed). */
export async function runJob(opts: WorkerOptions, job: ClaimedJob): Promise<ReadinessReport | null> {
  const { db, openFile } = opts;
  const every = opts.progressEveryMs ?? 500;
  let last = 0;
  let pending: Promise<void> = Promise.resolve();
  try {
    const parsed = parsePlan(job.plan);
    if (!parsed.ok) throw new Error(`The stored data plan is not valid: ${parsed.issues.map((i) => `${i.path}: ${i.message}`).join("; ")}`);
    const stream = await openFile(job.fileKey);
    const report = await checkBatch(stream, parsed.plan, {
      fileName: job.fileName,
      onProgress: (p) => {
        const now = Date.now();
        if (now - last < every) return;
        last = now;
        pending = pending.then(() => heartbeat(db, job, p)).catch(() => undefined);
      },
    });
    await pending;
    await completeJob(db, job, report);
    return report;
  } catch (error) {
    await pending;
    opts.log?.(`check job ${job.jobId} attempt ${job.attempt} failed: ${error instanceof Error ? error.message : String(error)}`);
    await failJob(db, job, error);
    return null;
  }
}

/** Claim and run jobs until the signal aborts. */
export async function runWorker(opts: WorkerOptions): Promise<void> {
  const workerId = opts.workerId ?? defaultWorkerId();
  const pollMs = opts.pollMs ?? 1000;
  while (!opts.signal?.aborted) {
    let job: ClaimedJob | null = null;
    try {
      job = await claimJob(opts.db, workerId);
    } catch (error) {
      opts.log?.(`could not claim a job (database unavailable?): ${error instanceof Error ? error.message : String(error)}`);
    }
    if (job) {
      await runJob(opts, job);
      continue;
    }
    await sleep(pollMs, opts.signal);
  }
}
