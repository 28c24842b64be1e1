/**
 * Node-only helpers (not part of the framework-free core): check a file on disk, splitting a
 * large file into byte ranges read by worker threads (one per core by default) whose
 * gatherings are merged afterwards.
 * The merged result equals one pass (same counts, rows, factor); quartiles beyond the exact
 * bound come from the parts' samples.
 */
import { isUtf8 } from "node:buffer";
import fs from "node:fs";
import os from "node:os";
import { createRequire } from "node:module";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { Worker, isMainThread, parentPort, workerData } from "node:worker_threads";
import { checkBatch, hashPlan, now, reportFromScan, unreadableReport, type CheckOptions } from "./check";
import { readCsv, type CsvMeta } from "./csv-reader";
import { UnreadableError } from "./decode";
import type { Plan } from "./plan";
import type { ReadinessReport } from "./report";
import { Scan } from "./scan";
import { KeyExampleRecount } from "./key-examples";
import { absorbPart, scanPart, type ScanPart } from "./scan-merge";
import { survey } from "./split";

/** files smaller than this are read by one thread */
export const PARALLEL_MIN_BYTES = 16 << 20;

/** Worker threads used by default: one per core. */
export const defaultWorkers = () => Math.max(1, Math.min(16, os.availableParallelism()));

interface RangeJob {
  file: string;
  start: number;
  /** no record starting at or after this offset is read by this range */
  end: number;
  plan: Plan;
  meta: CsvMeta;
  header: string[];
  firstLine: number;
}

type RangeDone = {
  ok: true;
  part: ScanPart;
  records: number;
  start: number;
  stoppedAt: number;
  lineAfter: number;
};
type RangeResult =
  | RangeDone
  | { ok: false; message: string; fix: string; detail: Record<string, unknown> }
  | { progress: number };

/**
 * Check a file on disk. Files of PARALLEL_MIN_BYTES and more are split into one byte range per
 * thread (default: one per core; this thread reads the first), each read by the same reader; the gatherings are
 * merged in file order into what one pass gives. A range whose guessed start turns out to lie
 * inside a record (a quoted line break) is read again from the true record boundary, which the
 * range before it reports. `workerScript` is a module that calls runRangeWorker() when it is
 * not the main thread (default: the running script).
 */
export async function checkFile(
  file: string,
  plan: Plan,
  opts: CheckOptions & {
    workers?: number;
    workerScript?: string;
    execArgv?: string[];
    minBytes?: number;
    /** read the ranges one after another in this thread (tests of the splitting) */
    inThread?: boolean;
    /** every range on a worker thread, this one reading none (it has other work: the fix tally) */
    threadsOnly?: boolean;
    /** threads kept between checks (a long-running process: no thread start-up per check) */
    pool?: RangePool;
  } = {},
): Promise<ReadinessReport> {
  const size = fs.statSync(file).size;
  const workers = opts.workers ?? defaultWorkers();
  const single = () =>
    checkBatch(fs.createReadStream(file, { highWaterMark: 1 << 20 }), plan, {
      isUtf8,
      expectedBytes: size,
      ...opts,
    });
  if (workers < 2 || size < (opts.minBytes ?? PARALLEL_MIN_BYTES)) return single();
  const t0 = now();
  // the threads start (an isolate each, loading the engine) while this one surveys the file
  const script = path.resolve(opts.workerScript ?? process.argv[1]!);
  const own = opts.pool || opts.inThread ? null : new RangePool(script, opts.execArgv);
  const pool = opts.pool ?? own;
  pool?.warm(opts.threadsOnly ? workers : workers - 1);
  try {
    const ranges = { ...opts, workers, pool: opts.inThread ? null : pool, rangesRead: () => own?.close() };
    return await checkRanges(file, size, plan, ranges, single, t0);
  } finally {
    await own?.close();
  }
}

