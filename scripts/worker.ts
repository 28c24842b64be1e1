/**
 * The worker process: runs the check queue, the pool questions and the e-mail outbox until stopped.
 * Start as many as you like, on as many machines as share the database.
 *
 * SIGTERM / SIGINT stop it gracefully: no new claims; the check in hand may finish within
 * TRIBUTARY_WORKER_STOP_GRACE_MS (default 10 000), else it is handed back to the queue
 * without using up an attempt; then the process exits 0. A second signal exits at once
 * (the job in hand is then taken again after the stale timeout, TRIBUTARY_JOB_STALE_MS).
 * A file download that sends nothing for TRIBUTARY_JOB_STALL_MS (default 120 000) fails the
 * attempt; TRIBUTARY_WORKER_POLL_MS (default 1 000) is how often an idle worker looks for work.
 * A large batch is checked by TRIBUTARY_CHECK_WORKERS threads (default one per core; 1: none),
 * started with the process and kept between jobs.
 * The process lowers its own CPU priority to TRIBUTARY_WORKER_NICE (default 10) before it starts
 * its check threads, so that an app instance on the same machine answers first; the check
 * threads inherit it (on Linux a priority is per thread, and a new thread takes its creator's).
 */
import os from "node:os";
import { checkWorkersFromEnv, exitUnlessEnvOk, msFromEnv, workerNiceFromEnv } from "@/lib/env";
import { getDb, getPool } from "@/db/client";
import { runDigestSchedule } from "@/lib/pool/digest-schedule";
import { runMailSender } from "@/lib/mail";
import { openStoredFile } from "@/lib/batches/intake/file-store";
import { defaultWorkerId, runWorker } from "@/lib/batches/jobs/worker";
import { runPoolQuestionsWorker } from "@/lib/pool/questions-job";
import { warmCheckThreads } from "@/lib/readiness/node-stream";

// refuse the demo secrets in production, and say what is missing, before touching anything
exitUnlessEnvOk("worker");

const controller = new AbortController();
const log = (line: string) => console.log(`[worker] ${line}`);
const stopGraceMs = msFromEnv("TRIBUTARY_WORKER_STOP_GRACE_MS", 10_000);
const pollMs = msFromEnv("TRIBUTARY_WORKER_POLL_MS", 1_000);
const stallMs = msFromEnv("TRIBUTARY_JOB_STALL_MS", 120_000);
const checkWorkers = checkWorkersFromEnv();
const nice = workerNiceFromEnv();
try {
  os.setPriority(nice);
} catch (e) {
  // lowering a priority is always allowed; raising it back (a parent already niced) may not be
  log(`could not set the CPU priority to nice ${nice}: ${(e as Error).message}`);
}
for (const sig of ["SIGINT", "SIGTERM"] as const) {
  process.on(sig, () => {
    if (controller.signal.aborted) {
      log(`${sig} again: stopping now`);
      process.exit(1);
    }
    log(
      `${sig}: no new jobs; the current check may finish within ${stopGraceMs} ms, else it goes back to the queue`,
    );
    controller.abort();
  });
}
// a stray rejection (e.g. a pool error event while the database restarts) is logged, not fatal
process.on("unhandledRejection", (reason) =>
  log(`unhandled rejection: ${reason instanceof Error ? reason.message : String(reason)}`),
);

const workerId = defaultWorkerId();
log(`started as ${workerId} (nice ${os.getPriority()})`);
// the check threads load the engine now, while no job waits (they take the priority set above)
await warmCheckThreads(checkWorkers).catch((e: unknown) =>
  log(`the check threads start with the first large batch (${e instanceof Error ? e.message : String(e)})`),
);
await Promise.all([
  runWorker({
    db: getDb(),
    openFile: openStoredFile,
    workerId,
    signal: controller.signal,
    stopGraceMs,
    pollMs,
    stallMs,
    checkWorkers,
    log,
  }),
  runPoolQuestionsWorker({ db: getDb(), workerId, signal: controller.signal, pollMs, log }),
  runMailSender({ signal: controller.signal, intervalMs: 1000 }),
  runDigestSchedule({ signal: controller.signal, log }),
]);
await getPool()
  .end()
  .catch(() => undefined);
log("stopped");
