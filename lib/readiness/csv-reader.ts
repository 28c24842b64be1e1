/**
 * Streaming CSV reading for every path that reads a batch: bytes checked (file kind, strict
 * UTF-8, no NUL), the format sniffed, then records from the one tokenizer (./tokenizer.ts),
 * in bounded memory. Readers take the records as byte spans (the check's hot path) or as
 * strings; row numbers come from here only.
 */
import { UnreadableError, Utf8Check, checkBinary, sniffBytes } from "./decode";
import { recordText, type FieldBatch } from "./fields";
import { Tokenizer } from "./tokenizer";

export type ByteInput = ReadableStream<Uint8Array> | AsyncIterable<Uint8Array>;

export interface CsvLimits {
  /** longest field, in bytes (spreadsheet cells hold at most 32,767 characters) */
  maxFieldChars: number;
  /** longest record (one row, possibly spanning lines), in bytes */
  maxRecordChars: number;
  /** widest header */
  maxColumns: number;
}

export const DEFAULT_LIMITS: CsvLimits = {
  maxFieldChars: 1 << 20,
  maxRecordChars: 4 << 20,
  maxColumns: 2000,
};

export interface CsvMeta {
  delimiter: string;
  newline: string;
  encoding: "utf-8";
  bom: boolean;
}

export interface CsvSink {
  onHeader(fields: string[], meta: CsvMeta): void;
  /** records as strings with the 1-based line on which each starts (header = line 1) */
  onRecords?(rows: string[][], lines: number[]): void;
  /** records as byte spans (preferred when present): a block at a time */
  onBatch?(batch: FieldBatch): void;
}

const SNIFF_BYTES = 1 << 16;

/** Iterate a web ReadableStream or any async iterable of byte chunks. */
export async function* bytesOf(input: ByteInput): AsyncGenerator<Uint8Array> {
  if (typeof (input as ReadableStream<Uint8Array>).getReader === "function") {
    const reader = (input as ReadableStream<Uint8Array>).getReader();
    try {
      for (;;) {
        const r = await reader.read();
        if (r.done) return;
        if (r.value) yield r.value;
      }
    } finally {
      reader.releaseLock();
    }
  } else {
    for await (const c of input as AsyncIterable<Uint8Array>) yield c;
  }
}

/** Choose the newline and the delimiter (comma, semicolon or tab) from the start of the text. */
export function sniffText(sample: string, complete: boolean): { delimiter: string; newline: string } {
  let newline = "\n";
  let inQuote = false;
  for (let i = 0; i < sample.length; i++) {
    const ch = sample[i];
    if (ch === '"') inQuote = !inQuote;
    else if (!inQuote && (ch === "\n" || ch === "\r")) {
      newline = ch === "\r" ? (sample[i + 1] === "\n" ? "\r\n" : "\r") : "\n";
      break;
    }
  }
  const candidates = [",", ";", "\t"];
  const perLine: number[][] = candidates.map(() => []);
  const counts = candidates.map(() => 0);
  inQuote = false;
  let lines = 0;
  for (let i = 0; i < sample.length && lines < 50; i++) {
    const ch = sample[i]!;
    if (ch === '"') inQuote = !inQuote;
    else if (!inQuote) {
      const k = candidates.indexOf(ch);
      if (k >= 0) counts[k]!++;
      else if (ch === newline[0]) {
        candidates.forEach((_, j) => perLine[j]!.push(counts[j]!));
        counts.fill(0);
        lines++;
        if (newline.length === 2) i++;
      }
    }
  }
  if (complete || lines === 0) candidates.forEach((_, j) => perLine[j]!.push(counts[j]!));
  let best = ",";
  let bestScore = -1;
  candidates.forEach((c, j) => {
    const l = perLine[j]!;
    const head = l[0] ?? 0;
    if (head === 0) return;
    const agree = l.filter((v) => v === head).length;
    const score = agree * 1000 + Math.min(head, 999);
    if (score > bestScore) {
      bestScore = score;
      best = c;
    }
  });
  return { delimiter: best, newline };
}

export interface ReadOptions {
  limits?: Partial<CsvLimits>;
  onProgress?: (p: { rows: number; bytes: number }) => void;
  /** reading a byte range of a larger file: its header and format are known, where it starts,
   * and (optionally) the offset at or after which no record may start */
  range?: { meta: CsvMeta; byteOffset: number; firstLine: number; endOffset?: number };
  /** a fast strict UTF-8 validator (Node: buffer.isUtf8) */
  isUtf8?: (b: Uint8Array) => boolean;
  /** the delimiter when known (a report's `file.delimiter`); otherwise sniffed from the start */
  delimiter?: string;
  /** batches carry raw file offsets (FieldBatch.recOffsets, rawEnds): the fixes' rewriter */
  raw?: boolean;
}

export interface ReadResult {
  bytes: number;
  records: number;
  meta: CsvMeta | null;
  blankLines: number;
  /** file offset just past the last record read (a range read stops at the first record at or beyond its end) */
  stoppedAt: number;
  /** the line on which the record at `stoppedAt` starts */
  lineAfter: number;
}

