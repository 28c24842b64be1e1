/**
 * The server's check of a stored file and its fix proposals (REPORT-FORMAT.md "proposals") from
 * one download: the bytes go to the check and to the fix tally at once, in lockstep (neither
 * runs more than a few chunks ahead, so memory stays bounded whatever the file's size). When
 * the tally fails the report stands without proposals (unless the job is being stopped).
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

/** Chunks a branch may run ahead of the slower one. */
const AHEAD = 8;

/** Two readers of one byte stream; a reader that is detached (done, failed) no longer holds the other back. */
export function lockstepTee(input: ByteInput): {
  branches: [AsyncIterable<Uint8Array>, AsyncIterable<Uint8Array>];
  detach: (i: 0 | 1) => void;
} {
  const source = iterate(input);
  const chunks: Uint8Array[] = [];
  let base = 0; // index (in the whole stream) of chunks[0]
  const at = [0, 0];
  const live = [true, true];
  let ended = false;
  let failure: { error: unknown } | null = null;
  let pulling: Promise<void> | null = null;
  let wake: (() => void) | null = null;
  const notify = () => {
    const w = wake;
    wake = null;
    w?.();
  };
  const trim = () => {
    const low = Math.min(...[0, 1].filter((i) => live[i]).map((i) => at[i]!), base + chunks.length);
    while (base < low) {
      chunks.shift();
      base++;
    }
  };
  const pull = () =>
    (pulling ??= source
      .next()
      .then(
        (r) => {
          if (r.done) ended = true;
          else chunks.push(r.value);
        },
        (error: unknown) => {
          failure = { error };
        },
      )
      .finally(() => {
        pulling = null;
        notify();
      }));
  async function* branch(i: 0 | 1): AsyncGenerator<Uint8Array> {
    try {
      for (;;) {
        const k = at[i]! - base;
        if (k < chunks.length) {
          const c = chunks[k]!;
          at[i] = at[i]! + 1;
          trim();
          notify();
          yield c;
          continue;
        }
        if (failure) throw failure.error;
        if (ended) return;
        const other = at[1 - i]!;
        if (live[1 - i] && at[i]! - other >= AHEAD) await new Promise<void>((r) => (wake = r));
        else await pull();
      }
    } finally {
      detach(i);
    }
  }
  function detach(i: 0 | 1) {
    if (!live[i]) return;
    live[i] = false;
    trim();
    notify();
    if (!live[0] && !live[1] && !ended) void source.return(undefined);
  }
  return { branches: [branch(0), branch(1)], detach };
}

/** The server's check of a stored file (checkStream) and its fix proposals, from one download. */
export async function checkAndPropose(
  input: ByteInput,
  plan: Plan,
  opts: CheckOptions & { workers?: number; job: Job },
): Promise<ReadinessReport> {
  const { job, ...check } = opts;
  const tee = lockstepTee(input);
  const tally = tallyFixes(tee.branches[1], plan, { isUtf8 }).then(
    (t) => t,
    (e: unknown) => {
      tee.detach(1);
      return e instanceof Error ? e : new Error(String(e));
    },
  );
  let report: ReadinessReport;
  try {
    report = await checkStream(tee.branches[0], plan, check);
  } finally {
    tee.detach(0);
  }
  if (report.status !== "checked") {
    tee.detach(1);
    return report;
  }
  const t = await tally;
  if (t instanceof Error) {
    if (job.signal?.aborted) throw t;
    job.log(`check job ${job.jobId}: no fix proposals (${t.message}); the report is stored without them`);
    return report;
  }
  return { ...report, proposals: t.proposals(report) };
}
