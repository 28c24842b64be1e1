/**
 * The worker process: runs the check queue and the e-mail outbox until stopped.
 * Start as many as you like, on as many machines as share the database.
 */
import { getDb, getPool } from "@/db/client";
import { runDigestSchedule } from "@/lib/digest/schedule";
import { runMailSender } from "@/lib/mail";
import { openStoredFile } from "@/lib/uploads";
import { defaultWorkerId, runWorker } from "./worker";

const controller = new AbortController();
const log = (line: string) => console.log(`[worker] ${line}`);
for (const sig of ["SIGINT", "SIGTERM"] as const) {
  process.on(sig, () => {
    log(`${sig}: finishing the current job, then stopping`);
    controller.abort();
  });
}

const workerId = defaultWorkerId();
log(`started as ${workerId}`);
await Promise.all([
  runWorker({ db: getDb(), openFile: openStoredFile, workerId, signal: controller.signal, log }),
  runMailSender({ signal: controller.signal, intervalMs: 1000 }),
  runDigestSchedule({ db: getDb(), signal: controller.signal, log }),
]);
await getPool().end();
log("stopped");
