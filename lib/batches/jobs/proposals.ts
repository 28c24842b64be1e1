/**
 * The server's check of a stored file and its fix proposals (REPORT-FORMAT.md "proposals") from
 * one download: the bytes the check reads are held and the fix tally (which needs no report)
 * reads them after it. When the tally fails the report stands without proposals (unless the
 * job is being stopped).
 */
import {
  tallyFixes,
  type ByteInput,
  type CheckOptions,
  type Plan,
  type ReadinessReport,
} from "@/lib/readiness";
import { checkStream } from "@/lib/readiness/node-stream";
import { isUtf8 } from "node:buffer";

type Job = { signal?: AbortSignal; log: (m: string) => void; jobId: number };

async function* iterate(input: ByteInput): AsyncGenerator<Uint8Array> {
  if (typeof (input as ReadableStream<Uint8Array>).getReader !== "function") {
    yield* input as AsyncIterable<Uint8Array>;
    return;
  }
  const reader = (input as ReadableStream<Uint8Array>).getReader();
  try {
    for (;;) {
      const r = await reader.read();
      if (r.done) return;
      yield r.value;
    }
  } finally {
    reader.cancel().catch(() => undefined);
  }
}

/**
 * The bytes of `input` as they pass to the check, held for the fix tally that follows: one
 * download. Memory is bounded by the upload size limit (MAX_UPLOAD_MB), as the file is.
 */
async function* holding(input: ByteInput, held: Uint8Array[]): AsyncGenerator<Uint8Array> {
  for await (const c of iterate(input)) {
    held.push(c);
    yield c;
  }
}

/** The server's check of a stored file (checkStream) and its fix proposals, from one download. */
export async function checkAndPropose(
  input: ByteInput,
  plan: Plan,
  opts: CheckOptions & { workers?: number; job: Job },
): Promise<ReadinessReport> {
  const { job, ...check } = opts;
  const held: Uint8Array[] = [];
  const report = await checkStream(holding(input, held), plan, check);
  if (report.status !== "checked") return report;
  try {
    const tally = await tallyFixes(replay(held), plan, {
      isUtf8,
      delimiter: report.file?.delimiter || undefined,
    });
    return { ...report, proposals: tally.proposals(report) };
  } catch (e) {
    if (job.signal?.aborted) throw e;
    const why = e instanceof Error ? e.message : String(e);
    job.log(`check job ${job.jobId}: no fix proposals (${why}); the report is stored without them`);
    return report;
  } finally {
    held.length = 0;
  }
}

async function* replay(held: Uint8Array[]): AsyncGenerator<Uint8Array> {
  for (const c of held) yield c;
}
