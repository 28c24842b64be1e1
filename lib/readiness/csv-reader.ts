/**
 * Streaming CSV reading: bytes → UTF-8 text → records, in bounded memory.
 * Tokenizing is papaparse's Parser, fed text chunks; the partial record at the end of a
 * chunk is carried to the next one, and refused once it outgrows `maxRecordChars`.
 */
import Papa from "papaparse";
import { UnreadableError, Utf8Stream, checkBinary, sniffBytes } from "./decode";

export type ByteInput = ReadableStream<Uint8Array> | AsyncIterable<Uint8Array>;

export interface CsvLimits {
  /** longest field, in characters (spreadsheet cells hold at most 32,767) */
  maxFieldChars: number;
  /** longest record (one row, possibly spanning lines), in characters */
  maxRecordChars: number;
  /** widest header */
  maxColumns: number;
}

export const DEFAULT_LIMITS: CsvLimits = { maxFieldChars: 1 << 20, maxRecordChars: 4 << 20, maxColumns: 2000 };

export interface CsvMeta {
  delimiter: string;
  newline: string;
  encoding: "utf-8";
  bom: boolean;
}

export interface CsvSink {
  onHeader(fields: string[], meta: CsvMeta): void;
  /** records with the 1-based line on which each starts (header = line 1) */
  onRecords(rows: string[][], lines: number[]): void;
  /** optional fast path for quote-free text: complete lines text[from, to); returns [lines, records] */
  onLines?(text: string, from: number, to: number, firstLine: number, delimiter: string): [number, number];
}

const BYTE_SLICE = 1 << 18;
const TEXT_CHUNK = 1 << 18;
const SNIFF_CHARS = 1 << 16;

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

function countNewlines(s: string): number {
  let n = 0;
  let at = s.indexOf("\n");
  while (at >= 0) {
    n++;
    at = s.indexOf("\n", at + 1);
  }
  if (n === 0 && s.indexOf("\r") >= 0) for (let i = 0; i < s.length; i++) if (s.charCodeAt(i) === 13) n++;
  return n;
}

/** The refusal of a record that outgrew the cap: an open quote near its start, or a line without a break. */
function tooLong(pending: string, line: number, maxRecordChars: number): UnreadableError {
  const q = pending.indexOf('"');
  const open = q >= 0 && q < 1000;
  const mb = Math.max(1, Math.round(maxRecordChars / (1 << 20)));
  return new UnreadableError(
    open
      ? `A quoted field that starts on line ${line} is never closed: more than ${mb} MB of text follows without the closing quote.`
      : `Line ${line} runs on for more than ${mb} MB without a line break; this is not a line-based CSV file.`,
    open
      ? `Check line ${line}: every opening " needs a closing " (write a quote inside a quoted value as "").`
      : "Export the data again as CSV with one row per line; check that the file is not a single long line of data or a different format.",
    { kind: open ? "unclosed-quote" : "line-too-long", line },
  );
}

/**
 * Read a CSV byte stream into `sink`. Throws UnreadableError when the file cannot be read;
 * returns the totals when it can.
 */
