/**
 * The fix proposals of a checked report (REPORT-FORMAT.md "proposals"): the file is read once
 * more; when that fails the report stands without them (unless the job is being stopped).
 */
import {
  withProposals,
  type ByteInput,
  type CheckOptions,
  type Plan,
  type ReadinessReport,
} from "@/lib/readiness";
import { checkStream } from "@/lib/readiness/node-stream";

type Job = { signal?: AbortSignal; log: (m: string) => void; jobId: number };

export async function addProposals(
  report: ReadinessReport,
  open: () => Promise<ByteInput>,
  plan: Plan,
  opts: Job,
): Promise<ReadinessReport> {
  if (report.status !== "checked") return report;
  try {
    return await withProposals(report, await open(), plan);
  } catch (e) {
    if (opts.signal?.aborted) throw e;
    const why = e instanceof Error ? e.message : String(e);
    opts.log(`check job ${opts.jobId}: no fix proposals (${why}); the report is stored without them`);
    return report;
  }
}

/** The server's check of a stored file (checkStream), then its fix proposals from a second read. */
export async function checkAndPropose(
  input: ByteInput,
  reopen: () => Promise<ByteInput>,
  plan: Plan,
  opts: CheckOptions & { workers?: number; job: Job },
): Promise<ReadinessReport> {
  const { job, ...check } = opts;
  return addProposals(await checkStream(input, plan, check), reopen, plan, job);
}
