/** The column scan's types, caps and small helpers (./column-scan.ts). */
import { parseBoolean, parseDate, readDecimalComma, readNumber } from "./values";

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
export const KNOWN_BYTES_CAP = 16;

/** an extreme value of a column: its count, first rows, and the next distinct value */
export interface Extreme {
  v: number;
  count: number;
  rows: number[];
  next: number;
}

/** Count what one non-missing value looks like (type inference). */
export function inferValue(f: InferCounts, s: string): void {
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

/** The type the values look like, from the first INFER_LIMIT non-missing values and the number of distinct ones. */
export function inferredTypeOf(
  f: InferCounts,
  distinct: number,
): "number" | "integer" | "category" | "date" | "boolean" | "text" | "empty" {
  if (f.seen === 0) return "empty";
  const most = (k: number) => k >= f.seen * 0.95;
  if (f.number === f.seen) return f.integer === f.seen ? "integer" : "number";
  if (f.boolean === f.seen) return "boolean";
  if (most(f.number + f.comma)) return f.integer === f.number && f.comma === 0 ? "integer" : "number";
  if (most(f.date)) return "date";
  if (distinct <= 50 || distinct <= f.seen * 0.2) return "category";
  return "text";
}

/** Keep the smallest and largest value, their counts and first rows, and the next distinct ones. */
export function addExtreme(lo: Extreme, hi: Extreme, v: number, line: number, cap: number): void {
  if (v < lo.v) {
    if (lo.v !== Infinity) lo.next = lo.v;
    lo.v = v;
    lo.count = 1;
    lo.rows = [line];
  } else if (v === lo.v) {
    lo.count++;
    if (lo.rows.length < cap) lo.rows.push(line);
  } else if (v < lo.next) lo.next = v;
  if (v > hi.v) {
    if (hi.v !== -Infinity) hi.next = hi.v;
    hi.v = v;
    hi.count = 1;
    hi.rows = [line];
  } else if (v === hi.v) {
    hi.count++;
    if (hi.rows.length < cap) hi.rows.push(line);
  } else if (v > hi.next) hi.next = v;
}