async function checkRanges(
  file: string,
  size: number,
  plan: Plan,
  opts: CheckOptions & {
    workers: number;
    inThread?: boolean;
    threadsOnly?: boolean;
    pool: RangePool | null;
    /** called once every range has been read: the threads of this check alone can end (their memory freed) */
    rangesRead: () => Promise<void> | undefined;
  },
  single: () => Promise<ReadinessReport>,
  t0: number,
): Promise<ReadinessReport> {
  const s = survey(file, size, opts.workers);
  if (!s || s.starts.length < 2) return single();
  const planHash = await hashPlan(plan);
  const progress = s.starts.map(() => 0);
  const ends = s.starts.map((_, i) => s.starts[i + 1]?.start ?? size);
  const report = (i: number, rows: number) => {
    progress[i] = rows;
    const all = progress.reduce((a, b) => a + b, 0);
    opts.onProgress?.({
      rows: all,
      bytes: Math.min(size, Math.round((size * all) / Math.max(1, s.rowsGuess))),
    });
  };
  const run = (i: number, start: number, firstLine: number): Promise<RangeResult> => {
    const job: RangeJob = { file, start, end: ends[i]!, plan, meta: s.meta, header: s.header, firstLine };
    // this thread reads the first range itself while the workers read the others
    if (!opts.pool || (i === 0 && !opts.threadsOnly)) return readRange(job, (rows) => report(i, rows));
    return opts.pool.run(job, (rows) => report(i, rows));
  };
  const first: RangeResult[] = [];
  if (opts.inThread) for (const [i, r] of s.starts.entries()) first.push(await run(i, r.start, r.firstLine));
  else first.push(...(await Promise.all(s.starts.map((r, i) => run(i, r.start, r.firstLine)))));
  await opts.rangesRead();
  // in file order: each range must start where the one before it stopped
  const results: RangeResult[] = [];
  /** where each range read was: its start, first line and end */
  const spans: { start: number; firstLine: number; end: number }[] = [];
  let expect = { start: s.starts[0]!.start, line: s.starts[0]!.firstLine };
  for (let i = 0; i < first.length; i++) {
    let r = first[i]!;
    if ("ok" in r && r.ok && r.start !== expect.start) r = await run(i, expect.start, expect.line);
    results.push(r);
    spans.push({ start: expect.start, firstLine: expect.line, end: ends[i]! });
    if (!("ok" in r) || !r.ok) break;
    expect = { start: r.stoppedAt, line: r.lineAfter };
  }
  const failed = results.find((r) => "ok" in r && !r.ok);
  if (failed && "message" in failed)
    return unreadableReport(
      plan,
      planHash,
      new UnreadableError(failed.message, failed.fix, failed.detail),
      null,
      now() - t0,
    );
  first.length = 0;
  const head = results[0] as RangeDone;
  const firstKeys = new Map(
    head.part.keys.map(([k, v]) => [k, { repeats: v.dup.count, examples: v.examples }]),
  );
  const scan = new Scan(plan);
  scan.onHeader(s.header, s.meta);
  let records = 0;
  // each part is let go once it is absorbed: its tables need not outlive the merge
  for (let i = 0; results.length > 0; i++) {
    const r = results.shift() as RangeDone;
    absorbPart(scan, r.part, i === 0);
    records += r.records;
  }
  await recountKeyExamples(scan, file, s.header, s.meta, firstKeys, spans);
  return reportFromScan(
    scan,
    plan,
    planHash,
    { bytes: size, records, bom: s.meta.bom, delimiter: s.meta.delimiter },
    t0,
  );
}

/**
 * The examples of repeated keys as one pass finds them (./key-examples.ts): when a range after
 * the first holds a repeated key, the first range's examples are kept and the later ranges are
 * read again, in file order, for their key columns only.
 */
async function recountKeyExamples(
  scan: Scan,
  file: string,
  header: string[],
  meta: CsvMeta,
  firstPart: Map<number, { repeats: number; examples: [string, number][] }>,
  spans: { start: number; firstLine: number; end: number }[],
): Promise<void> {
  const later = [...scan.keys].filter(([k, v]) => v.dup.count > (firstPart.get(k)?.repeats ?? 0));
  if (later.length === 0) return;
  for (const [k, v] of later) v.examples = new Map(firstPart.get(k)?.examples ?? []);
  const sink = new KeyExampleRecount(scan, new Set(later.map(([k]) => k)));
  sink.onHeader(header, meta);
  for (let i = 1; i < spans.length; i++) {
    const { start, firstLine, end } = spans[i]!;
    await readCsv(fs.createReadStream(file, { start, highWaterMark: 1 << 20 }), sink, {
      range: { meta, byteOffset: start, firstLine, endOffset: end },
      isUtf8,
    });
  }
}

/** Start a worker on a script; a TypeScript one is loaded through tsx's module hooks (development). */
function startWorker(script: string, data: unknown, execArgv?: string[]): Worker {
  const extra = execArgv ? { execArgv } : {};
  if (!/\.[cm]?ts$/.test(script)) return new Worker(script, { workerData: data, ...extra });
  const tsxApi = pathToFileURL(
    createRequire(path.join(process.cwd(), "index.js"))
      .resolve("tsx/esm/api")
      .replace(/\.cjs$/, ".mjs"),
  ).href;
  const code = `import(${JSON.stringify(tsxApi)}).then((m) => { m.register(); return import(${JSON.stringify(pathToFileURL(script).href)}); });`;
  return new Worker(code, { eval: true, workerData: data, ...extra });
}

