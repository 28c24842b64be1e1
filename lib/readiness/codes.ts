/**
 * Every finding code the readiness engine (or the pool questions built on it) can report, with
 * the severities it may carry and its meaning in one line. The specification of each check —
 * rule, default threshold, formula, source — is lib/readiness/CHECKS.md, whose catalogue a unit
 * test holds to exactly these codes (tests/unit/finding-codes.test.ts).
 * Codes are stable: a report stored today must still read tomorrow; retire a code, never reuse it.
 */
import type { Severity } from "./report";

/** The section of lib/readiness/CHECKS.md's catalogue a code belongs to. */
export type FindingGroup =
  | "structure"
  | "types and values"
  | "categories"
  | "missingness"
  | "collinearity"
  | "sample size"
  | "pool and drift"
  | "pool questions";

export interface FindingCodeInfo {
  group: FindingGroup;
  /** the severities the code can carry (most codes have one) */
  severities: readonly Severity[];
  meaning: string;
}

export const FINDING_CODES = {
  // structure
  "file.unreadable": {
    group: "structure",
    severities: ["blocker"],
    meaning: "the file cannot be read as UTF-8 CSV (a workbook, UTF-16, binary, a broken byte)",
  },
  "file.header-only": { group: "structure", severities: ["note"], meaning: "a header row but no data rows" },
  "header.duplicate": { group: "structure", severities: ["blocker"], meaning: "a column name used twice" },
  "header.blank": { group: "structure", severities: ["blocker"], meaning: "a column without a name" },
  "plan.column-missing": {
    group: "structure",
    severities: ["blocker"],
    meaning: "a planned response, predictor or key column is not in the file",
  },
  "plan.column-unexpected": {
    group: "structure",
    severities: ["note"],
    meaning: "columns the plan does not know",
  },
  "row.ragged": {
    group: "structure",
    severities: ["blocker"],
    meaning: "rows with more or fewer fields than the header",
  },
  "row.duplicate": {
    group: "structure",
    severities: ["warning"],
    meaning: "rows that repeat an earlier row exactly",
  },
  "key.duplicate": {
    group: "structure",
    severities: ["blocker"],
    meaning: "a value of a key column used twice",
  },
  // types and values
  "type.mismatch": {
    group: "types and values",
    severities: ["blocker", "warning"],
    meaning: "values that do not read as the planned type",
  },
  "number.decimal-comma": {
    group: "types and values",
    severities: ["blocker"],
    meaning: "numbers written with a decimal comma",
  },
  "number.sentinel": {
    group: "types and values",
    severities: ["warning"],
    meaning: "a declared or suspected missing-value code such as -999",
  },
  "value.out-of-range": {
    group: "types and values",
    severities: ["blocker"],
    meaning: "numbers outside the plan's min/max",
  },
  "date.ambiguous": {
    group: "types and values",
    severities: ["warning"],
    meaning: "dates whose day/month order nothing settles",
  },
  // categories
  "level.unknown": {
    group: "categories",
    severities: ["blocker"],
    meaning: "levels outside a closed level list",
  },
  "level.variant": {
    group: "categories",
    severities: ["warning"],
    meaning: "spellings of one level (case, spaces, accents, one edit), with the merge to make",
  },
  "level.sparse": {
    group: "categories",
    severities: ["warning"],
    meaning: "a level of a predictor with too few complete rows",
  },
  "level.single": {
    group: "categories",
    severities: ["blocker"],
    meaning: "a categorical predictor with one level on the complete rows",
  },
  "level.too-many": {
    group: "categories",
    severities: ["warning"],
    meaning: "so many levels that the column looks like an identifier",
  },
  "level.baseline-absent": {
    group: "categories",
    severities: ["warning"],
    meaning: "the baseline level has no complete rows",
  },
  // missingness
  "missing.column": {
    group: "missingness",
    severities: ["note", "warning", "blocker"],
    meaning: "the share of a column's cells that are missing",
  },
  "missing.response": { group: "missingness", severities: ["warning"], meaning: "rows without the response" },
  "missing.complete-cases": {
    group: "missingness",
    severities: ["note"],
    meaning: "how many rows are complete for the model, and which column costs most",
  },
  "missing.pattern": {
    group: "missingness",
    severities: ["note"],
    meaning: "the most frequent combinations of missing model columns",
  },
  "missing.not-at-random-hint": {
    group: "missingness",
    severities: ["note"],
    meaning: "Little's test rejects missing completely at random",
  },
  // collinearity
  "collinear.exact": {
    group: "collinearity",
    severities: ["blocker"],
    meaning: "a design column is an exact combination of others (rank deficiency)",
  },
  "collinear.pair": {
    group: "collinearity",
    severities: ["warning"],
    meaning: "two numeric predictors almost perfectly correlated",
  },
  "collinear.vif": {
    group: "collinearity",
    severities: ["warning"],
    meaning: "a one-column term with a high variance inflation factor",
  },
  "collinear.gvif": {
    group: "collinearity",
    severities: ["warning"],
    meaning: "a multi-column term with a high generalized VIF",
  },
  "collinear.condition": {
    group: "collinearity",
    severities: ["warning"],
    meaning: "a high condition index shared by two or more columns",
  },
  // sample size and degrees of freedom
  "df.none": { group: "sample size", severities: ["blocker"], meaning: "no residual degrees of freedom" },
  "df.low": { group: "sample size", severities: ["blocker"], meaning: "residual df below the plan's floor" },
  "df.per-parameter": {
    group: "sample size",
    severities: ["warning"],
    meaning: "fewer complete rows per parameter than the plan's target",
  },
  "df.green": { group: "sample size", severities: ["note"], meaning: "below Green's (1991) rules of thumb" },
  "df.riley": {
    group: "sample size",
    severities: ["warning"],
    meaning: "below the sample size of Riley et al. (2019)",
  },
  "df.selection-budget": {
    group: "sample size",
    severities: ["warning"],
    meaning: "too few rows (or too many candidates) for the planned variable selection",
  },
  "df.power": {
    group: "sample size",
    severities: ["note"],
    meaning: "the smallest R² the overall F test detects at this n",
  },
  // pool and drift
  "pool.empty": {
    group: "pool and drift",
    severities: ["note"],
    meaning: "the pool has no accepted batch yet",
  },
  "drift.new-level": {
    group: "pool and drift",
    severities: ["warning", "note"],
    meaning: "levels of the batch the pool has never seen",
  },
  "drift.smd": {
    group: "pool and drift",
    severities: ["warning"],
    meaning: "a column's mean far from the pool's (standardized mean difference)",
  },
  "drift.missing": {
    group: "pool and drift",
    severities: ["warning"],
    meaning: "a column's share missing moved against the pool",
  },
  // pool questions
  "pool.not-poolable": {
    group: "pool questions",
    severities: ["warning"],
    meaning: "Chow test: a batch's (or provider's) coefficients differ from the rest of the pool",
  },
  "pool.influential-batch": {
    group: "pool questions",
    severities: ["warning"],
    meaning: "leaving one batch out shifts a pooled coefficient by one standard error or more",
  },
  "selection.unstable": {
    group: "pool questions",
    severities: ["note"],
    meaning: "a candidate term chosen in between 20 % and 80 % of leave-one-batch-out selections",
  },
} as const satisfies Record<string, FindingCodeInfo>;

export type FindingCode = keyof typeof FINDING_CODES;

export function isFindingCode(code: string): code is FindingCode {
  return Object.hasOwn(FINDING_CODES, code);
}
