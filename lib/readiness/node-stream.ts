/**
 * Node-only: check a batch that arrives as a byte stream (the server's check worker) on all
 * cores. A small batch is held in memory as it arrives; a larger one is written to a private
 * temporary file while it downloads, then checked by worker threads (checkFile), and the file
 * removed (spoolStream, checkSpooled).
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { isUtf8 } from "node:buffer";
import { checkBatch, type CheckOptions } from "./check";
import { bytesOf, type ByteInput } from "./csv-reader";
import { PARALLEL_MIN_BYTES, RangePool, checkFile, defaultWorkers } from "./node";
import type { Plan } from "./plan";
import type { ReadinessReport } from "./report";

const RANGE_WORKER = fileURLToPath(new URL("./range-worker.ts", import.meta.url));
const BIN = fileURLToPath(new URL("./bin/tributary-check.mjs", import.meta.url));
let threadScript: Promise<string> | null = null;

/**
 * The script the worker threads start from: the command's, which loads the engine's bundle
 * (./bin/bundle.mjs, built here when it is missing or older than the sources; once per process),
 * so a thread starts without tsx's loader (about 0.4 s less each; two threads were slower than
 * one on a 24 MB batch before). When the bundle cannot be built, or TRIBUTARY_CHECK_SOURCES=1,
 * the sources through tsx (./range-worker.ts).
 */
const pools = new Map<string, RangePool>();

/** The process's kept range threads for a script (made on first use; idle ones do not keep it alive). */
function keptThreads(script: string): RangePool {
  let p = pools.get(script);
  if (!p) pools.set(script, (p = new RangePool(script)));
  return p;
}

/** How many kept range threads wait for a check in this process (keepThreads). */
export function keptThreadCount(): number {
  let n = 0;
  for (const p of pools.values()) n += p.idleThreads;
  return n;
}

/**
 * Start the process's kept range threads before its first large check (a long-running worker
 * process): they load the engine while the process waits for work, not during the first job.
 */
export async function warmCheckThreads(workers = defaultWorkers()): Promise<void> {
  if (workers < 2) return;
  keptThreads(await rangeWorkerScript()).warm(workers);
}

export function rangeWorkerScript(): Promise<string> {
  threadScript ??=
    process.env.TRIBUTARY_CHECK_SOURCES === "1"
      ? Promise.resolve(RANGE_WORKER)
      : import("./bin/bundle.mjs").then(
          (b) => b.ensureBundle().then((ok) => (ok ? BIN : RANGE_WORKER)),
          () => RANGE_WORKER,
        );
  return threadScript;
}

/**
 * A downloaded batch, read once from its stream: held in memory when it is smaller than the
 * limit, otherwise written to a private temporary file, so that more than one reader (the check,
 * the server's fix tally) can read it without a second download and without holding a large
 * batch in memory. remove() deletes the file.
 */
export interface Spooled {
  readonly size: number;
  /** the temporary file, or null when the batch is held in memory */
  readonly file: string | null;
  /** every byte from the start; ends early, without an error, once `stop` is aborted */
  read(stop?: AbortSignal): AsyncIterable<Uint8Array>;
  remove(): Promise<void>;
}

/** Reads `input` to its end (rejecting when the download fails, leaving no file behind). */
export async function spoolStream(
  input: ByteInput,
  limit = PARALLEL_MIN_BYTES,
  onProgress?: CheckOptions["onProgress"],
): Promise<Spooled> {
  const it = bytesOf(input)[Symbol.asyncIterator]();
  const held: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const r = await it.next();
    if (r.done)
      return {
        size,
        file: null,
        async *read(stop) {
          for (const c of held) {
            if (stop?.aborted) return;
            yield c;
            // let other work on this thread (the check's threads' messages) go on between chunks
            await new Promise<void>((w) => setImmediate(w));
          }
        },
        remove: async () => {
          held.length = 0;
        },
      };
    held.push(r.value);
    size += r.value.length;
    if (size >= limit) break;
  }
  const dir = await fs.promises.mkdtemp(path.join(os.tmpdir(), "tributary-check-"));
  const file = path.join(dir, "batch.csv");
  const remove = () => fs.promises.rm(dir, { recursive: true, force: true });
  try {
    const out = await fs.promises.open(file, "wx", 0o600);
    try {
      for (const c of held) await out.write(c);
      held.length = 0;
      for (;;) {
        const r = await it.next();
        if (r.done) break;
        await out.write(r.value);
        size += r.value.length;
        onProgress?.({ rows: 0, bytes: size });
      }
    } finally {
      await out.close();
    }
  } catch (e) {
    await remove();
    throw e;
  }
  return {
    size,
    file,
    async *read(stop) {
      const stream = fs.createReadStream(file, { highWaterMark: 1 << 16 });
      try {
        for await (const c of stream) {
          if (stop?.aborted) return;
          yield c as Uint8Array;
        }
      } finally {
        stream.destroy();
      }
    },
    remove,
  };
}

type StreamCheckOptions = CheckOptions & {
  workers?: number;
  /** the size from which a batch is spooled to a file and checked on threads (PARALLEL_MIN_BYTES) */
  minBytes?: number;
  workerScript?: string;
  /** a large batch's ranges all on worker threads, none on this one (checkFile) */
  threadsOnly?: boolean;
  /** keep the worker threads for the next check (a long-running process; see RangePool) */
  keepThreads?: boolean;
};

/** Check a spooled batch: in memory on this thread, from its file with `workers` threads. */
export async function checkSpooled(
  s: Spooled,
  plan: Plan,
  opts: StreamCheckOptions = {},
): Promise<ReadinessReport> {
  if (s.file === null) return checkBatch(s.read(), plan, { isUtf8, expectedBytes: s.size, ...opts });
  const workers = opts.workers ?? defaultWorkers();
  const workerScript = opts.workerScript ?? (await rangeWorkerScript());
  const pool = opts.keepThreads && workers > 1 ? keptThreads(workerScript) : undefined;
  return checkFile(s.file, plan, { ...opts, workers, workerScript, pool });
}

/**
 * Check a byte stream against a plan with `workers` threads (default: one per core; 1 reads
 * the stream in this thread as it arrives). Never throws for a bad file (an "unreadable"
 * report); a failing download rejects, as checkBatch does.
 */
export async function checkStream(
  input: ByteInput,
  plan: Plan,
  opts: StreamCheckOptions = {},
): Promise<ReadinessReport> {
  const workers = opts.workers ?? defaultWorkers();
  if (workers < 2) return checkBatch(input, plan, { isUtf8, ...opts });
  const spooled = await spoolStream(input, opts.minBytes, opts.onProgress);
  try {
    return await checkSpooled(spooled, plan, { ...opts, workers });
  } finally {
    await spooled.remove();
  }
}
