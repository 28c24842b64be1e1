/**
 * The server's check of a stored file and its fix proposals (REPORT-FORMAT.md "proposals") from
 * one download: the bytes the check reads are held and the fix tally (which needs no report)
 * reads them at the same time. When the tally fails the report stands without proposals (unless
 * the job is being stopped).
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
 * The bytes of one download, kept as they pass to the check so that a second reader (the fix
 * tally) can read them once the download is over, while the check goes on.
 * Memory is bounded by the upload size limit (MAX_UPLOAD_MB), as the file is.
 */
class HeldBytes {
  private chunks: Uint8Array[] = [];
  private done = false;
  private failed: unknown = null;
  private wake: (() => void) | null = null;

  /** `input` as it arrives, each chunk kept first. */
  async *pass(input: ByteInput): AsyncGenerator<Uint8Array> {
    try {
      for await (const c of iterate(input)) {
        this.chunks.push(c);
        this.signal();
        yield c;
      }
    } catch (e) {
      this.failed = e;
      throw e;
    } finally {
      this.done = true;
      this.signal();
    }
  }

  /**
   * Every chunk, once the download has ended (rejects when it failed). Not while it arrives: the
   * tally's work on this thread would hold up the check's own reading of the download.
   */
  async *replay(): AsyncGenerator<Uint8Array> {
    while (!this.done) await new Promise<void>((r) => (this.wake = r));
    if (this.failed !== null) throw this.failed;
    for (const c of this.chunks) {
      // let the check's own I/O (the spooled file, its threads' messages) go on between chunks
      await new Promise<void>((r) => setImmediate(r));
      yield c;
    }
  }

  /** No more bytes are coming (the check is over): a reader still waiting ends with what it has. */
  end(): void {
    this.done = true;
    this.signal();
  }

  release(): void {
    this.chunks = [];
  }

  private signal(): void {
    const w = this.wake;
    this.wake = null;
    w?.();
  }
}

/**
 * The server's check of a stored file (checkStream) and its fix proposals, from one download,
 * at the same time: the tally (which needs no report) reads the held bytes on this thread while
 * a large batch is checked on worker threads (threadsOnly), so the two take their own cores.
 * The tally finds the delimiter the way the check does (the same reader on the same bytes).
 */
export async function checkAndPropose(
  input: ByteInput,
  plan: Plan,
  opts: CheckOptions & { workers?: number; minBytes?: number; job: Job },
): Promise<ReadinessReport> {
  const { job, ...check } = opts;
  const held = new HeldBytes();
  const tallying = tallyFixes(held.replay(), plan, { isUtf8 }).then(
    (tally) => ({ tally }),
    (e: unknown) => ({ error: e }),
  );
  try {
    let report: ReadinessReport;
    try {
      report = await checkStream(held.pass(input), plan, { ...check, threadsOnly: true, keepThreads: true });
    } finally {
      // a check that stopped reading early leaves no tally waiting (a checked report read every byte)
      held.end();
    }
    const t = await tallying;
    if (report.status !== "checked") return report;
    if ("tally" in t) return { ...report, proposals: t.tally.proposals(report) };
    if (job.signal?.aborted) throw t.error;
    const why = t.error instanceof Error ? t.error.message : String(t.error);
    job.log(`check job ${job.jobId}: no fix proposals (${why}); the report is stored without them`);
    return report;
  } finally {
    await tallying;
    held.release();
  }
}
