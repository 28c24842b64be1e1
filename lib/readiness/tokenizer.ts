/**
 * The one CSV tokenizer: RFC 4180 records from bytes, a chunk at a time, resumable at any byte.
 * Quoted fields may hold delimiters, doubled quotes and line breaks; records end at LF, CR or
 * CRLF; a quote inside an unquoted field is an ordinary character, and text after a closing
 * quote is kept (`"ab"c` reads `abc`). Fields are spans of the tokenizer's buffer (a quoted
 * field's doubled quotes are undone in place), handed out a block of records at a time, so no
 * string is made unless a reader asks for one. Line numbers count every line break of the raw
 * bytes, quoted ones included: they are the lines a spreadsheet or a text editor shows.
 * Memory: the unfinished record and the current block; a record is refused beyond a cap.
 */
import type { FieldBatch } from "./fields";
import { fieldTooLong, recordTooLong, unclosedQuote } from "./reader-errors";
import { RecordStore } from "./tokenizer-records";

export type { FieldBatch };

export interface TokenizerLimits {
  /** longest field, in bytes */
  maxFieldBytes: number;
  /** longest record, in bytes */
  maxRecordBytes: number;
}

const QUOTE = 34;
const LF = 10;
const CR = 13;

/** Where the tokenizer is inside a record. */
const enum At {
  FieldStart,
  Unquoted,
  Quoted,
  /** a quote inside a quoted field: the next byte says whether it closes the field */
  QuoteSeen,
  AfterClosingQuote,
}

export class Tokenizer {
  private buf = new Uint8Array(1 << 16);
  private len = 0;
  /** file offset of buf[0] */
  private base: number;
  private pos = 0;
  private at = At.FieldStart;
  private skipLF = false;
  private prevCR = false;
  private recStart = 0;
  private fieldStart = 0;
  /** write position of the current quoted field (doubled quotes shrink it) */
  private wp = 0;
  private line: number;
  private recLine: number;
  private fieldQuoted = false;
  private readonly store: RecordStore;
  blankLines = 0;
  /** set once a record would start at or beyond `endOffset` (or the input ended) */
  stoppedAt = -1;

  constructor(
    private readonly delimiter: number,
    private readonly limits: TokenizerLimits,
    opts: { offset?: number; firstLine?: number; endOffset?: number; raw?: boolean } = {},
  ) {
    this.store = new RecordStore(opts.raw === true);
    this.base = opts.offset ?? 0;
    this.line = opts.firstLine ?? 1;
    this.recLine = this.line;
    this.endOffset = opts.endOffset ?? Infinity;
  }
  private readonly endOffset: number;

  /** the line the next byte is on */
  get currentLine(): number {
    return this.line;
  }

  /** Add bytes (`last`: the input ends here) and hand the complete records to `emit`. */
  push(chunk: Uint8Array, last: boolean, emit: (b: FieldBatch) => void): void {
    if (this.stoppedAt >= 0) return;
    this.append(chunk);
    this.run(last);
    if (this.store.count > 0) emit(this.store.batch(this.buf));
    this.store.dropComplete();
    if (this.len - this.recStart > this.limits.maxRecordBytes)
      throw recordTooLong(
        this.recLine,
        this.at === At.Quoted || this.at === At.QuoteSeen,
        this.limits.maxRecordBytes,
      );
  }

  private append(chunk: Uint8Array): void {
    if (this.buf.length - this.len < chunk.length) {
      const shift = this.recStart;
      if (shift > 0) {
        this.buf.copyWithin(0, shift, this.len);
        this.len -= shift;
        this.pos -= shift;
        this.fieldStart -= shift;
        this.wp -= shift;
        this.recStart = 0;
        this.base += shift;
        this.store.shift(shift);
      }
      if (this.buf.length - this.len < chunk.length) {
        const b = new Uint8Array(Math.max(this.buf.length * 2, this.len + chunk.length));
        b.set(this.buf.subarray(0, this.len));
        this.buf = b;
      }
    }
    this.buf.set(chunk, this.len);
    this.len += chunk.length;
  }

