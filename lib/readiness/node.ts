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
import { DEFAULT_LIMITS, readCsv, sniffText, type CsvMeta } from "./csv-reader";
import { UnreadableError, sniffBytes } from "./decode";
import type { Plan } from "./plan";
import type { ReadinessReport } from "./report";
import { Scan } from "./scan";
import { absorbPart, scanPart, type ScanPart } from "./scan-merge";
import { Tokenizer, recordText } from "./tokenizer";

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

type RangeDone = { ok: true; part: ScanPart; records: number; start: number; stoppedAt: number; lineAfter: number };
type RangeResult = RangeDone | { ok: false; message: string; fix: string; detail: Record<string, unknown> } | { progress: number };

/** Line breaks (LF, CR, CRLF once each) in the file's bytes [from, to). */
function countLines(fd: number, from: number, to: number): number {
  const block = Buffer.alloc(Math.min(8 << 20, Math.max(1, to - from)));
  let n = 0;
  let prevCR = false;
  for (let pos = from; pos < to; ) {
    const got = fs.readSync(fd, block, 0, Math.min(block.length, to - pos), pos);
    if (got <= 0) break;
    const b = block.subarray(0, got);
    for (let at = b.indexOf(10); at >= 0; at = b.indexOf(10, at + 1)) if (!(at === 0 ? prevCR : b[at - 1] === 13)) n++;
    for (let at = b.indexOf(13); at >= 0; at = b.indexOf(13, at + 1)) n++;
    prevCR = b[got - 1] === 13;
    pos += got;
  }
  return n;
}

/**
 * The header (read by the tokenizer, quotes and all), the format, and a first guess of where
 * each worker's range starts: the line start after an even share of the bytes. A guess may
 * fall inside a quoted field; checkFile finds that out and reads that range again.
 */
function survey(file: string, size: number, parts: number): { meta: CsvMeta; header: string[]; starts: { start: number; firstLine: number }[] } | null {
  const fd = fs.openSync(file, "r");
  try {
    const head = Buffer.alloc(Math.min(size, 1 << 20));
    fs.readSync(fd, head, 0, head.length, 0);
    let bom = 0;
    let header: string[] | null = null;
    let meta: CsvMeta;
    let tok: Tokenizer;
    try {
      bom = sniffBytes(head).bom;
      const { delimiter, newline } = sniffText(head.subarray(bom, Math.min(head.length, bom + (1 << 16))).toString("utf8"), head.length === size);
      meta = { delimiter, newline, encoding: "utf-8", bom: bom > 0 };
      tok = new Tokenizer(delimiter.charCodeAt(0), { maxFieldBytes: DEFAULT_LIMITS.maxFieldChars, maxRecordBytes: DEFAULT_LIMITS.maxRecordChars }, { offset: bom, endOffset: bom + 1 });
      tok.push(head.subarray(bom), head.length === size, (b) => (header ??= recordText(b, 0)));
    } catch {
      return null; // the single pass reports it
    }
    if (!header || tok.stoppedAt < 0 || tok.stoppedAt >= size) return null;
    const starts = [{ start: tok.stoppedAt, firstLine: tok.currentLine }];
    const window = Buffer.alloc(1 << 16);
    for (let i = 1; i < parts; i++) {
      const target = Math.max(starts[starts.length - 1]!.start + 1, Math.floor((i * size) / parts));
      const got = fs.readSync(fd, window, 0, Math.min(window.length, size - target), target);
      const nl = window.subarray(0, Math.max(0, got)).indexOf(10);
      if (nl < 0 || target + nl + 1 >= size) break;
      const prev = starts[starts.length - 1]!;
      const start = target + nl + 1;
      starts.push({ start, firstLine: prev.firstLine + countLines(fd, prev.start, start) });
    }
    return { meta, header, starts };
  } finally {
    fs.closeSync(fd);
  }
}

/**
 * Check a file on disk. Files of PARALLEL_MIN_BYTES and more are split into one byte range per
 * worker thread (default: one per core), each read by the same reader; the gatherings are
 * merged in file order into what one pass gives. A range whose guessed start turns out to lie
 * inside a record (a quoted line break) is read again from the true record boundary, which the
 * range before it reports. `workerScript` is a module that calls runRangeWorker() when it is
 * not the main thread (default: the running script).
 */
