/**
 * The readiness report: the engine's output for one batch version or for a pool.
 * A documented, versioned JSON format: lib/readiness/REPORT-FORMAT.md.
 * Field names here are relied on by the app, the API and outside scripts: change them
 * only with a new REPORT_FORMAT version.
 */

import type { FindingCode } from "./codes";
import type { FixProposal } from "./fixes/types";

export const REPORT_FORMAT = 1;

export type Severity = "blocker" | "warning" | "note";

export interface Finding {
  /** stable code, e.g. "level.variant": FINDING_CODES in ./codes.ts, specified in lib/readiness/CHECKS.md */
  code: FindingCode;
  severity: Severity;
  columns: string[];
  /** up to `sampleRows` 1-based line numbers as a spreadsheet shows them (header = 1) */
  rows: number[];
  /** how many rows the finding concerns in all (rows[] is a sample) */
  rowCount?: number;
  /** what was found, in plain words */
  message: string;
  /** what to do about it, in plain words */
  fix: string;
  /** machine-readable detail (offending values and counts, proposed merges, figures) */
  detail?: Record<string, unknown>;
}

export interface ColumnReport {
  name: string;
  inferredType: "number" | "integer" | "category" | "date" | "boolean" | "text" | "empty";
  plannedType: string | null;
  role: string | null;
  missing: { count: number; fraction: number };
  levels?: { level: string; count: number }[];
  summary?: { min: number; q1: number; median: number; q3: number; max: number; mean: number; sd: number };
  /** how q1/median/q3 were found: from every value, or from a bounded sample (see REPORT-FORMAT.md) */
  quartiles?: "exact" | "sample";
}

export interface TermReport {
  term: string;
  /** design-matrix column names of the term, e.g. ["soil[clay]", "soil[sand]"] */
  columns: string[];
  df: number;
}

export interface Coefficient {
  term: string;
  estimate: number | null;
  stdError: number | null;
  t: number | null;
  pValue: number | null;
  /** true when the column is aliased (a linear combination of earlier columns) */
  aliased?: boolean;
}

export interface FitReport {
  coefficients: Coefficient[];
  rss: number;
  tss: number;
  rSquared: number;
  adjRSquared: number;
  residualStdError: number;
  F: number | null;
  dfModel: number;
  dfResidual: number;
  pValue: number | null;
  /** smallest R² the overall F test detects at the plan's alpha and power */
  power?: { alpha: number; power: number; detectableR2: number | null };
}

export interface CollinearityReport {
  terms: { term: string; df: number; vif?: number; gvif: number; gvifScaled: number }[];
  /** correlation matrix of the non-intercept design columns */
  correlations: { columns: string[]; matrix: number[][] };
  conditionIndices: number[];
  /** varianceProportions[k][j]: dimension k, design column j (intercept first) */
  varianceProportions: { columns: string[]; matrix: number[][] };
  /** aliased design columns, with the combination of earlier columns they equal */
  aliased: { term: string; combination: string }[];
}

export interface ReadinessReport {
  format: typeof REPORT_FORMAT;
  status: "checked" | "unreadable";
  engineVersion: string;
  /** sha-256 of the canonical plan JSON */
  planHash: string;
  file?: { bytes: number; encoding: string; delimiter: string; decimal: "." | "," };
  rows: { total: number; complete: number };
  model: {
    parameters: number;
    residualDf: number;
    perParameter: number | null;
    terms: TermReport[];
    /** residual df target of the plan (df headroom gauge) */
    dfTarget: number;
  };
  columns: ColumnReport[];
  missingness: {
    patterns: { columns: string[]; count: number }[];
    /**
     * present when the rows held more distinct missingness patterns than `limit` (the engine's
     * bound for this many model columns): patterns is then empty
     */
    patternsOverflow?: { limit: number };
    littleMCAR?: { statistic: number; df: number; pValue: number };
  };
  collinearity: CollinearityReport | null;
  fit: FitReport | null;
  sampleSize?: {
    green?: { overall: number; individual: number };
    riley?: { criteria: { i: number; ii: number; iii: number; iv: number | null }; required: number };
    selection?: { candidates: number; subsets: number };
  };
  findings: Finding[];
  counts: { blocker: number; warning: number; note: number };
  /** mechanical fixes the provider can apply (REPORT-FORMAT.md "proposals"); absent when not computed */
  proposals?: FixProposal[];
  /** serialisable engine state: merges with others into the pool's figures */
  state?: unknown;
  timings?: { ms: number };
}