  /** `raw`: the buffer index just past the field's raw text (its closing quote and anything after it) */
  private endField(s: number, e: number, raw: number): void {
    if (e - s > this.limits.maxFieldBytes)
      throw fieldTooLong(this.recLine, this.store.openFields + 1, e - s, this.limits.maxFieldBytes);
    this.store.addField(s, e, this.base + raw);
  }

  private endRecord(next: number): void {
    this.line++;
    if (!this.store.endRecord(this.recLine, this.base + this.recStart, this.fieldQuoted)) this.blankLines++;
    this.fieldQuoted = false;
    this.recStart = next;
    this.recLine = this.line;
  }

  /** Line breaks in quoted text buf[a, b): LF, CR and CRLF count once each. */
  private countBreaks(a: number, b: number): void {
    const buf = this.buf;
    let prevCR = this.prevCR;
    let n = 0;
    for (let i = a; i < b; i++) {
      const c = buf[i]!;
      if (c === CR) n++;
      else if (c === LF && !prevCR) n++;
      prevCR = c === CR;
    }
    if (b > a) this.prevCR = prevCR;
    this.line += n;
  }

  private run(last: boolean): void {
    const b = this.buf;
    const n = this.len;
    const d = this.delimiter;
    let i = this.pos;
    let at = this.at;
    while (i < n) {
      if (this.skipLF) {
        this.skipLF = false;
        if (b[i] === LF) {
          i++;
          this.recStart = i;
          continue;
        }
      }
      if (at === At.FieldStart) {
        if (this.store.openFields === 0 && this.base + i >= this.endOffset) {
          this.stoppedAt = this.base + i;
          break;
        }
        if (b[i] === QUOTE) {
          at = At.Quoted;
          this.fieldQuoted = true;
          this.prevCR = false;
          i++;
          this.fieldStart = this.wp = i;
          continue;
        }
        this.fieldStart = i;
        at = At.Unquoted;
      }
      if (at === At.Unquoted) {
        let j = i;
        let c = 0;
        for (; j < n; j++) {
          c = b[j]!;
          if (c === d || c === LF || c === CR) break;
        }
        if (j === n) {
          i = n;
          break;
        }
        this.endField(this.fieldStart, j, j);
        i = j + 1;
        at = At.FieldStart;
        if (c !== d) {
          this.skipLF = c === CR;
          this.endRecord(i);
        }
        continue;
      }
      if (at === At.Quoted) {
        let q = b.indexOf(QUOTE, i);
        if (q >= n) q = -1;
        const end = q < 0 ? n : q;
        this.countBreaks(i, end);
        if (this.wp !== i) b.copyWithin(this.wp, i, end);
        this.wp += end - i;
        i = end;
        if (q < 0) break;
        i = q + 1;
        at = At.QuoteSeen;
        continue;
      }
      if (at === At.QuoteSeen) {
        if (b[i] === QUOTE) {
          b[this.wp++] = QUOTE;
          this.prevCR = false;
          i++;
          at = At.Quoted;
          continue;
        }
        at = At.AfterClosingQuote;
      }
      // after the closing quote: a delimiter, a line end, or text kept as it is
      const c = b[i]!;
      if (c === d || c === LF || c === CR) {
        this.endField(this.fieldStart, this.wp, i);
        i++;
        at = At.FieldStart;
        if (c !== d) {
          this.skipLF = c === CR;
          this.endRecord(i);
        }
      } else {
        b[this.wp++] = c;
        i++;
      }
    }
    this.pos = i;
    this.at = at;
    if (!last || this.stoppedAt >= 0) return;
    // the input ends: finish the open record
    if (at === At.Quoted) throw unclosedQuote(this.recLine);
    if (at === At.Unquoted) this.endField(this.fieldStart, n, n);
    else if (at === At.QuoteSeen || at === At.AfterClosingQuote) this.endField(this.fieldStart, this.wp, n);
    else if (this.store.openFields > 0) this.endField(n, n, n);
    if (this.store.openFields > 0) {
      this.endRecord(n);
      this.line--; // no line break ended it
    }
    this.at = At.FieldStart;
    this.stoppedAt = this.base + n;
  }
}
