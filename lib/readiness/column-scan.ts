/**
 * Reading one field of a column, from bytes (the hot path) or from a string, into the
 * column's accumulators (./column-acc.ts).
 */
import { ColumnAccumulators } from "./column-acc";
import {
  FieldStatus,
  INFER,
  INFER_LIMIT,
  LEVEL_CAP,
  inferredTypeOf,
  numberBits,
  tallyInfer,
} from "./column-types";
import type { BlockText } from "./fields";
import { INDEXED_LEVEL_BYTES } from "./level-index";
import { POW10, parseBoolean, parseDate, readDecimalComma, readNumber, validYmd } from "./values";

export {
  FieldStatus,
  INFER_LIMIT,
  LEVEL_CAP,
  OFFENDER_CAP,
  OFFENDER_CHARS,
  type InferCounts,
  type LevelAcc,
} from "./column-types";

export class ColumnScan extends ColumnAccumulators {
  /**
   * Read the field buf[a, b) (UTF-8 bytes): plain decimals of numeric columns, known levels of
   * a category and ISO dates are read from the bytes without making a string; everything else
   * goes through read().
   */
  readBytes(buf: Uint8Array, a: number, b: number, line: number, text: BlockText): void {
    const n = b - a;
    const kind = this.kind;
    if ((kind === "number" || kind === "integer") && n > 0 && n <= 16 && this.spanNumbers) {
      let i = a;
      let neg = false;
      if (buf[i] === 45) {
        neg = true;
        i++;
      }
      let m = 0;
      let digits = 0;
      let frac = -1;
      let comma = false;
      for (; i < b; i++) {
        const c = buf[i]!;
        if (c >= 48 && c <= 57) {
          m = m * 10 + (c - 48);
          digits++;
          if (frac >= 0) frac++;
        } else if ((c === 46 || c === 44) && frac < 0) {
          frac = 0;
          comma = c === 44;
        } else break;
      }
      if (comma) {
        // `12,5`: what read() makes of it (readDecimalComma: the same double), once the column's
        // type evidence and its examples of decimal commas, which need the text, are complete
        if (
          i === b &&
          digits <= 15 &&
          frac > 0 &&
          digits > frac &&
          kind === "number" &&
          this.infer.seen >= INFER_LIMIT &&
          this.commaExamples.length >= 5 &&
          (n > this.maxToken || !this.isTokenBytes(buf, a, b))
        ) {
          const v = m / POW10[frac]!;
          this.total++;
          this.comma.add(line);
          this.valueNumber(neg ? -v : v, line);
          return;
        }
      } else if (i === b && digits > 0 && digits <= 15) {
        let v = frac > 0 ? m / POW10[frac]! : m;
        if (neg) v = -v;
        const isInt = Number.isInteger(v);
        if (kind === "number" || isInt) {
          this.total++;
          if (this.infer.seen < INFER_LIMIT) tallyInfer(this.infer, numberBits(v));
          this.valueNumber(v, line);
          return;
        }
      }
    }
    if (
      this.byBytes !== null &&
      n > 0 &&
      n <= INDEXED_LEVEL_BYTES &&
      buf[a]! > 32 &&
      buf[b - 1]! > 32 &&
      (kind === "category" || kind === "text") &&
      // a level as short as a missing-value token ("A" beside "NA") is read here too, a token is not
      (n > this.maxToken || !this.isTokenBytes(buf, a, b))
    ) {
      // a level already seen, found by its bytes without making a string
      const l = this.byBytes.find(buf, a, b);
      if (l) {
        this.total++;
        if (this.infer.seen < INFER_LIMIT) this.inferOne(l.text);
        const acc = l.value;
        acc.count++;
        if (acc.rows.length < this.sampleCap) acc.rows.push(line);
        this.str = l.text;
        this.lastLevel = acc;
        this.status = FieldStatus.Usable;
        return;
      }
      // a new value of a text column whose level table is full (an identifier, say): counted as
      // read() counts it, without making its string (a repeated key's example is made from the bytes)
      if (kind === "text" && this.levels!.size >= LEVEL_CAP && this.infer.seen >= INFER_LIMIT) {
        this.total++;
        this.levelOverflow++;
        this.str = "";
        this.lastLevel = undefined;
        this.status = FieldStatus.Usable;
        return;
      }
    }
    if (kind === "date" && n === 10 && n > this.maxToken && buf[a + 4] === 45 && buf[a + 7] === 45) {
      const y = byteDigits(buf, a, a + 4);
      const m = byteDigits(buf, a + 5, a + 7);
      const d = byteDigits(buf, a + 8, a + 10);
      if (y >= 0 && m >= 0 && d >= 0 && validYmd(y, m, d)) {
        this.total++;
        if (this.infer.seen < INFER_LIMIT) tallyInfer(this.infer, INFER.date);
        this.status = FieldStatus.Usable;
        return;
      }
    }
    if (kind === "date" && n >= 8 && n <= 10 && n > this.maxToken && this.dayMonthBytes(buf, a, b, line))
      return;
    // an empty field needs no text from the block (which would decode the whole block)
    this.read(n === 0 ? "" : text.get(a, b), line);
  }

