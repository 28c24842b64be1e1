/**
 * Batch influence: the pool's fit with and without one batch, and the shift of each
 * coefficient in standard errors of the pool with it, |Δβ_j| / SE_j — DFBETAS (Belsley, Kuh &
 * Welsch 1980, Regression Diagnostics, §2.1) for a block of rows instead of one row.
 */
import type { Factor, Fit } from "./factor";
import { tssOf } from "./context";
import type { FitSummary, InfluenceRow, LargestShift } from "./types";

/** threshold of a notable shift: one standard error [common practice] */
export const INFLUENCE_THRESHOLD = 1;

export interface Frame {
  columns: string[];
  termOf: string[];
  intercept: boolean;
  dfTarget: number;
}

export function summaryOf(f: Factor, fit: Fit, fr: Frame): FitSummary {
  const tss = tssOf(f, fr.intercept);
  const residualDf = fit.n - fit.rank;
  return {
    n: fit.n,
    coefficients: fr.columns.map((column, j) => ({ column, estimate: fit.beta[j]!, stdError: fit.se[j]! })),
    r2: tss > 0 ? 1 - fit.rss / tss : null,
    residualDf,
    headroom: residualDf - fr.dfTarget,
  };
}

/** |β_with − β_without| / SE_with per column; null where either side is aliased or SE is 0. */
export function shiftsOf(withFit: Fit, withoutFit: Fit, fr: Frame): InfluenceRow["shifts"] {
  return fr.columns.map((column, j) => {
    const a = withFit.beta[j];
    const b = withoutFit.beta[j];
    const se = withFit.se[j];
    const shift = a == null || b == null || se == null || !(se > 0) ? null : Math.abs(a - b) / se;
    return { column, term: fr.termOf[j]!, shift };
  });
}

export function largestOf(shifts: InfluenceRow["shifts"]): LargestShift | null {
  let best: LargestShift | null = null;
  for (const s of shifts)
    if (s.shift !== null && (!best || s.shift > best.shift))
      best = { column: s.column, term: s.term, shift: s.shift };
  return best;
}

export function influenceRow(
  id: string,
  label: string,
  n: number,
  withF: Factor,
  withFit: Fit,
  withoutF: Factor,
  withoutFit: Fit,
  fr: Frame,
): InfluenceRow {
  const shifts = shiftsOf(withFit, withoutFit, fr);
  const largest = largestOf(shifts);
  return {
    id,
    label,
    n,
    with: summaryOf(withF, withFit, fr),
    without: summaryOf(withoutF, withoutFit, fr),
    shifts,
    largest,
    influential: largest !== null && largest.shift >= INFLUENCE_THRESHOLD,
  };
}
