/**
 * Can the batches be pooled? Chow's tests (Chow 1960, "Tests of equality between sets of
 * coefficients in two linear regressions", Econometrica 28, 591–605) from triangular factors,
 * and the overall F test of the pool's model.
 *
 * Ranks, not column counts, give the degrees of freedom: a batch that lacks a level (or has a
 * constant column) has a rank-deficient design, and its fit drops the aliased columns, as R's
 * lm does. With r_b, r_rest, r_all the ranks of the batch, the rest and the pool:
 *   Chow:        F = ((RSS_all − RSS_b − RSS_rest) / (r_b + r_rest − r_all)) / ((RSS_b + RSS_rest) / (n − r_b − r_rest))
 *   predictive:  F = ((RSS_all − RSS_rest) / (n_b + r_rest − r_all)) / (RSS_rest / (n_rest − r_rest))   when n_b ≤ k
 * With full ranks these are the textbook (k, n − 2k) and (n_b, n_rest − k) forms.
 */
import { fUpper } from "../stats/distributions";
import { detectableR2 } from "../stats/power";
import { fitOf, type Factor, type Fit } from "./factor";
import type { ChowResult, ChowRow, LargestShift, OverallTest } from "./types";

export const fmtP = (p: number) =>
  p < 0.0001 ? "p < 0.0001" : `p = ${p < 0.001 ? p.toExponential(1) : p.toPrecision(2)}`;
/** "the coefficient of x1", "the intercept" (with another article or possessive when given) */
export const colWords = (column: string, lead = "the ") =>
  column === "intercept" ? `${lead}intercept` : `${lead}coefficient of ${column}`;
const fmtF = (F: number, d1: number, d2: number) => `F = ${F.toPrecision(3)} on ${d1} and ${d2} df`;

function fTest(num: number, df1: number, den: number, df2: number): { F: number | null; p: number | null } {
  if (!(df1 > 0) || !(df2 > 0) || !(den > 0)) return { F: null, p: null };
  const F = Math.max(0, num / df1) / (den / df2);
  return { F, p: fUpper(F, df1, df2) };
}

function sizeWords(largest: LargestShift | null): string {
  if (!largest) return "";
  const big = largest.shift >= 1;
  return big
    ? ` Without it, ${colWords(largest.column)} moves by ${largest.shift.toFixed(1)} standard errors.`
    : ` The largest coefficient shift is ${largest.shift.toFixed(2)} standard errors (${largest.column}): with many rows a small, harmless difference tests significant.`;
}

/**
 * The Chow test of one unit (batch, provider or candidate) against the rest. `k` is the number
 * of coefficients of the pool's model (its rank); the predictive form is used when n_b ≤ k.
 */
export function chowRow(
  id: string,
  label: string,
  ownFit: Fit,
  restFit: Fit,
  allFit: Fit,
  k: number,
  largest: LargestShift | null,
  alpha: number,
  against = "the rest of the pool",
): ChowRow {
  const n = ownFit.n;
  const predictive = n <= k;
  const rb = predictive ? n : ownFit.rank;
  const rssB = predictive ? 0 : ownFit.rss;
  const df1 = rb + restFit.rank - allFit.rank;
  const df2 = predictive ? restFit.n - restFit.rank : n + restFit.n - rb - restFit.rank;
  const { F, p } = fTest(allFit.rss - rssB - restFit.rss, df1, rssB + restFit.rss, df2);
  const test = predictive
    ? "Chow's predictive test (the batch has too few rows to be fitted alone)"
    : "the Chow test";
  let words: string;
  if (n === 0) {
    words = `${label} has no complete rows (response and predictors all present): there is nothing to compare.`;
  } else if (F === null || p === null) {
    words = `${label} cannot be compared with ${against}: ${test} has ${df1} and ${df2} degrees of freedom.`;
  } else if (p < alpha) {
    words = `The relationship in ${label} differs from ${against} by ${test} (${fmtF(F, df1, df2)}, ${fmtP(p)}).${sizeWords(largest)}`;
  } else {
    words = `No detectable difference between ${label} and ${against} by ${test} (${fmtF(F, df1, df2)}, ${fmtP(p)}).`;
  }
  return {
    id,
    label,
    n,
    kind: predictive ? "predictive" : "chow",
    F,
    df1,
    df2,
    p,
    largest,
    rankBatch: ownFit.rank,
    rankRest: restFit.rank,
    words,
  };
}

