/**
 * Noncentral F and the power of the overall F test (Cohen 1988, Statistical Power Analysis for
 * the Behavioral Sciences, ch. 9: f² = R²/(1 − R²), λ = f²·N, v = N − u − 1).
 */
import { betaRegularized, fCdf, lnBeta, lnGamma, qf } from "./distributions";

/**
 * Noncentral beta distribution function I_x(a, b; λ) as a Poisson(λ/2) mixture of central
 * incomplete betas, summed upward from near the Poisson mode with the recurrences and error
 * bound of Lenth (1987), Algorithm AS 226, Applied Statistics 36, 241–244, with the starting
 * point of Frick (1990), AS R84. Error bound 1e-14.
 */
export function noncentralBetaCdf(x: number, a: number, b: number, lambda: number): number {
  if (!(lambda >= 0)) throw new RangeError(`noncentrality must be ≥ 0 (got ${lambda})`);
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  const errmax = 1e-14;
  const itrmax = 100_000;
  const c = lambda / 2;
  const x0 = Math.floor(Math.max(c - 7 * Math.sqrt(c), 0));
  const a0 = a + x0;
  let temp = betaRegularized(x, 1 - x, a0, b);
  let gx = Math.exp(a0 * Math.log(x) + b * Math.log1p(-x) - lnBeta(a0, b) - Math.log(a0));
  let q = a0 > a ? Math.exp(-c + x0 * Math.log(c) - lnGamma(x0 + 1)) : Math.exp(-c);
  let sumq = 1 - q;
  let ans = q * temp;
  let j = x0;
  let errbd: number;
  do {
    j++;
    temp -= gx;
    gx *= (x * (a + b + j - 1)) / (a + j);
    q *= c / j;
    sumq -= q;
    ans += temp * q;
    errbd = (temp - gx) * sumq;
  } while (errbd > errmax && j < itrmax + x0);
  return Math.min(1, Math.max(0, ans));
}

/** P(F′ ≤ x) for the noncentral F(d1, d2, λ): the noncentral beta at d1x/(d1x + d2). */
export function noncentralFCdf(x: number, d1: number, d2: number, lambda: number): number {
  if (!(x > 0)) return 0;
  if (lambda === 0) return fCdf(x, d1, d2);
  const s = d1 * x + d2;
  return noncentralBetaCdf((d1 * x) / s, d1 / 2, d2 / 2, lambda);
}

/** Power of the overall F test with u predictors and N cases at effect f² (Cohen 1988). */
export function overallFPower(f2: number, u: number, N: number, alpha: number): number {
  const v = N - u - 1;
  if (!(u >= 1) || !(v >= 1))
    throw new RangeError(`the F test needs u ≥ 1 and N − u − 1 ≥ 1 (u = ${u}, N = ${N})`);
  if (!(alpha > 0 && alpha < 1)) throw new RangeError(`alpha must lie between 0 and 1 (got ${alpha})`);
  if (!(f2 >= 0)) throw new RangeError(`f² must be ≥ 0 (got ${f2})`);
  const crit = qf(1 - alpha, u, v);
  return 1 - noncentralFCdf(crit, u, v, f2 * N);
}

/**
 * Smallest R² that the overall F test detects with the given power: root of
 * overallFPower(f², p, n, α) = power in f² (bisection on a bracket), R² = f²/(1 + f²).
 * Null when there is no residual df (n − p − 1 < 1).
 */
export function detectableR2(n: number, p: number, alpha: number, power: number): number | null {
  if (!(p >= 1) || !(n - p - 1 >= 1)) return null;
  if (!(power > 0 && power < 1)) throw new RangeError(`power must lie between 0 and 1 (got ${power})`);
  if (power <= alpha) return 0;
  const crit = qf(1 - alpha, p, n - p - 1);
  const pw = (f2: number) => 1 - noncentralFCdf(crit, p, n - p - 1, f2 * n);
  let lo = 0;
  let hi = 1;
  while (pw(hi) < power) {
    lo = hi;
    hi *= 2;
    if (hi > 1e12) return null;
  }
  for (let i = 0; i < 200 && hi - lo > 1e-13 * hi; i++) {
    const mid = 0.5 * (lo + hi);
    if (pw(mid) < power) lo = mid;
    else hi = mid;
  }
  const f2 = 0.5 * (lo + hi);
  return f2 / (1 + f2);
}
