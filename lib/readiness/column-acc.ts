/**
 * What a column's scan gathers — missing values, type evidence, offending values, levels,
 * moments, the quartile store, extremes (for sentinel detection) — with memory bounded by the
 * caps of ./column-types.ts, never by the number of rows. Reading fields is ./column-scan.ts.
 */
import { Moments, QuantileStore, RowSample } from "./accumulators";
import type { PlanColumn } from "./plan";
import {
  FieldStatus,
  LEVEL_CAP,
  OFFENDER_CAP,
  OFFENDER_CHARS,
  addExtreme,
  inferValue,
  newInferCounts,
  type Extreme,
  type InferCounts,
  type LevelAcc,
} from "./column-types";
import { LevelIndex, sameBytes } from "./level-index";
import { readNumber } from "./values";

export class ColumnAccumulators {
  readonly missing: RowSample;
  readonly infer: InferCounts = newInferCounts();
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
  lo: Extreme = { v: Infinity, count: 0, rows: [], next: Infinity };
  hi: Extreme = { v: -Infinity, count: 0, rows: [], next: -Infinity };
  date = { a13: 0, b13: 0, ambiguous: null as RowSample | null, pairs: 0 };
  total = 0;
  /** parsed value of the current row (number, boolean 0/1) */
  value = NaN;
  status: FieldStatus = FieldStatus.Missing;
  /** the text of the current field for category/profile columns, and text columns within their level cap ("" otherwise) */
  str = "";
  /** the levels of a category or text column by their UTF-8 bytes (readBytes finds them) */
  protected byBytes: LevelIndex | null = null;
  /** level-table entry of the current field (category columns) */
  lastLevel: LevelAcc | undefined = undefined;
  /** numbers may be read straight from the text (no missing token looks like a number) */
  protected spanNumbers: boolean;
  protected tokens: Set<string>;
  protected maxToken: number;
  /** the missing-value tokens' UTF-8 bytes (readBytes tells a short level from a token by them) */
  protected tokenBytes: Uint8Array[];
  protected sentinelSet: Set<number>;
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
    this.tokenBytes = [...this.tokens].map((x) => new TextEncoder().encode(x));
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
    if (this.kind === "category" || this.kind === "text") this.byBytes = new LevelIndex();
    if (this.kind === "date") this.date.ambiguous = new RowSample(sampleCap);
  }

  protected isMissing(s: string): boolean {
    const n = s.length;
    if (n === 0) return true;
    if (n <= this.maxToken && this.tokens.has(s)) return true;
    if (s.charCodeAt(0) <= 32 || s.charCodeAt(n - 1) <= 32) {
      const t = s.trim();
      return t === "" || this.tokens.has(t);
    }
    return false;
  }

  /** Whether buf[a, b) is one of the missing-value tokens, byte for byte. */
  protected isTokenBytes(buf: Uint8Array, a: number, b: number): boolean {
    for (const t of this.tokenBytes) if (sameBytes(t, buf, a, b)) return true;
    return false;
  }

  protected inferOne(s: string): void {
    inferValue(this.infer, s);
  }

  protected offend(value: string, line: number): void {
    this.mismatch.add(line);
    // a long value is kept by its start and length (the report quotes it)
    const s =
      value.length > OFFENDER_CHARS
        ? `${value.slice(0, 60)}… (${value.length.toLocaleString("en")} characters)`
        : value;
    const c = this.offenders.get(s);
    if (c !== undefined) this.offenders.set(s, c + 1);
    else if (this.offenders.size < OFFENDER_CAP) this.offenders.set(s, 1);
  }

  protected level(s: string, line: number): void {
    const m = this.levels!;
    this.str = s;
    let acc = m.get(s);
    if (acc) {
      acc.count++;
      if (acc.rows.length < this.sampleCap) acc.rows.push(line);
    } else if (m.size < LEVEL_CAP) {
      m.set(s, (acc = { count: 1, complete: 0, rows: [line] }));
      this.byBytes?.add(s, acc);
    } else this.levelOverflow++;
    this.lastLevel = acc;
  }

  /** A parsed number of a number/integer column: sentinels, range, moments. */
  protected valueNumber(v: number, line: number): void {
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

  protected numeric(v: number, line: number): void {
    this.moments.add(v);
    this.quant?.add(v, line);
    addExtreme(this.lo, this.hi, v, line, this.sampleCap);
  }
}