/**
 * All g batches share one set of coefficients: F = ((RSS_all − Σ RSS_b) / (Σ r_b − r_all)) /
 * (Σ RSS_b / (n − Σ r_b)), the F test of every batch × term interaction, as R's
 * anova(lm(y ~ X), lm(y ~ X * batch)). A batch with n_b ≤ k rows in general position fits its
 * own rows exactly (RSS_b = 0, r_b = n_b): it enters as in Chow's predictive test.
 */
export function wholePool(all: Fit[], allFit: Fit, k: number, alpha: number): ChowResult | null {
  // a batch without complete rows adds nothing to either model
  const fits = all.filter((f) => f.n > 0);
  if (fits.length < 2) return null;
  let rss = 0;
  let rank = 0;
  let small = 0;
  for (const f of fits) {
    if (f.n <= k) small++;
    // a batch whose rows its own design fits exactly has no residual: RSS_b = 0
    rss += f.n > f.rank ? f.rss : 0;
    rank += f.rank;
  }
  const df1 = rank - allFit.rank;
  const df2 = allFit.n - rank;
  const { F, p } = fTest(allFit.rss - rss, df1, rss, df2);
  let words: string;
  if (F === null || p === null)
    words = `The batches cannot be compared: the test has ${df1} and ${df2} degrees of freedom.`;
  else if (p < alpha)
    words = `The ${fits.length} batches do not share one set of coefficients (${fmtF(F, df1, df2)}, ${fmtP(p)}); the rows below show which batches differ and by how much.`;
  else
    words = `No detectable difference between the ${fits.length} batches' coefficients (${fmtF(F, df1, df2)}, ${fmtP(p)}).`;
  return { groups: fits.length, small, F, df1, df2, p, words };
}

/**
 * The overall F test of the model, F = ((TSS − RSS)/p) / (RSS/(n − p − 1)), and the smallest
 * R² it detects with the given power at the pool's n (Cohen 1988, ch. 9).
 */
export function overallTest(
  fit: Fit,
  tss: number,
  intercept: boolean,
  alpha: number,
  power: number,
): OverallTest | null {
  const p = fit.rank - (intercept ? 1 : 0);
  const df2 = fit.n - fit.rank;
  if (p < 1 || df2 < 1 || !(tss > 0)) return null;
  const { F, p: pv } = fTest(tss - fit.rss, p, fit.rss, df2);
  if (F === null || pv === null) return null;
  const r2 = 1 - fit.rss / tss;
  const adjR2 = 1 - ((1 - r2) * (fit.n - (intercept ? 1 : 0))) / df2;
  const det = intercept ? detectableR2(fit.n, p, alpha, power) : null;
  const detWords =
    det === null
      ? ""
      : ` At n = ${fit.n}, an R² of ${det.toFixed(3)} or more is detected with power ${power}.`;
  const words =
    pv < alpha
      ? `Together the predictors explain more than chance would (${fmtF(F, p, df2)}, ${fmtP(pv)}, R² = ${r2.toFixed(3)}).${detWords}`
      : `Nothing detectable at this n: the predictors together do not explain more than chance would (${fmtF(F, p, df2)}, ${fmtP(pv)}).${detWords}`;
  return { F, df1: p, df2, p: pv, r2, adjR2, detectableR2: det, alpha, power, words };
}

/** Fits of a unit and its rest (the rest with standard errors for the influence figures). */
export function unitFits(own: Factor, rest: Factor | null): { own: Fit; rest: Fit | null } {
  return { own: fitOf(own, false), rest: rest ? fitOf(rest) : null };
}
