/**
 * The tokenizer's record store (./tokenizer.ts): the spans of the fields read so far — those
 * of the complete records of the current block, then the unfinished record's — with the line
 * (and, opt-in, the raw file offsets) of each record, handed out as a FieldBatch.
 */
import type { FieldBatch } from "./fields";

const grow = (a: Int32Array<ArrayBuffer>, need: number): Int32Array<ArrayBuffer> => {
  if (need <= a.length) return a;
  const b = new Int32Array(Math.max(need, a.length * 2));
  b.set(a);
  return b;
};

const growF = (a: Float64Array<ArrayBuffer>, need: number): Float64Array<ArrayBuffer> => {
  if (need <= a.length) return a;
  const b = new Float64Array(Math.max(need, a.length * 2));
  b.set(a);
  return b;
};

export class RecordStore {
  starts: Int32Array<ArrayBuffer> = new Int32Array(4096);
  ends: Int32Array<ArrayBuffer> = new Int32Array(4096);
  /** fields held: those of the complete records, then the unfinished record's */
  nf = 0;
  private recs: Int32Array<ArrayBuffer> = new Int32Array(1025);
  private lines: Int32Array<ArrayBuffer> = new Int32Array(1024);
  /** complete records held */
  count = 0;
  /** raw offsets (opt-in: the byte-faithful rewriter needs them, the check does not) */
  private rawEnds: Float64Array<ArrayBuffer> | null = null;
  private recOffsets: Float64Array<ArrayBuffer> | null = null;

  constructor(raw: boolean) {
    if (raw) {
      this.rawEnds = new Float64Array(4096);
      this.recOffsets = new Float64Array(1024);
    }
  }

  /** fields of the unfinished record so far */
  get openFields(): number {
    return this.nf - this.recs[this.count]!;
  }

  /** A field buf[s, e); `rawEnd`: the file offset just past its raw text (closing quote and all). */
  addField(s: number, e: number, rawEnd: number): void {
    const nf = this.nf;
    if (nf >= this.starts.length) {
      this.starts = grow(this.starts, nf + 1);
      this.ends = grow(this.ends, nf + 1);
    }
    this.starts[nf] = s;
    this.ends[nf] = e;
    if (this.rawEnds) {
      this.rawEnds = growF(this.rawEnds, nf + 1);
      this.rawEnds[nf] = rawEnd;
    }
    this.nf = nf + 1;
  }

  /**
   * End the unfinished record, which starts on `line` at file offset `offset`. A record of one
   * empty unquoted field is a blank line: dropped, and false is returned.
   */
  endRecord(line: number, offset: number, quoted: boolean): boolean {
    const from = this.recs[this.count]!;
    if (this.nf - from === 1 && this.ends[from] === this.starts[from] && !quoted) {
      this.nf = from;
      return false;
    }
    const c = this.count;
    if (c + 2 > this.recs.length) this.recs = grow(this.recs, c + 2);
    if (c + 1 > this.lines.length) this.lines = grow(this.lines, c + 1);
    this.lines[c] = line;
    if (this.recOffsets) {
      this.recOffsets = growF(this.recOffsets, c + 1);
      this.recOffsets[c] = offset;
    }
    this.count = c + 1;
    this.recs[c + 1] = this.nf;
    return true;
  }

  /** The complete records as a block over `buf`. */
  batch(buf: Uint8Array): FieldBatch {
    const b: FieldBatch = {
      buf,
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
    return b;
  }

  /** Drop the complete records (after they were handed out): the unfinished record's fields move to the front. */
  dropComplete(): void {
    const from = this.recs[this.count]!;
    this.starts.copyWithin(0, from, this.nf);
    this.ends.copyWithin(0, from, this.nf);
    this.rawEnds?.copyWithin(0, from, this.nf);
    this.nf -= from;
    this.count = 0;
    this.recs[0] = 0;
  }

  /** The buffer's bytes moved `by` towards its start: move the spans with them. */
  shift(by: number): void {
    for (let f = 0; f < this.nf; f++) {
      this.starts[f]! -= by;
      this.ends[f]! -= by;
    }
  }
}
