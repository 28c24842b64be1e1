/**
 * Node-only helpers (not part of the framework-free core): check a file on disk, splitting a
 * large file into byte ranges read by worker threads whose gatherings are merged afterwards.
 * The merged result equals one pass (same counts, rows, factor); quartiles beyond the exact
 * bound come from the parts' samples.
 */
import { isAscii } from "node:buffer";
import fs from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { Worker, isMainThread, parentPort, workerData } from "node:worker_threads";
import { checkBatch, hashPlan, now, reportFromScan, unreadableReport, type CheckOptions } from "./check";
import { readCsv, sniffText, type CsvMeta, type CsvSink } from "./csv-reader";
import { UnreadableError, sniffBytes } from "./decode";
import type { Plan } from "./plan";
import type { ReadinessReport } from "./report";
import { Scan } from "./scan";
import { absorbPart, scanPart, type ScanPart } from "./scan-merge";

/** Pure-ASCII bytes as a string through Buffer's latin1 decoding (identical to UTF-8 for ASCII, and faster). */
export function fastAscii(b: Uint8Array): string | null {
  return isAscii(b) ? Buffer.from(b.buffer, b.byteOffset, b.byteLength).toString("latin1") : null;
}

/** files smaller than this are read by one thread */
export const PARALLEL_MIN_BYTES = 16 << 20;

interface RangeJob {
  file: string;
  start: number;
  end: number;
  plan: Plan;
  meta: CsvMeta;
  header: string[];
  firstLine: number;
}

type RangeResult = { ok: true; part: ScanPart; records: number } | { ok: false; message: string; fix: string; detail: Record<string, unknown> } | { progress: number };

/** Where the data rows start, the header and format, and whether the file can be split safely. */
function survey(file: string, size: number, parts: number): { meta: CsvMeta; header: string[]; lines: number; splits: { start: number; end: number; firstLine: number }[] } | null {
  const fd = fs.openSync(file, "r");
  try {
    const head = Buffer.alloc(Math.min(size, 1 << 20));
    fs.readSync(fd, head, 0, head.length, 0);
    let bom = 0;
    try {
      bom = sniffBytes(head).bom;
    } catch {
      return null; // the single pass reports it
    }
    const nl = head.indexOf(10, bom);
    if (nl < 0) return null;
    const { delimiter, newline } = sniffText(head.subarray(bom, Math.min(head.length, bom + (1 << 16))).toString("utf8"), head.length === size);
    if (newline === "\r") return null;
    const header = head.subarray(bom, nl).toString("utf8").replace(/\r$/, "").split(delimiter);
    const meta: CsvMeta = { delimiter, newline, encoding: "utf-8", bom: bom > 0 };
    const dataStart = nl + 1;
    // one sweep: a file with quotes is not split (a record may span lines); line numbers at the splits
    const targets = Array.from({ length: parts - 1 }, (_, i) => Math.floor(((i + 1) * size) / parts));
    const starts = [dataStart];
    const firstLines = [2];
    let line = 2;
    let ti = 0;
    const block = Buffer.alloc(8 << 20);
    for (let pos = dataStart; pos < size; ) {
      const n = fs.readSync(fd, block, 0, Math.min(block.length, size - pos), pos);
      if (n <= 0) break;
      const b = block.subarray(0, n);
      if (b.indexOf(34) >= 0) return null;
      for (let at = b.indexOf(10); at >= 0; at = b.indexOf(10, at + 1)) {
        line++;
        const next = pos + at + 1;
        if (ti < targets.length && next >= targets[ti]! && next < size) {
          starts.push(next);
          firstLines.push(line);
          while (ti < targets.length && next >= targets[ti]!) ti++;
        }
      }
      pos += n;
    }
    const splits = starts.map((st, i) => ({ start: st, end: starts[i + 1] ?? size, firstLine: firstLines[i]! }));
    return { meta, header, lines: line, splits };
  } finally {
    fs.closeSync(fd);
  }
}

/**
 * Check a file on disk. Files of PARALLEL_MIN_BYTES and more without any double quote are
 * split at line breaks into one byte range per worker thread; `workerScript` is a module that
 * calls runRangeWorker() when it is not the main thread (default: the running script).
 */
export async function checkFile(
  file: string,
  plan: Plan,
  opts: CheckOptions & { workers?: number; workerScript?: string; execArgv?: string[]; minBytes?: number } = {},
): Promise<ReadinessReport> {
  const size = fs.statSync(file).size;
  // default: one thread; on a shared two-core machine the merge costs more than the second core gains
  const workers = opts.workers ?? 1;
  const single = () => checkBatch(fs.createReadStream(file, { highWaterMark: 1 << 20 }), plan, { fastAscii, expectedBytes: size, ...opts });
  if (workers < 2 || size < (opts.minBytes ?? PARALLEL_MIN_BYTES)) return single();
  const t0 = now();
  const s = survey(file, size, workers);
  if (!s || s.splits.length < 2) return single();
  const planHash = await hashPlan(plan);
  const script = path.resolve(opts.workerScript ?? process.argv[1]!);
  const progress = s.splits.map(() => 0);
  const results = await Promise.all(
    s.splits.map(
      (r, i) =>
        new Promise<RangeResult>((resolve, reject) => {
          const job: RangeJob = { file, start: r.start, end: r.end, plan, meta: s.meta, header: s.header, firstLine: r.firstLine };
          const w = startWorker(script, { tributaryRange: job }, opts.execArgv);
          w.on("message", (m: RangeResult) => {
            if ("progress" in m) {
              progress[i] = m.progress;
              const rows = progress.reduce((a, b) => a + b, 0);
              opts.onProgress?.({ rows, bytes: Math.min(size, Math.round((size * rows) / Math.max(1, s.lines - 2))) });
            } else resolve(m);
          });
          w.on("error", reject);
          w.on("exit", (code) => (code !== 0 ? reject(new Error(`range worker exited with code ${code}`)) : undefined));
        }),
    ),
  );
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
  const sink: CsvSink = scan;
  try {
    const read = await readCsv(fs.createReadStream(job.file, { start: job.start, end: job.end - 1, highWaterMark: 1 << 20 }), sink, {
      range: { meta: job.meta, byteOffset: job.start, firstLine: job.firstLine },
      fastAscii,
      onProgress: (p) => parentPort!.postMessage({ progress: p.rows } satisfies RangeResult),
    });
    const part = scanPart(scan);
    const transfer = [part.rowSet.hi.buffer, part.rowSet.lo.buffer, part.rowSet.line.buffer, ...part.keys.flatMap(([, k]) => [k.set.hi.buffer, k.set.lo.buffer, k.set.line.buffer]), ...part.cols.flatMap((c) => (c.quant ? [c.quant.values.buffer] : []))];
    parentPort!.postMessage({ ok: true, part, records: read.records } satisfies RangeResult, transfer as ArrayBuffer[]);
  } catch (e) {
    if (e instanceof UnreadableError) parentPort!.postMessage({ ok: false, message: e.message, fix: e.fix, detail: e.detail } satisfies RangeResult);
    else throw e;
  }
}