export async function readCsv(
  input: ByteInput,
  sink: CsvSink,
  opts: {
    limits?: Partial<CsvLimits>;
    onProgress?: (p: { rows: number; bytes: number }) => void;
    /** reading a byte range of a larger file: its header and format are known, and where it starts */
    range?: { meta: CsvMeta; byteOffset: number; firstLine: number };
    /** a faster decoder for pure-ASCII chunks (Node: Buffer's latin1), null when a chunk is not ASCII */
    fastAscii?: (b: Uint8Array) => string | null;
    /** "papaparse": tokenize everything with papaparse (no quote-free fast path) */
    tokenizer?: "auto" | "papaparse";
  } = {},
): Promise<{ bytes: number; records: number; meta: CsvMeta | null; blankLines: number }> {
  const limits = { ...DEFAULT_LIMITS, ...opts.limits };
  const utf8 = new Utf8Stream(opts.fastAscii);
  let bytes = opts.range?.byteOffset ?? 0;
  let head: Uint8Array | null = opts.range ? null : new Uint8Array(0);
  let bom = false;
  let text = "";
  let meta: CsvMeta | null = opts.range?.meta ?? null;
  let parser: Papa.Parser | null = null;
  let line = opts.range?.firstLine ?? 1;
  let records = 0;
  let blankLines = 0;
  let headerSeen = opts.range !== undefined;
  let lastProgress = 0;
  // whether a line break arrived since the pending text was last tokenized (searched in each new
  // piece only: searching the pending text would flatten it again and again), and the length the
  // pending text must reach before a parse that ended no record is tried again
  let breakSince = false;
  let retryAt = 0;

  const feed = (last: boolean) => {
    if (!parser && meta) parser = new Papa.Parser({ delimiter: meta.delimiter, newline: meta.newline as "\n", quoteChar: '"' });
    if (!meta) {
      if (!last && text.length < SNIFF_CHARS) return;
      const s = sniffText(text.slice(0, SNIFF_CHARS), last);
      meta = { ...s, encoding: "utf-8", bom };
      parser = new Papa.Parser({ delimiter: s.delimiter, newline: s.newline as "\n", quoteChar: '"' });
    }
    if (!last && text.length < TEXT_CHUNK) return;
    if (sink.onLines && opts.tokenizer !== "papaparse" && headerSeen && meta.newline !== "\r" && text.length <= limits.maxFieldChars && text.indexOf('"') < 0) {
      // quote-free text: every line is one record; no tokenizer needed
      const cut = last ? text.length : text.lastIndexOf("\n") + 1;
      if (cut > 0) {
        const [n, recs] = sink.onLines(text, 0, cut, line, meta.delimiter);
        line += n;
        records += recs;
        text = text.substring(cut);
        breakSince = false;
        retryAt = 0;
        if (opts.onProgress && (records - lastProgress >= 50_000 || last)) {
          lastProgress = records;
          opts.onProgress({ rows: records, bytes });
        }
        return;
      }
    }
    if (!last && text.length <= limits.maxRecordChars) {
      // No record can have ended since the last tokenizing: no line break in the pending text
      // (a 20 MB line), or it has not doubled since a parse found no record end (an open quote).
      // Tokenizing again would only re-read it; wait for more text, up to the record cap.
      if (!breakSince || text.length < retryAt) return;
    } else if (!last && !breakSince) {
      throw tooLong(text, line, limits.maxRecordChars);
    }
    breakSince = false;
    const res = parser!.parse(text, 0, !last) as { data: string[][]; errors: { code: string; row: number }[]; meta: { cursor: number } };
    const hasQuote = text.indexOf('"') >= 0;
    const checkFields = text.length > limits.maxFieldChars;
    const rows: string[][] = [];
    const lines: number[] = [];
    const missingQuote = last ? res.errors.find((e) => e.code === "MissingQuotes") : undefined;
    for (let r = 0; r < res.data.length; r++) {
      const f = res.data[r]!;
      const start = line;
      let span = 1;
      if (hasQuote) for (const v of f) if (v.length > 0 && (v.indexOf("\n") >= 0 || v.indexOf("\r") >= 0)) span += countNewlines(v);
      line += span;
      if (missingQuote && r === missingQuote.row) {
        throw new UnreadableError(
          `A quoted field that starts on line ${start} is never closed: the rest of the file was read as one value.`,
          `Check line ${start}: every opening " needs a closing " (write a quote inside a quoted value as "").`,
          { kind: "unclosed-quote", line: start },
        );
      }
      if (f.length === 1 && f[0] === "") {
        if (headerSeen) blankLines++;
        continue;
      }
      if (checkFields) {
        for (let j = 0; j < f.length; j++) {
          if (f[j]!.length > limits.maxFieldChars) {
            throw new UnreadableError(
              `Line ${start}, field ${j + 1} holds ${f[j]!.length.toLocaleString("en")} characters; the engine reads fields of at most ${limits.maxFieldChars.toLocaleString("en")}.`,
              `Check line ${start}: a quote may be left open, or the cell holds something other than data (a picture, a document). Remove it and export again.`,
              { kind: "field-too-long", line: start },
            );
          }
        }
      }
      if (!headerSeen) {
        headerSeen = true;
        if (f.length > limits.maxColumns) {
          throw new UnreadableError(
            `The header has ${f.length.toLocaleString("en")} columns; the engine reads at most ${limits.maxColumns.toLocaleString("en")}.`,
            "Check that the delimiter is right and that the table is not transposed (one row per observation, one column per variable); drop the columns the study does not use.",
            { kind: "too-many-columns", columns: f.length },
          );
        }
        f[0] = f[0]!.replace(/^\uFEFF/, "");
        sink.onHeader(f, meta!);
        continue;
      }
      rows.push(f);
      lines.push(start);
    }
    // a parse that ended no record is tried again only once the pending text has doubled
    retryAt = res.meta.cursor === 0 && res.data.length === 0 ? text.length * 2 : 0;
    text = text.substring(res.meta.cursor);
    if (text.length > limits.maxRecordChars) throw tooLong(text, line, limits.maxRecordChars);
    records += rows.length;
    if (rows.length) sink.onRecords(rows, lines);
    if (opts.onProgress && (records - lastProgress >= 50_000 || last)) {
      lastProgress = records;
      opts.onProgress({ rows: records, bytes });
    }
  };

  for await (const raw of bytesOf(input)) {
    for (let off = 0; off < raw.length; off += BYTE_SLICE) {
      let chunk = raw.subarray(off, Math.min(raw.length, off + BYTE_SLICE));
      if (head) {
        // Collect enough bytes to recognise the file kind before decoding anything.
        const merged: Uint8Array = new Uint8Array(head.length + chunk.length);
        merged.set(head);
        merged.set(chunk, head.length);
        if (merged.length < 8) {
          head = merged;
          continue;
        }
        bom = sniffBytes(merged).bom > 0;
        head = null;
        chunk = merged;
      }
      checkBinary(chunk, bytes);
      const piece = utf8.decode(chunk, bytes, false);
      if (!breakSince && (piece.indexOf("\n") >= 0 || piece.indexOf("\r") >= 0)) breakSince = true;
      text += piece;
      bytes += chunk.length;
      feed(false);
    }
  }
  if (head) {
    if (head.length === 0) {
      throw new UnreadableError("The file is empty (0 bytes).", "Upload the exported CSV file itself; check that the export finished and the file has a header row and data.", { kind: "empty" });
    }
    bom = sniffBytes(head).bom > 0;
    checkBinary(head, 0);
    text += utf8.decode(head, 0, false);
    bytes += head.length;
  }
  text += utf8.decode(new Uint8Array(0), bytes, true);
  if (text.replace(/^\uFEFF/, "").trim() === "" && !headerSeen) {
    throw new UnreadableError("The file holds no text (only blank lines or a byte-order mark).", "Upload the exported CSV file itself, with a header row and data.", { kind: "empty" });
  }
  feed(true);
  return { bytes, records, meta, blankLines };
}
