/**
 * The check worker: claims a job, streams the stored file through the readiness engine,
 * records progress as it goes and stores the report. Safe to run several at once.
 *
 * Faults: a database outage never ends the loop — claims pause, and a finished report is
 * stored once the database is back (the attempt is not used up). A stop (signal) ends the
 * claiming at once; the job in hand may finish within `stopGraceMs`, else its check is
 * abandoned and the job handed back to the queue with its attempt returned.
 */
import type { Db } from "@/db/client";
import { checkAndPropose } from "./proposals";
import { parsePlan, type ReadinessReport } from "@/lib/readiness";
import { sleep } from "@/lib/sleep";
import {
  STALE_AFTER_MS,
  claimJob,
  completeJob,
  failJob,
  heartbeat,
  releaseJob,
  type ClaimedJob,
} from "./check-jobs";
import { isDbUnavailable } from "@/db/errors";
import { withDbRetry } from "./db-retry";
import { defaultWorkerId } from "@/lib/core/queue";

export { defaultWorkerId };

export type OpenFile = (key: string) => Promise<ReadableStream<Uint8Array>>;

export interface WorkerOptions {
  db: Db;
  openFile: OpenFile;
  workerId?: string;
  /** aborts to stop: no new claims; the job in hand gets stopGraceMs to finish */
  signal?: AbortSignal;
  /** after a stop, how long the job in hand may still run before it is handed back (default 10 s) */
  stopGraceMs?: number;
  pollMs?: number;
  /** how often progress is written, at most */
  progressEveryMs?: number;
  /** how often a heartbeat is sent even without progress (default a quarter of the stale timeout) */
  heartbeatEveryMs?: number;
  /** a file download that sends nothing for this long fails the attempt (default 120 s) */
  stallMs?: number;
  /** threads per check of a large batch (default one per core; 1 checks in this thread) */
  checkWorkers?: number;
  /** a report with its state larger than this (bytes of JSON) is not stored: the attempt fails, saying why */
  maxStoredBytes?: number;
  log?: (line: string) => void;
}

/**
 * The largest report and engine state, together, that a check job stores (JSON bytes): well below
 * the 64 MB MariaDB packet scripts/db.sh sets, so a row is never refused mid-transaction (which
 * closes the connection and looked like a database outage, retried without end).
 */
export const MAX_STORED_BYTES = 32 * 1024 * 1024;

/** The JSON size of what completeJob stores: the report and its engine state. */
function storedBytes(report: ReadinessReport): number {
  return Buffer.byteLength(JSON.stringify(report), "utf8");
}

const sizeText = (b: number) =>
  b >= 2 ** 20 ? `${(b / 2 ** 20).toFixed(1)} MB` : `${Math.ceil(b / 1024)} KB`;

/** Thrown into the check when the worker stops before the check ends. */
class StopRequested extends Error {
  constructor() {
    super("The worker is stopping.");
    this.name = "StopRequested";
  }
}

const yieldToLoop = () => new Promise<void>((resolve) => setImmediate(resolve));

/** `promise`, or a rejection with `message` when it takes longer than `ms`. */
function within<T>(promise: Promise<T>, ms: number, message: string): Promise<T> {
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error(message)), ms);
  });
  return Promise.race([promise, timeout]).finally(() => clearTimeout(timer));
}

/**
 * `stream`, erroring with `reason` as soon as `signal` aborts (and cancelling the source), and
 * with a plain error when no bytes come for `stallMs` (heartbeats would otherwise keep a hung
 * download's job claimed for ever). It also lets timers and sockets run at least every 50 ms:
 * buffered chunks otherwise reach the engine as microtasks only, and a busy check would
 * starve its own heartbeats.
 */
