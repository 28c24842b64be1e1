/**
 * The pool's own questions (poolability, batch influence, the overall F test, a selection
 * preview): the public, JSON-serialisable result types. Every figure is computed from the
 * stored engine states (their triangular least-squares factors); no file is read again.
 * The formulas and their sources: lib/readiness/pooling/README.md.
 */
import type { Finding } from "../report";
import type { EngineState } from "../state";

export const POOL_QUESTIONS_FORMAT = "tributary-pool-questions/1";

/** One batch version of the pool (or the version under review). */
export interface PoolMember {
  /** stable id, e.g. the batch version's id */
  id: string;
  /** what a person reads, e.g. "North field, v2" */
  label: string;
  /** the provider organisation's id: batches of one group are tested together too */
  group: string;
  groupLabel: string;
  state: EngineState;
}

export interface PoolQuestionsOptions {
  /** the version under review: tested "if accepted" against the pool of `members` */
  candidate?: PoolMember;
  /** false: leave the selection preview out (null), e.g. for a quick "if accepted" figure; default true */
  selection?: boolean;
}

/** The overall F test of the pool's model: do the predictors together explain anything? */
export interface OverallTest {
  F: number;
  df1: number;
  df2: number;
  p: number;
  r2: number;
  adjR2: number;
  /** smallest R² the test detects with the plan's power (default 0.8) at its alpha; null without residual df */
  detectableR2: number | null;
  alpha: number;
  power: number;
  /** "together the predictors explain more than chance would …" or "nothing detectable at this n …" */
  words: string;
}

/** The largest standardised coefficient shift |Δβ_j| / SE_j and its design column. */
export interface LargestShift {
  /** design column, e.g. "nitrogen" or "soil[clay]" */
  column: string;
  /** the term the column belongs to ("intercept" for the intercept) */
  term: string;
  shift: number;
}

/**
 * A Chow test of one batch (or provider, or the candidate) against the rest of the pool.
 * `kind` is "predictive" when the batch has no more complete rows than the model has
 * coefficients (n_b ≤ k) and cannot be fitted alone: Chow's second test.
 */
export interface ChowRow {
  id: string;
  label: string;
  /** complete rows of the batch (or group) */
  n: number;
  kind: "chow" | "predictive";
  /** null when the test has no degrees of freedom (said in `words`) */
  F: number | null;
  df1: number;
  df2: number;
  p: number | null;
  /** practical size: the largest shift of the pool's coefficients when this batch is left out */
  largest: LargestShift | null;
  /** the rank of the batch's own design when it is below k (a level missing, a constant column) */
  rankBatch: number;
  rankRest: number;
  words: string;
}

/** The test that all g batches share one set of coefficients (Chow generalised to g groups). */
export interface ChowResult {
  /** batches in the test */
  groups: number;
  /** batches too small to be fitted alone (n_b ≤ k): they enter as Chow's predictive test does */
  small: number;
  F: number | null;
  df1: number;
  df2: number;
  p: number | null;
  words: string;
}

/** The pool's fit with and without one batch. */
export interface FitSummary {
  n: number;
  /** coefficients of the treatment-coded design, by column (null for an aliased column) */
  coefficients: { column: string; estimate: number | null; stdError: number | null }[];
  r2: number | null;
  residualDf: number;
  /** residual df − the plan's df target */
  headroom: number;
}

export interface InfluenceRow {
  id: string;
  label: string;
  n: number;
  with: FitSummary;
  without: FitSummary;
  /** |Δβ_j| / SE_j per column (SE of the pool with the batch); null where a side is aliased */
  shifts: { column: string; term: string; shift: number | null }[];
  largest: LargestShift | null;
  influential: boolean;
}

/** One candidate model's criteria (AIC, BIC as R's extractAIC for lm: n·log(RSS/n) + k·edf). */
export interface ModelCriteria {
  /** candidate terms in the model (the required terms are always in and not listed) */
  terms: string[];
  /** coefficients in the model, intercept and required terms included (edf) */
  parameters: number;
  rss: number;
  r2: number;
  adjR2: number;
  /** Mallows' Cp with σ² from the model of all candidates */
  cp: number;
  aic: number;
  bic: number;
}

export interface PathStep extends ModelCriteria {
  /** the term added (forward) or removed (backward); null for the starting model */
  change: string | null;
}

/** A greedy path: every step to the end, and where R's step() with this penalty stops. */
export interface SelectionPath {
  criterion: "aic" | "bic";
  steps: PathStep[];
  /** index into steps of the model the criterion stops at */
  stop: number;
}

export interface SelectionPreview {
  candidates: string[];
  required: string[];
  /** candidate terms the pool cannot estimate (e.g. a level without complete rows); left out */
  unestimable?: string[];
  n: number;
  /** σ² of the model of all candidates (for Cp) */
  sigma2: number | null;
  /** best subset of each size 0…m (by RSS); with exhaustive = false, the forward path's models */
  bySize: (ModelCriteria & { size: number })[];
  exhaustive: boolean;
  /** why the search is not exhaustive (above 25 candidate terms: 2^m subsets), else null */
  why: string | null;
  forward: { aic: SelectionPath; bic: SelectionPath };
  backward: { aic: SelectionPath; bic: SelectionPath };
  /** size and terms each criterion picks among bySize (the largest adjusted R², the smallest of the others) */
  picks: { criterion: "adjR2" | "cp" | "aic" | "bic" | "lobo"; size: number; terms: string[] }[];
  /**
   * Leave-one-batch-out cross-validation: each accepted batch predicted by the best model of
   * each size chosen and fitted on the other batches. null with fewer than 3 batches.
   */
  lobo: { folds: number; mspe: (number | null)[]; size: number | null } | null;
  /** share of leave-one-batch-out fits whose BIC-chosen model contains each candidate */
  stability: { criterion: "bic"; folds: number; shares: { term: string; share: number }[] } | null;
}

export interface PoolQuestions {
  format: typeof POOL_QUESTIONS_FORMAT;
  /** complete rows of the accepted pool */
  n: number;
  /** coefficients of the treatment-coded design (k = p + 1 with an intercept) */
  parameters: number;
  /** design columns of the treatment-coded fit */
  columns: string[];
  terms: string[];
  overall: OverallTest | null;
  poolability: {
    whole: ChowResult | null;
    batches: ChowRow[];
    providers: ChowRow[];
    candidate: ChowRow | null;
  };
  /** threshold 1 standard error [common practice] */
  influence: { threshold: number; batches: InfluenceRow[]; candidate: InfluenceRow | null };
  /** null when the plan names no candidate terms (or only a count) */
  selection: SelectionPreview | null;
  /** pool.not-poolable, pool.influential-batch (warnings), selection.unstable (note) */
  findings: Finding[];
  /** selection on the same data overstates the fit; the preview plans the analysis, it does not replace it */
  caution: string;
}

export type { EngineState };