/** True when this thread was started by checkFile to read one byte range. */
export function isRangeWorker(): boolean {
  return (
    !isMainThread && typeof workerData === "object" && workerData !== null && "tributaryRange" in workerData
  );
}

/** Read one byte range: the Scan's part, where the range stopped, or why the file is unreadable. */
async function readRange(job: RangeJob, onProgress?: (rows: number) => void): Promise<RangeResult> {
  const scan = new Scan(job.plan);
  scan.onHeader(job.header, job.meta);
  scan.expectedBytes = job.end - job.start;
  try {
    const read = await readCsv(
      fs.createReadStream(job.file, { start: job.start, highWaterMark: 1 << 20 }),
      scan,
      {
        range: { meta: job.meta, byteOffset: job.start, firstLine: job.firstLine, endOffset: job.end },
        isUtf8,
        onProgress: onProgress && ((p) => onProgress(p.rows)),
      },
    );
    return {
      ok: true,
      part: scanPart(scan),
      records: read.records,
      start: job.start,
      stoppedAt: read.stoppedAt,
      lineAfter: read.lineAfter,
    };
  } catch (e) {
    if (e instanceof UnreadableError) return { ok: false, message: e.message, fix: e.fix, detail: e.detail };
    throw e;
  }
}

/** The worker side of checkFile (a RangePool's thread): read each range it is sent, post the Scan's part. */
export async function runRangeWorker(): Promise<void> {
  parentPort!.on("message", (m: { job: RangeJob }) => {
    readRange(m.job, postProgress).then(postRange, (e: unknown) => {
      // an error that is not the file's ends this thread, and its check fails
      setImmediate(() => {
        throw e;
      });
    });
  });
}

const postProgress = (rows: number) => parentPort!.postMessage({ progress: rows } satisfies RangeResult);

function postRange(r: RangeResult): void {
  if (!("ok" in r) || !r.ok) return parentPort!.postMessage(r);
  const part = r.part;
  const transfer = [
    part.rowSet.slots.buffer,
    ...part.keys.map(([, k]) => k.set.slots.buffer),
    ...part.cols.flatMap((c) => (c.quant ? [c.quant.values.buffer, c.quant.keys.buffer] : [])),
  ];
  parentPort!.postMessage(r, transfer as ArrayBuffer[]);
}

const POOLED = "pooled";

/**
 * Range threads kept between checks, for a long-running process (the server's check worker): a
 * kept thread has loaded the engine and warmed up, which a new one pays for on every check. An
 * idle thread does not keep the process alive; close() ends them.
 */
export class RangePool {
  private idle: Worker[] = [];
  constructor(
    private readonly script: string,
    private readonly execArgv?: string[],
  ) {}

  /** Start threads until `n` wait (a thread's start-up then overlaps other work). */
  warm(n: number): void {
    while (this.idle.length < n) {
      const w = startWorker(this.script, { tributaryRange: POOLED }, this.execArgv);
      w.unref();
      this.idle.push(w);
    }
  }

  run(job: RangeJob, onProgress: (rows: number) => void): Promise<RangeResult> {
    const w = this.idle.pop() ?? startWorker(this.script, { tributaryRange: POOLED }, this.execArgv);
    w.ref();
    return new Promise<RangeResult>((resolve, reject) => {
      const done = () => {
        w.off("message", message);
        w.off("error", error);
        w.off("exit", exit);
      };
      const message = (m: RangeResult) => {
        if ("progress" in m) return onProgress(m.progress);
        done();
        w.unref();
        this.idle.push(w);
        resolve(m);
      };
      const error = (e: Error) => {
        done();
        void w.terminate();
        reject(e);
      };
      const exit = (code: number) => {
        done();
        reject(new Error(`range worker exited with code ${code}`));
      };
      w.on("message", message);
      w.on("error", error);
      w.on("exit", exit);
      w.postMessage({ job });
    });
  }

  /** Threads waiting for a check. */
  get idleThreads(): number {
    return this.idle.length;
  }

  async close(): Promise<void> {
    await Promise.all(this.idle.splice(0).map((w) => w.terminate()));
  }
}
