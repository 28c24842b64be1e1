/**
 * Per-column accumulators of the single pass: missing values, type evidence, offending
 * values, levels, moments, quartile store and extremes (for sentinel detection).
 * Memory per column is bounded by the caps below, never by the number of rows.
 */
import { Moments, QuantileStore, RowSample } from "./accumulators";
import type { PlanColumn } from "./plan";
import { fieldText } from "./tokenizer";
import { POW10, parseBoolean, parseDate, readDecimalComma, readNumber, validYmd } from "./values";

/** distinct values kept per column for level tables */
export const LEVEL_CAP = 5000;
/** distinct offending values kept per column */
export const OFFENDER_CAP = 50;
/** offending values longer than this are kept by their first characters and their length */
export const OFFENDER_CHARS = 200;
/** non-missing values per column used for type inference */
export const INFER_LIMIT = 20_000;

export interface LevelAcc {
  count: number;
  complete: number;
  rows: number[];
  /** the level's position among its predictor's design levels, once looked up (−1: not a usable level) */
  design?: number;
}

export interface InferCounts {
  seen: number;
  integer: number;
  number: number;
  boolean: number;
  date: number;
  comma: number;
}

/** What the field just read holds. */
export const FieldStatus = {
  Missing: 0,
  Usable: 1,
  /** present but not a value of the column's type */
  Unusable: 2,
} as const;
export type FieldStatus = (typeof FieldStatus)[keyof typeof FieldStatus];

/** levels of a category matched by their bytes (beyond it, the level table is looked up by string) */
const KNOWN_BYTES_CAP = 16;
const encoder = new TextEncoder();

export class ColumnScan {
  readonly missing: RowSample;
  readonly infer: InferCounts = { seen: 0, integer: 0, number: 0, boolean: 0, date: 0, comma: 0 };
  levels: Map<string, LevelAcc> | null = null;
  levelOverflow = 0;
  moments = new Moments();
  quant: QuantileStore | null;
  readonly mismatch: RowSample;
  offenders = new Map<string, number>();
  readonly comma: RowSample;
  commaExamples: string[] = [];
  readonly range: RowSample;
  rangeExamples: number[] = [];
  sentinels = new Map<number, RowSample>();
  /** extremes: smallest and largest value, their counts and rows, and the next distinct ones */
  lo = { v: Infinity, count: 0, rows: [] as number[], next: Infinity };
  hi = { v: -Infinity, count: 0, rows: [] as number[], next: -Infinity };
  date = { a13: 0, b13: 0, ambiguous: null as RowSample | null, pairs: 0 };
  total = 0;
  /** parsed value of the current row (number, boolean 0/1) */
  value = NaN;
  status: FieldStatus = FieldStatus.Missing;
  /** the text of the current field for category/text/profile columns ("" otherwise) */
  str = "";
  /** the first levels of a category column with their UTF-8 bytes (readBytes matches them) */
  private levelBytes: { bytes: Uint8Array; text: string; acc: LevelAcc }[] = [];
  /** level-table entry of the current field (category columns) */
  lastLevel: LevelAcc | undefined = undefined;
  /** numbers may be read straight from the text (no missing token looks like a number) */
  private spanNumbers: boolean;
  private tokens: Set<string>;
  private maxToken: number;
  private sentinelSet: Set<number>;
  readonly kind: "number" | "integer" | "boolean" | "category" | "date" | "text" | "profile" | "ignore";

  constructor(
    readonly name: string,
    readonly plan: PlanColumn | null,
    fileTokens: string[],
    readonly sampleCap: number,
    quantCap: number,
  ) {
    this.tokens = new Set([...fileTokens, ...(plan?.missingTokens ?? [])]);
    this.maxToken = Math.max(0, ...[...this.tokens].map((x) => x.length));
    this.spanNumbers = [...this.tokens].every((x) => readNumber(x) !== readNumber(x));
    this.sentinelSet = new Set(plan?.sentinels ?? []);
    this.missing = new RowSample(sampleCap);
    this.mismatch = new RowSample(sampleCap);
    this.comma = new RowSample(sampleCap);
    this.range = new RowSample(sampleCap);
    this.kind = !plan ? "profile" : plan.role === "ignore" ? "ignore" : plan.type;
    const numeric = this.kind === "number" || this.kind === "integer" || this.kind === "profile";
    this.quant = numeric ? new QuantileStore(quantCap) : null;
    if (this.kind === "category" || this.kind === "profile" || this.kind === "text") this.levels = new Map();
    if (this.kind === "date") this.date.ambiguous = new RowSample(sampleCap);
  }

  private isMissing(s: string): boolean {
    const n = s.length;
    if (n === 0) return true;
    if (n <= this.maxToken && this.tokens.has(s)) return true;
    if (s.charCodeAt(0) <= 32 || s.charCodeAt(n - 1) <= 32) {
      const t = s.trim();
      return t === "" || this.tokens.has(t);
    }
    return false;
  }

  private inferOne(s: string): void {
    const f = this.infer;
    f.seen++;
    const v = readNumber(s);
    if (v === v) {
      f.number++;
      if (Number.isInteger(v)) f.integer++;
      if (v === 0 || v === 1) f.boolean++;
      return;
    }
    if (readDecimalComma(s) === readDecimalComma(s)) {
      f.comma++;
      return;
    }
    if (parseBoolean(s) !== null) f.boolean++;
    else if (parseDate(s).kind !== "bad") f.date++;
  }

