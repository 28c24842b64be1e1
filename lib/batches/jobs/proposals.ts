/**
 * The server's check of a stored file and its fix proposals (REPORT-FORMAT.md "proposals") from
 * one download, read once and kept (in memory, or in a temporary file for a large batch) so that
 * the check and the fix tally (which needs no report) read it at the same time. When the tally
 * fails the report stands without proposals (unless the job is being stopped).
 */
import {
  tallyFixes,
  type ByteInput,
  type CheckOptions,
  type Plan,
  type ReadinessReport,
} from "@/lib/readiness";
import { checkSpooled, spoolStream } from "@/lib/readiness/node-stream";
import { isUtf8 } from "node:buffer";

type Job = { signal?: AbortSignal; log: (m: string) => void; jobId: number };

/**
 * The server's check of a stored file (checkSpooled) and its fix proposals, from one download:
 * the download is read once (spoolStream: a small batch held in memory, a large one in a
 * temporary file, so memory does not grow with the batch), then the tally (which needs no
 * report) reads it on this thread while a large batch is checked on worker threads
 * (threadsOnly), so the two take their own cores. The tally finds the delimiter the way the
 * check does (the same reader on the same bytes).
 */
export async function checkAndPropose(
  input: ByteInput,
  plan: Plan,
  opts: CheckOptions & { workers?: number; minBytes?: number; job: Job },
): Promise<ReadinessReport> {
  const { job, ...check } = opts;
  const spooled = await spoolStream(input, check.minBytes, check.onProgress);
  // a check that is not "checked" needs no proposals: the tally stops reading
  const stopTally = new AbortController();
  const tallying = tallyFixes(spooled.read(stopTally.signal), plan, { isUtf8 }).then(
    (tally) => ({ tally }),
    (e: unknown) => ({ error: e }),
  );
  try {
    let report: ReadinessReport;
    try {
      report = await checkSpooled(spooled, plan, { ...check, threadsOnly: true, keepThreads: true });
    } catch (e) {
      stopTally.abort();
      throw e;
    }
    if (report.status !== "checked") {
      stopTally.abort();
      return report;
    }
    // a checked report: the tally reads every byte, as the check did
    const t = await tallying;
    if ("tally" in t) return { ...report, proposals: t.tally.proposals(report) };
    if (job.signal?.aborted) throw t.error;
    const why = t.error instanceof Error ? t.error.message : String(t.error);
    job.log(`check job ${job.jobId}: no fix proposals (${why}); the report is stored without them`);
    return report;
  } finally {
    await tallying;
    await spooled.remove();
  }
}