export async function checkFile(
  file: string,
  plan: Plan,
  opts: CheckOptions & { workers?: number; workerScript?: string; execArgv?: string[]; minBytes?: number } = {},
): Promise<ReadinessReport> {
  const size = fs.statSync(file).size;
  const workers = opts.workers ?? defaultWorkers();
  const single = () => checkBatch(fs.createReadStream(file, { highWaterMark: 1 << 20 }), plan, { isUtf8, expectedBytes: size, ...opts });
  if (workers < 2 || size < (opts.minBytes ?? PARALLEL_MIN_BYTES)) return single();
  const t0 = now();
  const s = survey(file, size, workers);
  if (!s || s.starts.length < 2) return single();
  const planHash = await hashPlan(plan);
  const script = path.resolve(opts.workerScript ?? process.argv[1]!);
  const progress = s.starts.map(() => 0);
  const ends = s.starts.map((_, i) => s.starts[i + 1]?.start ?? size);
  const run = (i: number, start: number, firstLine: number) =>
    new Promise<RangeResult>((resolve, reject) => {
      const job: RangeJob = { file, start, end: ends[i]!, plan, meta: s.meta, header: s.header, firstLine };
      const w = startWorker(script, { tributaryRange: job }, opts.execArgv);
      w.on("message", (m: RangeResult) => {
        if ("progress" in m) {
          progress[i] = m.progress;
          const rows = progress.reduce((a, b) => a + b, 0);
          opts.onProgress?.({ rows, bytes: Math.min(size, Math.round((size * (i + 1)) / s.starts.length)) });
        } else resolve(m);
      });
      w.on("error", reject);
      w.on("exit", (code) => (code !== 0 ? reject(new Error(`range worker exited with code ${code}`)) : undefined));
    });
  const first = await Promise.all(s.starts.map((r, i) => run(i, r.start, r.firstLine)));
  // in file order: each range must start where the one before it stopped
  const results: RangeResult[] = [];
  let expect = { start: s.starts[0]!.start, line: s.starts[0]!.firstLine };
  for (let i = 0; i < first.length; i++) {
    let r = first[i]!;
    if ("ok" in r && r.ok && r.start !== expect.start) r = await run(i, expect.start, expect.line);
    results.push(r);
    if (!("ok" in r) || !r.ok) break;
    expect = { start: r.stoppedAt, line: r.lineAfter };
  }
  const failed = results.find((r) => "ok" in r && !r.ok);
  if (failed && "message" in failed) return unreadableReport(plan, planHash, new UnreadableError(failed.message, failed.fix, failed.detail), null, now() - t0);
  const scan = new Scan(plan);
  scan.onHeader(s.header, s.meta);
  let records = 0;
  results.forEach((r, i) => {
    if ("ok" in r && r.ok) {
      absorbPart(scan, r.part, i === 0);
      records += r.records;
    }
  });
  return reportFromScan(scan, plan, planHash, { bytes: size, records, bom: s.meta.bom, delimiter: s.meta.delimiter }, t0);
}

/** Start a worker on a script; a TypeScript one is loaded through tsx's module hooks (development). */
function startWorker(script: string, data: unknown, execArgv?: string[]): Worker {
  const extra = execArgv ? { execArgv } : {};
  if (!/\.[cm]?ts$/.test(script)) return new Worker(script, { workerData: data, ...extra });
  const tsxApi = pathToFileURL(createRequire(path.join(process.cwd(), "index.js")).resolve("tsx/esm/api").replace(/\.cjs$/, ".mjs")).href;
  const code = `import(${JSON.stringify(tsxApi)}).then((m) => { m.register(); return import(${JSON.stringify(pathToFileURL(script).href)}); });`;
  return new Worker(code, { eval: true, workerData: data, ...extra });
}

/** True when this thread was started by checkFile to read one byte range. */
export function isRangeWorker(): boolean {
  return !isMainThread && typeof workerData === "object" && workerData !== null && "tributaryRange" in workerData;
}

/** The worker side of checkFile: read the range, post the Scan's part. */
export async function runRangeWorker(): Promise<void> {
  const job = (workerData as { tributaryRange: RangeJob }).tributaryRange;
  const scan = new Scan(job.plan);
  scan.onHeader(job.header, job.meta);
  scan.expectedBytes = job.end - job.start;
  try {
    const read = await readCsv(fs.createReadStream(job.file, { start: job.start, highWaterMark: 1 << 20 }), scan, {
      range: { meta: job.meta, byteOffset: job.start, firstLine: job.firstLine, endOffset: job.end },
      isUtf8,
      onProgress: (p) => parentPort!.postMessage({ progress: p.rows } satisfies RangeResult),
    });
    const part = scanPart(scan);
    const transfer = [part.rowSet.hi.buffer, part.rowSet.lo.buffer, part.rowSet.line.buffer, ...part.keys.flatMap(([, k]) => [k.set.hi.buffer, k.set.lo.buffer, k.set.line.buffer]), ...part.cols.flatMap((c) => (c.quant ? [c.quant.values.buffer] : []))];
    const done: RangeDone = { ok: true, part, records: read.records, start: job.start, stoppedAt: read.stoppedAt, lineAfter: read.lineAfter };
    parentPort!.postMessage(done satisfies RangeResult, transfer as ArrayBuffer[]);
  } catch (e) {
    if (e instanceof UnreadableError) parentPort!.postMessage({ ok: false, message: e.message, fix: e.fix, detail: e.detail } satisfies RangeResult);
    else throw e;
  }
}