  /**
   * `a/b/yyyy` (or with `.` or `-`; one or two digits each side) from the bytes: what read()
   * does for such a date through parseDate, without making a string. False when it is not one.
   */
  private dayMonthBytes(buf: Uint8Array, a: number, b: number, line: number): boolean {
    const s1 = buf[a + 1] === 47 || buf[a + 1] === 46 || buf[a + 1] === 45 ? a + 1 : a + 2;
    const sep = buf[s1];
    if (sep !== 47 && sep !== 46 && sep !== 45) return false;
    const s2 = buf[s1 + 2] === sep ? s1 + 2 : s1 + 3;
    if (buf[s2] !== sep || (b - s2 - 1 !== 4 && b - s2 - 1 !== 2)) return false;
    const x = byteDigits(buf, a, s1);
    const y = byteDigits(buf, s1 + 1, s2);
    if (x < 0 || y < 0 || byteDigits(buf, s2 + 1, b) < 0) return false;
    if (!((x >= 1 && x <= 31 && y >= 1 && y <= 12) || (y >= 1 && y <= 31 && x >= 1 && x <= 12))) return false;
    this.total++;
    if (this.infer.seen < INFER_LIMIT) tallyInfer(this.infer, INFER.date);
    const dt = this.date;
    dt.pairs++;
    if (x > 12) dt.a13++;
    if (y > 12) dt.b13++;
    if (x <= 12 && y <= 12 && x !== y) dt.ambiguous!.add(line);
    this.status = FieldStatus.Usable;
    return true;
  }

  /** Read one field; sets this.status and this.value. */
  read(s: string, line: number): void {
    this.total++;
    if (this.kind === "ignore") {
      this.status = FieldStatus.Missing;
      return;
    }
    if (this.isMissing(s)) {
      this.missing.add(line);
      this.status = FieldStatus.Missing;
      this.str = s;
      return;
    }
    if (this.infer.seen < INFER_LIMIT) this.inferOne(s);
    switch (this.kind) {
      case "number":
      case "integer": {
        let v = readNumber(s);
        if (v !== v) {
          const c = readDecimalComma(s);
          if (c === c) {
            this.comma.add(line);
            if (this.commaExamples.length < 5 && !this.commaExamples.includes(s)) this.commaExamples.push(s);
            v = c;
          } else {
            this.offend(s, line);
            this.status = FieldStatus.Unusable;
            return;
          }
        }
        if (this.kind === "integer" && !Number.isInteger(v)) {
          this.offend(s, line);
          this.status = FieldStatus.Unusable;
          return;
        }
        this.valueNumber(v, line);
        return;
      }
      case "boolean": {
        const b = parseBoolean(s);
        if (b === null) {
          this.offend(s, line);
          this.status = FieldStatus.Unusable;
          return;
        }
        this.numeric(b, line);
        this.value = b;
        this.status = FieldStatus.Usable;
        return;
      }
      case "category":
        this.level(s, line);
        this.status = FieldStatus.Usable;
        return;
      case "date": {
        const d = parseDate(s);
        if (d.kind === "bad") {
          this.offend(s, line);
          this.status = FieldStatus.Unusable;
          return;
        }
        if (d.kind === "pair") {
          this.date.pairs++;
          if (d.a > 12) this.date.a13++;
          if (d.b > 12) this.date.b13++;
          if (d.a <= 12 && d.b <= 12 && d.a !== d.b) this.date.ambiguous!.add(line);
        }
        this.status = FieldStatus.Usable;
        return;
      }
      case "text":
        this.level(s, line);
        this.status = FieldStatus.Usable;
        return;
      default: {
        // unplanned column: profile it (levels, and numbers when they parse)
        this.level(s, line);
        const v = readNumber(s);
        if (v === v) this.numeric(v, line);
        this.status = FieldStatus.Usable;
      }
    }
  }

  /** The type the values look like, from the first INFER_LIMIT non-missing values. */
  inferredType(): ReturnType<typeof inferredTypeOf> {
    return inferredTypeOf(this.infer, this.levels?.size ?? Infinity);
  }
}

function byteDigits(s: Uint8Array, from: number, to: number): number {
  let v = 0;
  for (let i = from; i < to; i++) {
    const c = s[i]! - 48;
    if (c < 0 || c > 9) return -1;
    v = v * 10 + c;
  }
  return v;
}
