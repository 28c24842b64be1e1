/**
 * Per-column accumulators of the single pass: missing values, type evidence, offending
 * values, levels, moments, quartile store and extremes (for sentinel detection).
 * Memory per column is bounded by the caps below, never by the number of rows.
 */
import { Moments, QuantileStore, RowSample } from "./accumulators";
import type { PlanColumn } from "./plan";
import { POW10, parseBoolean, parseDate, readDecimalComma, readNumber, validYmd } from "./values";

/** distinct values kept per column for level tables */
export const LEVEL_CAP = 5000;
/** distinct offending values kept per column */
export const OFFENDER_CAP = 50;
/** non-missing values per column used for type inference */
export const INFER_LIMIT = 20_000;

export interface LevelAcc {
  count: number;
  complete: number;
  rows: number[];
}

export interface InferCounts {
  seen: number;
  integer: number;
  number: number;
  boolean: number;
  date: number;
  comma: number;
}

/** status of the field just read: 0 missing, 1 usable, 2 present but unusable */
export type FieldStatus = 0 | 1 | 2;

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
  status: FieldStatus = 0;
  /** the text of the current field for category/text/profile columns ("" otherwise) */
  str = "";
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

  private offend(s: string, line: number): void {
    this.mismatch.add(line);
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
    } else if (m.size < LEVEL_CAP) m.set(s, (acc = { count: 1, complete: 0, rows: [line] }));
    else this.levelOverflow++;
    this.lastLevel = acc;
  }

  /**
   * Read the field text[a, b) — the quote-free fast path: plain decimals in numeric columns
   * are read from the characters without making a string; everything else goes through read().
   */
  readSpan(text: string, a: number, b: number, line: number): void {
    const n = b - a;
    if ((this.kind === "number" || this.kind === "integer") && n > 0 && n <= 16 && this.spanNumbers) {
      let i = a;
      let neg = false;
      if (text.charCodeAt(i) === 45) {
        neg = true;
        i++;
      }
      let m = 0;
      let digits = 0;
      let frac = -1;
      for (; i < b; i++) {
        const c = text.charCodeAt(i);
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
        if (this.kind === "number" || isInt) {
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
    if (this.kind === "category" && n > this.maxToken && this.levels!.size <= 16) {
      // a few levels: find the span among the known level strings without making a new string
      for (const [l, acc] of this.levels!) {
        if (l.length !== n) continue;
        let i = 0;
        while (i < n && l.charCodeAt(i) === text.charCodeAt(a + i)) i++;
        if (i < n) continue;
        if (text.charCodeAt(a) <= 32 || text.charCodeAt(b - 1) <= 32) break; // spaces: let read() decide
        this.total++;
        if (this.infer.seen < INFER_LIMIT) this.inferOne(l);
        acc.count++;
        if (acc.rows.length < this.sampleCap) acc.rows.push(line);
        this.str = l;
        this.lastLevel = acc;
        this.status = 1;
        return;
      }
    }
    if (this.kind === "date" && n === 10 && n > this.maxToken && text.charCodeAt(a + 4) === 45 && text.charCodeAt(a + 7) === 45) {
      const y = spanDigits(text, a, a + 4);
      const m = spanDigits(text, a + 5, a + 7);
      const d = spanDigits(text, a + 8, a + 10);
      if (y >= 0 && m >= 0 && d >= 0 && validYmd(y, m, d)) {
        this.total++;
        if (this.infer.seen < INFER_LIMIT) {
          this.infer.seen++;
          this.infer.date++;
        }
        this.status = 1;
        return;
      }
    }
    this.read(text.substring(a, b), line);
  }

  /** A parsed number of a number/integer column: sentinels, range, moments. */
  private valueNumber(v: number, line: number): void {
    if (this.sentinelSet.size && this.sentinelSet.has(v)) {
      let r = this.sentinels.get(v);
      if (!r) this.sentinels.set(v, (r = new RowSample(this.sampleCap)));
      r.add(line);
      this.missing.add(line);
      this.status = 0;
      return;
    }
    const p = this.plan!;
    if ((p.min !== undefined && v < p.min) || (p.max !== undefined && v > p.max)) {
      this.range.add(line);
      if (this.rangeExamples.length < 5 && !this.rangeExamples.includes(v)) this.rangeExamples.push(v);
    }
    this.numeric(v, line);
    this.value = v;
    this.status = 1;
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
      this.status = 0;
      return;
    }
    if (this.isMissing(s)) {
      this.missing.add(line);
      this.status = 0;
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
            this.status = 2;
            return;
          }
        }
        if (this.kind === "integer" && !Number.isInteger(v)) {
          this.offend(s, line);
          this.status = 2;
          return;
        }
        this.valueNumber(v, line);
        return;
      }
      case "boolean": {
        const b = parseBoolean(s);
        if (b === null) {
          this.offend(s, line);
          this.status = 2;
          return;
        }
        this.numeric(b, line);
        this.value = b;
        this.status = 1;
        return;
      }
      case "category":
        this.level(s, line);
        this.status = 1;
        return;
      case "date": {
        const d = parseDate(s);
        if (d.kind === "bad") {
          this.offend(s, line);
          this.status = 2;
          return;
        }
        if (d.kind === "pair") {
          this.date.pairs++;
          if (d.a > 12) this.date.a13++;
          if (d.b > 12) this.date.b13++;
          if (d.a <= 12 && d.b <= 12 && d.a !== d.b) this.date.ambiguous!.add(line);
        }
        this.status = 1;
        return;
      }
      case "text":
        this.level(s, line);
        this.status = 1;
        return;
      default: {
        // unplanned column: profile it (levels, and numbers when they parse)
        this.level(s, line);
        const v = readNumber(s);
        if (v === v) this.numeric(v, line);
        this.status = 1;
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

function spanDigits(s: string, from: number, to: number): number {
  let v = 0;
  for (let i = from; i < to; i++) {
    const c = s.charCodeAt(i) - 48;
    if (c < 0 || c > 9) return -1;
    v = v * 10 + c;
  }
  return v;
}
