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
  /**
   * What each counted value looked like (INFER bits), in file order: a later part of the file
   * (another thread's byte range) adds exactly the values one pass would still have counted.
   */
  log: Uint8Array;
}

/** One bit per count an inferred value adds to. */
export const INFER = { number: 1, integer: 2, boolean: 4, date: 8, comma: 16 } as const;

export function newInferCounts(): InferCounts {
  return { seen: 0, integer: 0, number: 0, boolean: 0, date: 0, comma: 0, log: new Uint8Array(INFER_LIMIT) };
}

/** Count one value that looked like `bits` (the caller checks seen < INFER_LIMIT). */
export function tallyInfer(f: InferCounts, bits: number): void {
  f.log[f.seen++] = bits;
  if (bits & INFER.number) f.number++;
  if (bits & INFER.integer) f.integer++;
  if (bits & INFER.boolean) f.boolean++;
  if (bits & INFER.date) f.date++;
  if (bits & INFER.comma) f.comma++;
}

/** A number as type inference counts it. */
export function numberBits(v: number): number {
  return INFER.number | (Number.isInteger(v) ? INFER.integer : 0) | (v === 0 || v === 1 ? INFER.boolean : 0);
}

/** Add the values of a later part that one pass would still have counted (parts in file order). */
export function absorbInfer(f: InferCounts, later: InferCounts): void {
  const take = Math.min(INFER_LIMIT - f.seen, later.seen);
  for (let i = 0; i < take; i++) tallyInfer(f, later.log[i]!);
}

/** What the field just read holds. */
export const FieldStatus = {
  Missing: 0,
  Usable: 1,
  /** present but not a value of the column's type */
  Unusable: 2,
} as const;
export type FieldStatus = (typeof FieldStatus)[keyof typeof FieldStatus];

/** an extreme value of a column: its count, first rows, and the next distinct value */
export interface Extreme {
  v: number;
  count: number;
  rows: number[];
  next: number;
}

/** Count what one non-missing value looks like (type inference). */
export function inferValue(f: InferCounts, s: string): void {
  const v = readNumber(s);
  if (v === v) return tallyInfer(f, numberBits(v));
  if (readDecimalComma(s) === readDecimalComma(s)) return tallyInfer(f, INFER.comma);
  if (parseBoolean(s) !== null) return tallyInfer(f, INFER.boolean);
  tallyInfer(f, parseDate(s).kind !== "bad" ? INFER.date : 0);
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
