/**
 * A selection problem on one factor: the forced columns first, then the candidate terms, each
 * a block of columns (a category's indicators enter and leave together), and the criteria of
 * a subset. AIC and BIC as R's extractAIC for lm: n·log(RSS/n) + k·edf with edf the number of
 * coefficients (Venables & Ripley 2002, Modern Applied Statistics with S, §6.8); Mallows' Cp
 * = RSS/σ² − n + 2·edf with σ² from the model of all candidates (Mallows 1973, Technometrics
 * 15, 661–675); adjusted R² = 1 − (RSS/(n − edf)) / (TSS/(n − 1)).
 */
import { selectColumns, solveFactor, type Factor } from "./factor";
import { tssOf } from "./context";
import type { ModelCriteria } from "./types";

export interface Problem {
  /** factor with columns [forced…][term 0…][term 1…]…, all of full rank */
  f: Factor;
  forced: number;
  terms: { name: string; width: number; offset: number }[];
  n: number;
  tss: number;
  intercept: boolean;
  /** σ² of the model of all candidates (null without residual df) */
  sigma2: number | null;
  /** candidate terms without an estimable column here (a level absent from these rows) */
  unestimable: string[];
}

/**
 * Build the problem from a factor: forced columns and candidate terms by column name, in the
 * given term order; aliased columns are left out (a term without columns left is unestimable).
 */
export function problemOf(
  f: Factor,
  forcedColumns: string[],
  candidates: { term: string; columns: string[] }[],
  intercept: boolean,
): Problem {
  const index = new Map(f.columns.map((c, i) => [c, i]));
  const want = [...forcedColumns, ...candidates.flatMap((c) => c.columns)].filter((c) => index.has(c));
  const r = selectColumns(
    f,
    want.map((c) => index.get(c)!),
    "rank",
  );
  const kept = new Set(r.columns);
  const forced = forcedColumns.filter((c) => kept.has(c)).length;
  const terms: Problem["terms"] = [];
  const unestimable: string[] = [];
  let offset = forced;
  for (const c of candidates) {
    const width = c.columns.filter((x) => kept.has(x)).length;
    if (width === 0) unestimable.push(c.term);
    else {
      terms.push({ name: c.term, width, offset });
      offset += width;
    }
  }
  const n = f.n;
  const q = r.columns.length;
  const K = q + 1;
  const rssFull = r.a[K * K - 1]! ** 2;
  return {
    f: r,
    forced,
    terms,
    n,
    tss: tssOf(r, intercept),
    intercept,
    sigma2: n - q > 0 ? rssFull / (n - q) : null,
    unestimable,
  };
}

/** Column positions (in pr.f) of the model with the given candidate terms (indices into pr.terms). */
export function columnsOf(pr: Problem, subset: number[]): number[] {
  const cols: number[] = [];
  for (let i = 0; i < pr.forced; i++) cols.push(i);
  for (const t of [...subset].sort((a, b) => a - b)) {
    const tm = pr.terms[t]!;
    for (let j = 0; j < tm.width; j++) cols.push(tm.offset + j);
  }
  return cols;
}

export function rssOfSubset(pr: Problem, subset: number[]): number {
  const r = selectColumns(pr.f, columnsOf(pr, subset));
  const K = r.columns.length + 1;
  return r.a[K * K - 1]! ** 2;
}

/** Coefficients of a subset's fit by design column name. */
export function coefficientsOf(pr: Problem, subset: number[]): Map<string, number> {
  const r = selectColumns(pr.f, columnsOf(pr, subset));
  const b = solveFactor(r);
  return new Map(r.columns.map((c, i) => [c, b[i]!]));
}

export function edfOf(pr: Problem, subset: number[]): number {
  return pr.forced + subset.reduce((s, t) => s + pr.terms[t]!.width, 0);
}

export function criteriaOf(pr: Problem, subset: number[], rss: number): ModelCriteria {
  const n = pr.n;
  const q = edfOf(pr, subset);
  const ll = n * Math.log(rss / n);
  const d0 = n - (pr.intercept ? 1 : 0);
  return {
    terms: [...subset].sort((a, b) => a - b).map((t) => pr.terms[t]!.name),
    parameters: q,
    rss,
    r2: pr.tss > 0 ? 1 - rss / pr.tss : 0,
    adjR2: pr.tss > 0 && n - q > 0 ? 1 - rss / (n - q) / (pr.tss / d0) : NaN,
    cp: pr.sigma2 !== null ? rss / pr.sigma2 - n + 2 * q : NaN,
    aic: ll + 2 * q,
    bic: ll + Math.log(n) * q,
  };
}

/** The penalty per coefficient of a criterion: 2 for AIC, log(n) for BIC. */
export const penaltyOf = (criterion: "aic" | "bic", n: number) => (criterion === "aic" ? 2 : Math.log(n));