const EMPTY = () =>
  new UnreadableError(
    "The file is empty (0 bytes).",
    "Upload the exported CSV file itself; check that the export finished and the file has a header row and data.",
    { kind: "empty" },
  );
const NO_TEXT = () =>
  new UnreadableError(
    "The file holds no text (only blank lines or a byte-order mark).",
    "Upload the exported CSV file itself, with a header row and data.",
    { kind: "empty" },
  );

/**
 * Read a CSV byte stream into `sink`. Throws UnreadableError when the file cannot be read;
 * returns the totals when it can.
 */
export async function readCsv(input: ByteInput, sink: CsvSink, opts: ReadOptions = {}): Promise<ReadResult> {
  const limits = { ...DEFAULT_LIMITS, ...opts.limits };
  const utf8 = new Utf8Check(opts.isUtf8);
  const range = opts.range;
  let bytes = range?.byteOffset ?? 0;
  let meta: CsvMeta | null = range?.meta ?? null;
  let tok: Tokenizer | null = null;
  let headerSeen = range !== undefined;
  let records = 0;
  let lastProgress = 0;
  // bytes held back until the file kind and the delimiter are known
  let held: Uint8Array[] = [];
  let heldBytes = 0;
  let any = false;

  const emit = (b: FieldBatch) => {
    let first = 0;
    if (!headerSeen) {
      headerSeen = true;
      first = 1;
      const f = recordText(b, 0);
      if (f.length > limits.maxColumns) {
        throw new UnreadableError(
          `The header has ${f.length.toLocaleString("en")} columns; the engine reads at most ${limits.maxColumns.toLocaleString("en")}.`,
          "Check that the delimiter is right and that the table is not transposed (one row per observation, one column per variable); drop the columns the study does not use.",
          { kind: "too-many-columns", columns: f.length },
        );
      }
      sink.onHeader(f, meta!);
    }
    // the rewriter needs the header record's raw offsets even when no data record came with it
    if (b.count <= first) {
      if (opts.raw && first === 1) sink.onBatch?.({ ...b, first });
      return;
    }
    records += b.count - first;
    if (sink.onBatch) sink.onBatch({ ...b, first });
    else {
      const rows: string[][] = [];
      const lines: number[] = [];
      for (let r = first; r < b.count; r++) {
        rows.push(recordText(b, r));
        lines.push(b.lines[r]!);
      }
      sink.onRecords?.(rows, lines);
    }
    if (opts.onProgress && records - lastProgress >= 50_000) {
      lastProgress = records;
      opts.onProgress({ rows: records, bytes });
    }
  };

  const start = (all: Uint8Array, last: boolean) => {
    let skip = 0;
    if (!range) {
      skip = sniffBytes(all).bom;
      const s = sniffText(new TextDecoder().decode(all.subarray(skip, skip + SNIFF_BYTES)), last);
      meta = {
        ...s,
        ...(opts.delimiter ? { delimiter: opts.delimiter } : {}),
        encoding: "utf-8",
        bom: skip > 0,
      };
    }
    const tokLimits = { maxFieldBytes: limits.maxFieldChars, maxRecordBytes: limits.maxRecordChars };
    tok = new Tokenizer(meta!.delimiter.charCodeAt(0), tokLimits, {
      offset: bytes + skip,
      firstLine: range?.firstLine ?? 1,
      endOffset: range?.endOffset,
      raw: opts.raw,
    });
    return skip;
  };

  const feed = (chunk: Uint8Array, last: boolean) => {
    if (!tok) {
      if (chunk.length) held.push(chunk);
      heldBytes += chunk.length;
      if (!last && heldBytes < SNIFF_BYTES) return;
      const all = new Uint8Array(heldBytes);
      let o = 0;
      for (const h of held) {
        all.set(h, o);
        o += h.length;
      }
      held = [];
      if (all.length === 0 && !range) throw EMPTY();
      const skip = start(all, last);
      checkBinary(all, bytes);
      utf8.check(all, bytes, last);
      bytes += all.length;
      tok!.push(all.subarray(skip), last, emit);
      return;
    }
    checkBinary(chunk, bytes);
    utf8.check(chunk, bytes, last);
    bytes += chunk.length;
    tok.push(chunk, last, emit);
  };

  if (range) start(new Uint8Array(0), false);
  for await (const raw of bytesOf(input)) {
    if (raw.length === 0) continue;
    any = true;
    feed(raw, false);
    if (tok && (tok as Tokenizer).stoppedAt >= 0) break;
  }
  if (!any && !range) throw EMPTY();
  const t = tok as Tokenizer | null;
  if (!t || t.stoppedAt < 0) feed(new Uint8Array(0), true);
  const done = tok as unknown as Tokenizer;
  if (!headerSeen) throw NO_TEXT();
  if (opts.onProgress) opts.onProgress({ rows: records, bytes });
  return {
    bytes,
    records,
    meta,
    blankLines: done.blankLines,
    stoppedAt: done.stoppedAt,
    lineAfter: done.currentLine,
  };
}
