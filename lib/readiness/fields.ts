/** Records as byte spans, from the tokenizer (./tokenizer.ts), and their text when a reader needs it. */

/** A block of complete records. Spans index `buf` and are valid only until the next push. */
export interface FieldBatch {
  buf: Uint8Array;
  /** field f of the block is buf[starts[f], ends[f]) */
  starts: Int32Array;
  ends: Int32Array;
  /** record r has the fields recs[r] … recs[r + 1] − 1 */
  recs: Int32Array;
  /** the line on which record r starts (the file's first line is 1) */
  lines: Int32Array;
  /** records in the block: first … count − 1 */
  first: number;
  count: number;
  /** with `raw` tracking only: the file offset where record r starts, and where field f's raw
   * text (quotes included) ends; field f + 1 starts one byte (the delimiter) after it */
  recOffsets?: Float64Array;
  rawEnds?: Float64Array;
}

const utf8 = new TextDecoder("utf-8");

/** The text of buf[s, e) (valid UTF-8). */
export function fieldText(buf: Uint8Array, s: number, e: number): string {
  if (e - s <= 32) {
    let out = "";
    for (let i = s; i < e; i++) {
      const c = buf[i]!;
      if (c >= 0x80) return utf8.decode(buf.subarray(s, e));
      out += String.fromCharCode(c);
    }
    return out;
  }
  return utf8.decode(buf.subarray(s, e));
}

/** The fields of record r of a block, as strings. */
export function recordText(b: FieldBatch, r: number): string[] {
  const out: string[] = [];
  for (let f = b.recs[r]!; f < b.recs[r + 1]!; f++) out.push(fieldText(b.buf, b.starts[f]!, b.ends[f]!));
  return out;
}

const latin1 = new TextDecoder("latin1");

/**
 * The text of a block's fields. The first fields asked for are decoded one by one; once a block
 * has asked for many (a column of free text, say), an ASCII block is decoded a window at a time
 * and a field's text is a slice of the window's string, as cheap as a substring; otherwise field
 * by field. A window is at most WINDOW_BYTES: a string that short lives in V8's young generation,
 * while a whole block's megabyte string went to the large-object space, which only a full
 * collection frees (a file with a long free-text column piled up 50–70 MB of them), and a slice
 * kept by the check (a new level, an example) holds on to its window, not to the block.
 */
export class BlockText {
  private buf: Uint8Array | null = null;
  private from = 0;
  private to = 0;
  private text = "";
  /** the window the text holds: buf[winFrom, winTo) */
  private winFrom = 0;
  private winTo = 0;
  private ascii: boolean | null = null;
  /** fields asked for in this block so far */
  private asked = 0;

  /** Start a block: its bytes buf[from, to) hold every field. */
  reset(buf: Uint8Array, from: number, to: number): void {
    this.buf = buf;
    this.from = from;
    this.to = to;
    this.text = "";
    this.winFrom = this.winTo = 0;
    this.ascii = null;
    this.asked = 0;
  }

  /** The text of buf[s, e) of the current block. */
  get(s: number, e: number): string {
    const buf = this.buf!;
    // a few fields of a block (a missing-value token here and there) are not worth the block's decoding
    if (this.ascii === null && ++this.asked <= BLOCK_DECODE_AFTER) return fieldText(buf, s, e);
    if (this.ascii === null) {
      let ascii = true;
      for (let i = this.from; i < this.to; i++) {
        if (buf[i]! >= 0x80) {
          ascii = false;
          break;
        }
      }
      this.ascii = ascii;
    }
    if (!this.ascii || e - s > WINDOW_BYTES / 2) return fieldText(buf, s, e);
    if (s < this.winFrom || e > this.winTo) {
      this.winFrom = s;
      this.winTo = Math.min(this.to, s + WINDOW_BYTES);
      this.text = latin1.decode(buf.subarray(this.winFrom, this.winTo));
    }
    return this.text.substring(s - this.winFrom, e - this.winFrom);
  }
}

/** the most bytes BlockText decodes into one string */
const WINDOW_BYTES = 1 << 16;

/** fields of a block decoded one by one before the whole block is decoded at once */
const BLOCK_DECODE_AFTER = 256;