  private offend(value: string, line: number): void {
    this.mismatch.add(line);
    // a long value is kept by its start and length (the report quotes it)
    const s = value.length > OFFENDER_CHARS ? `${value.slice(0, 60)}… (${value.length.toLocaleString("en")} characters)` : value;
    const c = this.offenders.get(s);
    if (c !== undefined) this.offenders.set(s, c + 1);
    else if (this.offenders.size < OFFENDER_CAP) this.offenders.set(s, 1);
  }

  private level(s: string, line: number): void {
    const m = this.levels!;
    this.str = s;
    let acc = m.get(s);
    if (acc) {
      acc.count++;
      if (acc.rows.length < this.sampleCap) acc.rows.push(line);
    } else if (m.size < LEVEL_CAP) {
      m.set(s, (acc = { count: 1, complete: 0, rows: [line] }));
      if (this.kind === "category") {
        if (m.size <= KNOWN_BYTES_CAP) this.levelBytes.push({ bytes: encoder.encode(s), text: s, acc });
        else this.levelBytes = [];
      }
    }
    else this.levelOverflow++;
    this.lastLevel = acc;
  }

  /**
   * Read the field buf[a, b) (UTF-8 bytes): plain decimals of numeric columns, known levels of
   * a category and ISO dates are read from the bytes without making a string; everything else
   * goes through read().
   */
  readBytes(buf: Uint8Array, a: number, b: number, line: number): void {
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
      for (; i < b; i++) {
        const c = buf[i]!;
        if (c >= 48 && c <= 57) {
          m = m * 10 + (c - 48);
          digits++;
          if (frac >= 0) frac++;
        } else if (c === 46 && frac < 0) frac = 0;
        else break;
      }
      if (i === b && digits > 0 && digits <= 15) {
        let v = frac > 0 ? m / POW10[frac]! : m;
        if (neg) v = -v;
        const isInt = Number.isInteger(v);
        if (kind === "number" || isInt) {
          this.total++;
          if (this.infer.seen < INFER_LIMIT) {
            const f = this.infer;
            f.seen++;
            f.number++;
            if (isInt) f.integer++;
            if (v === 0 || v === 1) f.boolean++;
          }
          this.valueNumber(v, line);
          return;
        }
      }
    }
    if (kind === "category" && n > this.maxToken && this.levelBytes.length > 0 && buf[a]! > 32 && buf[b - 1]! > 32) {
      // a few levels: find the bytes among the known levels' bytes without making a string
      const known = this.levelBytes;
      for (let k = 0; k < known.length; k++) {
        const l = known[k]!;
        if (l.bytes.length !== n) continue;
        let i = 0;
        while (i < n && l.bytes[i] === buf[a + i]) i++;
        if (i < n) continue;
        this.total++;
        if (this.infer.seen < INFER_LIMIT) this.inferOne(l.text);
        const acc = l.acc;
        acc.count++;
        if (acc.rows.length < this.sampleCap) acc.rows.push(line);
        this.str = l.text;
        this.lastLevel = acc;
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
        if (this.infer.seen < INFER_LIMIT) {
          this.infer.seen++;
          this.infer.date++;
        }
        this.status = FieldStatus.Usable;
        return;
      }
    }
    this.read(fieldText(buf, a, b), line);
  }

  /** A parsed number of a number/integer column: sentinels, range, moments. */
  private valueNumber(v: number, line: number): void {
    if (this.sentinelSet.size && this.sentinelSet.has(v)) {
      let r = this.sentinels.get(v);
      if (!r) this.sentinels.set(v, (r = new RowSample(this.sampleCap)));
      r.add(line);
      this.missing.add(line);
      this.status = FieldStatus.Missing;
      return;
    }
    const p = this.plan!;
    if ((p.min !== undefined && v < p.min) || (p.max !== undefined && v > p.max)) {
      this.range.add(line);
      if (this.rangeExamples.length < 5 && !this.rangeExamples.includes(v)) this.rangeExamples.push(v);
    }
    this.numeric(v, line);
    this.value = v;
    this.status = FieldStatus.Usable;
  }

  private extremes(v: number, line: number): void {
    const lo = this.lo;
    if (v < lo.v) {
      if (lo.v !== Infinity) lo.next = lo.v;
      lo.v = v;
      lo.count = 1;
      lo.rows = [line];
    } else if (v === lo.v) {
      lo.count++;
      if (lo.rows.length < this.sampleCap) lo.rows.push(line);
    } else if (v < lo.next) lo.next = v;
    const hi = this.hi;
    if (v > hi.v) {
      if (hi.v !== -Infinity) hi.next = hi.v;
      hi.v = v;
      hi.count = 1;
      hi.rows = [line];
    } else if (v === hi.v) {
      hi.count++;
      if (hi.rows.length < this.sampleCap) hi.rows.push(line);
    } else if (v > hi.next) hi.next = v;
  }

  private numeric(v: number, line: number): void {
    this.moments.add(v);
    this.quant?.add(v);
    this.extremes(v, line);
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
  inferredType(): "number" | "integer" | "category" | "date" | "boolean" | "text" | "empty" {
    const f = this.infer;
    if (f.seen === 0) return "empty";
    const most = (k: number) => k >= f.seen * 0.95;
    if (f.number === f.seen) return f.integer === f.seen ? "integer" : "number";
    if (f.boolean === f.seen) return "boolean";
    if (most(f.number + f.comma)) return f.integer === f.number && f.comma === 0 ? "integer" : "number";
    if (most(f.date)) return "date";
    const distinct = this.levels?.size ?? Infinity;
    if (distinct <= 50 || distinct <= f.seen * 0.2) return "category";
    return "text";
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