function abortable(
  stream: ReadableStream<Uint8Array>,
  signal: AbortSignal,
  stallMs: number,
): ReadableStream<Uint8Array> {
  const reader = stream.getReader();
  let onAbort: (() => void) | undefined;
  let lastYield = Date.now();
  return new ReadableStream<Uint8Array>({
    start(controller) {
      onAbort = () => {
        controller.error(signal.reason);
        reader.cancel(signal.reason).catch(() => undefined);
      };
      if (signal.aborted) onAbort();
      else signal.addEventListener("abort", onAbort, { once: true });
    },
    async pull(controller) {
      try {
        if (Date.now() - lastYield > 50) {
          await yieldToLoop();
          lastYield = Date.now();
        }
        const r = await within(
          reader.read(),
          stallMs,
          `The upload service sent no data for ${Math.round(stallMs / 1000)} s; the check is tried again later.`,
        );
        if (signal.aborted) return;
        if (r.done) {
          signal.removeEventListener("abort", onAbort!);
          controller.close();
        } else controller.enqueue(r.value);
      } catch (e) {
        if (signal.aborted) return;
        controller.error(e);
        reader.cancel(e).catch(() => undefined);
      }
    },
    cancel(reason) {
      signal.removeEventListener("abort", onAbort!);
      return reader.cancel(reason);
    },
  });
}

/** Run one claimed job to its end: report stored, attempt recorded as failed, or job handed back at a stop. */
export async function runJob(opts: WorkerOptions, job: ClaimedJob): Promise<ReadinessReport | null> {
  const { db, openFile } = opts;
  const log = opts.log ?? (() => undefined);
  const every = opts.progressEveryMs ?? 500;
  const stopJob = new AbortController();
  let graceTimer: NodeJS.Timeout | undefined;
  const onStop = () => {
    const grace = opts.stopGraceMs ?? 10_000;
    log(`stopping: check job ${job.jobId} may finish within ${grace} ms, else it goes back to the queue`);
    graceTimer = setTimeout(() => stopJob.abort(new StopRequested()), grace);
  };
  if (opts.signal?.aborted) onStop();
  else opts.signal?.addEventListener("abort", onStop, { once: true });

  let progress = { rows: 0, bytes: 0 };
  let last = 0;
  let pending: Promise<unknown> = Promise.resolve();
  let beatFailed = false;
  let lost = false;
  const beat = () => {
    pending = pending
      .then(() => heartbeat(db, job, progress))
      .then((mine) => {
        if (!mine && !lost)
          log(
            `check job ${job.jobId}: the claim was taken over by another worker; whichever finishes first stores the report`,
          );
        lost ||= !mine;
        beatFailed = false;
      })
      .catch((error: unknown) => {
        if (!beatFailed)
          log(
            `check job ${job.jobId}: heartbeat failed (${isDbUnavailable(error) ? "database unavailable" : error instanceof Error ? error.message : String(error)}); the check goes on`,
          );
        beatFailed = true;
      });
  };
  const beatTimer = setInterval(beat, opts.heartbeatEveryMs ?? Math.max(250, Math.floor(STALE_AFTER_MS / 4)));
  const finish = async () => {
    clearInterval(beatTimer);
    await pending;
  };
  try {
    return await checkAndStore();
  } finally {
    clearInterval(beatTimer);
    clearTimeout(graceTimer);
    opts.signal?.removeEventListener("abort", onStop);
  }

  async function checkAndStore(): Promise<ReadinessReport | null> {
    let report: ReadinessReport;
    try {
      const parsed = parsePlan(job.plan);
      if (!parsed.ok)
        throw new Error(
          `The stored data plan is not valid: ${parsed.issues.map((i) => `${i.path}: ${i.message}`).join("; ")}`,
        );
      const stallMs = opts.stallMs ?? 120_000;
      const opened = await within(
        openFile(job.fileKey),
        stallMs,
        `The upload service did not answer within ${Math.round(stallMs / 1000)} s; the check is tried again later.`,
      );
      const stream = abortable(opened, stopJob.signal, stallMs);
      // one download: the check and the fix proposals read the same bytes (./proposals.ts)
      report = await checkAndPropose(stream, parsed.plan, {
        job: { signal: stopJob.signal, log, jobId: job.jobId },
        workers: opts.checkWorkers,
        fileName: job.fileName,
        onProgress: (p) => {
          progress = p;
          const now = Date.now();
          if (now - last < every) return;
          last = now;
          beat();
        },
      });
    } catch (error) {
      await finish();
      if (stopJob.signal.aborted) {
        const back = await withDbRetry(() => releaseJob(db, job), {
          what: `handing job ${job.jobId} back`,
          maxWaitMs: 5_000,
          log,
        }).catch(() => false);
        log(
          back
            ? `check job ${job.jobId} handed back to the queue (attempt not counted)`
            : `check job ${job.jobId} could not be handed back; it is taken again after the stale timeout`,
        );
        return null;
      }
      log(
        `check job ${job.jobId} attempt ${job.attempt} failed: ${error instanceof Error ? error.message : String(error)}`,
      );
      await withDbRetry(() => failJob(db, job, error), {
        what: `recording the failure of job ${job.jobId}`,
        signal: stopJob.signal,
        log,
      });
      return null;
    }

    await finish();
    try {
      const max = opts.maxStoredBytes ?? MAX_STORED_BYTES;
      const size = storedBytes(report);
      if (size > max)
        throw new Error(
          `The report of this batch is ${sizeText(size)}, more than the ${sizeText(max)} a report may take in the database; check the plan's columns and levels (a column with thousands of levels makes a large report).`,
        );
      const stored = await withDbRetry(() => completeJob(db, job, report), {
        what: `storing the report of job ${job.jobId}`,
        signal: stopJob.signal,
        log,
      });
      log(
        stored
          ? `check job ${job.jobId} done: report stored (${report.rows.total} rows)`
          : `check job ${job.jobId} was already done; this report is not stored twice`,
      );
      return report;
    } catch (error) {
      if (stopJob.signal.aborted) {
        log(
          `check job ${job.jobId}: stopped while the database was unavailable; the job is taken again after the stale timeout`,
        );
        return null;
      }
      log(
        `check job ${job.jobId}: storing the report failed: ${error instanceof Error ? error.message : String(error)}`,
      );
      await withDbRetry(() => failJob(db, job, error), {
        what: `recording the failure of job ${job.jobId}`,
        signal: stopJob.signal,
        log,
      });
      return null;
    }
  }
}

