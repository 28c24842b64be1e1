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

const grow = (a: Int32Array<ArrayBuffer>, need: number): Int32Array<ArrayBuffer> => {
  if (need <= a.length) return a;
  const b = new Int32Array(Math.max(need, a.length * 2));
  b.set(a);
  return b;
};

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
  private starts: Int32Array<ArrayBuffer> = new Int32Array(4096);
  private ends: Int32Array<ArrayBuffer> = new Int32Array(4096);
  /** fields held: those of the complete records, then the unfinished record's */
  private nf = 0;
  private recs: Int32Array<ArrayBuffer> = new Int32Array(1025);
  private lines: Int32Array<ArrayBuffer> = new Int32Array(1024);
  private count = 0;
  blankLines = 0;
  /** raw offsets (opt-in: the byte-faithful rewriter needs them, the check does not) */
  private rawEnds: Float64Array<ArrayBuffer> | null = null;
  private recOffsets: Float64Array<ArrayBuffer> | null = null;
  /** set once a record would start at or beyond `endOffset` (or the input ended) */
  stoppedAt = -1;

  constructor(
    private readonly delimiter: number,
    private readonly limits: TokenizerLimits,
    opts: { offset?: number; firstLine?: number; endOffset?: number; raw?: boolean } = {},
  ) {
    if (opts.raw) {
      this.rawEnds = new Float64Array(4096);
      this.recOffsets = new Float64Array(1024);
    }
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
    if (this.count > 0) {
      const b: FieldBatch = {
        buf: this.buf,
        starts: this.starts,
        ends: this.ends,
        recs: this.recs,
        lines: this.lines,
        first: 0,
        count: this.count,
      };
      if (this.rawEnds) {
        b.rawEnds = this.rawEnds;
        b.recOffsets = this.recOffsets!;
      }
      emit(b);
    }
    const open = this.nf - this.recs[this.count]!;
    this.starts.copyWithin(0, this.recs[this.count]!, this.nf);
    this.ends.copyWithin(0, this.recs[this.count]!, this.nf);
    this.rawEnds?.copyWithin(0, this.recs[this.count]!, this.nf);
    this.nf = open;
    this.count = 0;
    this.recs[0] = 0;
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
        for (let f = 0; f < this.nf; f++) {
          this.starts[f]! -= shift;
          this.ends[f]! -= shift;
        }
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
      throw fieldTooLong(
        this.recLine,
        this.nf - this.recs[this.count]! + 1,
        e - s,
        this.limits.maxFieldBytes,
      );
    if (this.nf >= this.starts.length) {
      this.starts = grow(this.starts, this.nf + 1);
      this.ends = grow(this.ends, this.nf + 1);
    }
    this.starts[this.nf] = s;
    this.ends[this.nf] = e;
    if (this.rawEnds) {
      if (this.nf >= this.rawEnds.length) {
        const g = new Float64Array(this.starts.length);
        g.set(this.rawEnds);
        this.rawEnds = g;
      }
      this.rawEnds[this.nf] = this.base + raw;
    }
    this.nf++;
  }

  private endRecord(next: number): void {
    this.line++;
    const from = this.recs[this.count]!;
    const blank = this.nf - from === 1 && this.ends[from] === this.starts[from] && !this.fieldQuoted;
    if (blank) {
      this.nf = from;
      this.blankLines++;
    } else {
      if (this.count + 2 > this.recs.length) this.recs = grow(this.recs, this.count + 2);
      if (this.count + 1 > this.lines.length) this.lines = grow(this.lines, this.count + 1);
      this.lines[this.count] = this.recLine;
      if (this.recOffsets) {
        if (this.count >= this.recOffsets.length) {
          const g = new Float64Array(this.lines.length);
          g.set(this.recOffsets);
          this.recOffsets = g;
        }
        this.recOffsets[this.count] = this.base + this.recStart;
      }
      this.count++;
      this.recs[this.count] = this.nf;
    }
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
        if (this.nf === this.recs[this.count] && this.base + i >= this.endOffset) {
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
    else if (this.nf > this.recs[this.count]!) this.endField(n, n, n);
    if (this.nf > this.recs[this.count]!) {
      this.endRecord(n);
      this.line--; // no line break ended it
    }
    this.at = At.FieldStart;
    this.stoppedAt = this.base + n;
  }
}
