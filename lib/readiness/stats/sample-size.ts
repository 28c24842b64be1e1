/** Published sample-size rules for linear regression. */
import { qchisq, qt } from "./distributions";

/** Green (1991), Multivariate Behavioral Research 26, 499–510: n ≥ 50 + 8p (overall test), n ≥ 104 + p (single coefficients). */
export function greenRules(p: number): { overall: number; individual: number } {
  return { overall: 50 + 8 * p, individual: 104 + p };
}

function shrinkage(n: number, p: number, r2adj: number): number {
  const r2app = (r2adj * (n - p - 1) + p) / (n - 1);
  if (r2app >= 1) return 1;
  return 1 + (p - 2) / (n * Math.log(1 - r2app));
}

/** Smallest n ≥ lo with pred(n) true, pred monotone (false … false true … true). */
function smallestN(lo: number, pred: (n: number) => boolean): number {
  let hi = Math.max(lo, 1);
  while (!pred(hi)) {
    hi *= 2;
    if (hi > 1e12) throw new RangeError("sample-size search did not converge");
  }
  let low = lo;
  while (low < hi) {
    const mid = Math.floor((low + hi) / 2);
    if (pred(mid)) hi = mid;
    else low = mid + 1;
  }
  return hi;
}

/**
 * Riley et al. (2019), Statistics in Medicine 38, 1262–1275, continuous outcome, p candidate
 * parameters, anticipated adjusted R²:
 * (i) expected uniform shrinkage S = 1 + (p − 2)/(n·ln(1 − R²_app)) ≥ 0.9 with
 *     R²_app = (R²_adj(n − p − 1) + p)/(n − 1);
 * (ii) n ≥ 1 + p(1 − R²_adj)/0.05 (optimism in R² ≤ 0.05);
 * (iii) residual SD within a multiplicative 10 %: √max(df/χ²_{0.025,df}, χ²_{0.975,df}/df) ≤ 1.1, df = n − p − 1;
 * (iv) with the outcome's mean and SD: the mean's 95 % upper limit within 10 % of the mean,
 *      t_{0.975,df}·SD·√((1 − R²_adj)/n) ≤ 0.1·|mean| (null when not given or the mean is 0).
 * required = the largest.
 */
export function rileyContinuous(
  p: number,
  r2adj: number,
  outcome?: { mean: number; sd: number },
): { criteria: { i: number; ii: number; iii: number; iv: number | null }; required: number } {
  if (!Number.isInteger(p) || p < 1)
    throw new RangeError(`Riley's criteria need p ≥ 1 parameters (got ${p})`);
  if (!(r2adj > 0 && r2adj < 1))
    throw new RangeError(`anticipated adjusted R² must lie between 0 and 1 (got ${r2adj})`);
  const first = p + 2; // at least one residual df
  // S(n) first falls from 1 (near n = p + 2) and then rises back towards 1: take the rising branch.
  let nMin = first;
  let step = 1;
  while (shrinkage(nMin + step, p, r2adj) < shrinkage(nMin, p, r2adj)) {
    nMin += step;
    step *= 2;
  }
  // refine the minimum between nMin − step/2 and nMin + step
  let lo = Math.max(first, nMin - step);
  let hi = nMin + step;
  while (hi - lo > 2) {
    const m1 = lo + Math.floor((hi - lo) / 3);
    const m2 = hi - Math.floor((hi - lo) / 3);
    if (shrinkage(m1, p, r2adj) < shrinkage(m2, p, r2adj)) hi = m2;
    else lo = m1;
  }
  const argmin = [lo, lo + 1, hi].reduce(
    (b, n) => (shrinkage(n, p, r2adj) < shrinkage(b, p, r2adj) ? n : b),
    lo,
  );
  const i =
    shrinkage(argmin, p, r2adj) >= 0.9 ? first : smallestN(argmin, (n) => shrinkage(n, p, r2adj) >= 0.9);
  const ii = Math.max(first, Math.ceil(1 + (p * (1 - r2adj)) / 0.05 - 1e-9));
  const sdOk = (n: number) => {
    const df = n - p - 1;
    const ratio = Math.max(df / qchisq(0.025, df), qchisq(0.975, df) / df);
    return Math.sqrt(ratio) <= 1.1;
  };
  const iii = smallestN(first, sdOk);
  let iv: number | null = null;
  if (outcome && Number.isFinite(outcome.mean) && outcome.mean !== 0 && outcome.sd > 0) {
    const { mean, sd } = outcome;
    iv = smallestN(
      first,
      (n) => qt(0.975, n - p - 1) * sd * Math.sqrt((1 - r2adj) / n) <= 0.1 * Math.abs(mean),
    );
  }
  return { criteria: { i, ii, iii, iv }, required: Math.max(i, ii, iii, iv ?? 0) };
}