/** Claim and run jobs until the signal aborts. Database errors pause the loop; they never end it. */
export async function runWorker(opts: WorkerOptions): Promise<void> {
  const workerId = opts.workerId ?? defaultWorkerId();
  const pollMs = opts.pollMs ?? 1000;
  const log = opts.log ?? (() => undefined);
  let down = 0;
  while (!opts.signal?.aborted) {
    let job: ClaimedJob | null = null;
    try {
      job = await claimJob(opts.db, workerId);
      if (down > 0) log(`database back after ${down} failed claim${down === 1 ? "" : "s"}; claiming again`);
      down = 0;
    } catch (error) {
      if (down === 0 || !isDbUnavailable(error)) {
        log(
          `could not claim a job${isDbUnavailable(error) ? " (database unavailable; waiting for it)" : ""}: ${error instanceof Error ? error.message.split("\n")[0] : String(error)}`,
        );
      }
      down++;
      await sleep(Math.min(5_000, pollMs * 2 ** Math.min(down - 1, 3)), opts.signal);
      continue;
    }
    if (job) {
      log(
        `check job ${job.jobId} claimed (attempt ${job.attempt}, version ${job.batchVersionId}, ${job.fileName})`,
      );
      try {
        await runJob({ ...opts, workerId }, job);
      } catch (error) {
        // the job stays claimed; after the stale timeout any worker takes it again
        log(`check job ${job.jobId}: ${error instanceof Error ? error.message : String(error)}`);
      }
      continue;
    }
    await sleep(pollMs, opts.signal);
  }
}
