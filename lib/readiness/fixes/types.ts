/**
 * Fix proposals: the mechanical corrections the engine offers for a checked batch file, each
 * with what it changes and how many cells. They are not findings (lib/readiness/CHECKS.md,
 * "Fix proposals", lists their codes); a proposal names the findings it resolves.
 */
import type { FindingCode } from "../codes";

/** Every proposal code, with what it changes in one line (the list CHECKS.md holds to). */
export const FIX_CODES = {
  "level.variant": "a spelling variant of a planned level is written as the plan's level",
  "number.decimal-comma":
    "a number written with a decimal comma is written with a point (only where the whole column uses the comma)",
  "number.sentinel": "a declared or confirmed missing-value code (such as -999) becomes an empty cell",
  "missing.token": "the study's missing-value tokens (such as NA) become empty cells",
  "text.trim": "surrounding spaces are trimmed from the cells of a category column",
  "header.rename": "a header one edit away from a planned column is renamed to it",
  "date.iso": "a date is written as YYYY-MM-DD where the column's day/month order is certain",
} as const;

export type FixCode = keyof typeof FIX_CODES;

export const isFixCode = (s: string): s is FixCode => Object.prototype.hasOwnProperty.call(FIX_CODES, s);

/** What a proposal does to a cell. */
export type FixRule =
  | { kind: "map"; values: Record<string, string> }
  | { kind: "empty-tokens"; tokens: string[] }
  | { kind: "empty-numbers"; values: number[] }
  /** `except`: values another proposal of the column (a level merge) already rewrites */
  | { kind: "trim"; except: string[] }
  | { kind: "decimal-comma" }
  | { kind: "date"; order: "dmy" | "mdy" }
  | { kind: "rename"; from: string; to: string };

export interface FixExample {
  /** the line on which the record starts, as the report numbers rows (header = 1) */
  row: number;
  before: string;
  after: string;
}

export interface FixProposal {
  /** unique within a report: `<code>:<column>` */
  id: string;
  code: FixCode;
  /** the plan's column it changes (for header.rename: the planned name) */
  column: string;
  /** findings the proposal resolves when applied (empty: it tidies what no finding flags) */
  resolves: FindingCode[];
  /** what it changes, in plain words */
  message: string;
  /** how many cells it changes when applied alone */
  cells: number;
  /** a few cells, before → after (distinct befores first) */
  examples: FixExample[];
  rule: FixRule;
}

/** One changed cell of a corrected file. */
export interface FixChange {
  /** the line on which the record starts (header = 1), as the report numbers rows */
  row: number;
  column: string;
  before: string;
  after: string;
  /** the proposal that changed it */
  proposal: string;
}
