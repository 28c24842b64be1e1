/**
 * Central distributions (F, t, χ²) to near double precision.
 *
 * jstat's own incomplete beta stops its continued fraction at |Δ − 1| < 3e-7 and after 100
 * terms, which gives about 8 significant digits (qf(0.95, 3, 196) = 2.6506765229 against R's
 * 2.65067651011). The regularised incomplete beta and gamma functions are therefore evaluated
 * here (continued fractions run to 1e-15, Stirling-corrected log-beta as in R's lbeta), and
 * jstat supplies the starting values of the quantile searches.
 */
import jStat from "jstat";

const LN_SQRT_2PI = 0.918938533204672742; // ln √(2π)
const EPS = 1e-15;
const MAX_ITER = 200_000;

/** Remainder of Stirling's series: ln Γ(x) − [(x − ½) ln x − x + ln √(2π)], for x ≥ 10. */
function stirlingCorrection(x: number): number {
  const x2 = 1 / (x * x);
  return (
    (1 / 12 +
      x2 *
        (-1 / 360 + x2 * (1 / 1260 + x2 * (-1 / 1680 + x2 * (1 / 1188 + x2 * (-691 / 360360 + x2 / 156)))))) /
    x
  );
}

/** ln Γ(x) for x > 0: Stirling's series for x ≥ 10, upward recurrence below. */
export function lnGamma(x: number): number {
  if (!(x > 0)) throw new RangeError(`lnGamma needs x > 0 (got ${x})`);
  let shift = 0;
  let prod = 1;
  while (x < 10) {
    prod *= x;
    x += 1;
    if (prod > 1e280) {
      shift += Math.log(prod);
      prod = 1;
    }
  }
  shift += Math.log(prod);
  return (x - 0.5) * Math.log(x) - x + LN_SQRT_2PI + stirlingCorrection(x) - shift;
}

/** ln B(a, b), with the large-argument corrections of R's lbeta (avoids cancellation for large a, b). */
export function lnBeta(a: number, b: number): number {
  const p = Math.min(a, b);
  const q = Math.max(a, b);
  if (p >= 10) {
    const corr = stirlingCorrection(p) + stirlingCorrection(q) - stirlingCorrection(p + q);
    return (
      -0.5 * Math.log(q) +
      LN_SQRT_2PI +
      corr +
      (p - 0.5) * Math.log(p / (p + q)) +
      q * Math.log1p(-p / (p + q))
    );
  }
  if (q >= 10) {
    const corr = stirlingCorrection(q) - stirlingCorrection(p + q);
    return lnGamma(p) + corr + p - p * Math.log(p + q) + (q - 0.5) * Math.log1p(-p / (p + q));
  }
  return lnGamma(p) + lnGamma(q) - lnGamma(p + q);
}

/** Continued fraction for I_x(a, b) (modified Lentz), converges fast for x < (a + 1)/(a + b + 2). */
function betaContinuedFraction(x: number, a: number, b: number): number {
  const tiny = 1e-300;
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < tiny) d = tiny;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= MAX_ITER; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < EPS) return h;
  }
  return h;
}

/**
 * Regularised incomplete beta I_x(a, b) (or its complement when `upper`), with y = 1 − x
 * passed separately so that callers can supply it without cancellation.
 */
export function betaRegularized(x: number, y: number, a: number, b: number, upper = false): number {
  if (!(a > 0 && b > 0)) throw new RangeError(`incomplete beta needs a, b > 0 (got ${a}, ${b})`);
  if (x <= 0) return upper ? 1 : 0;
  if (y <= 0) return upper ? 0 : 1;
  const lnFront = a * Math.log(x) + b * Math.log(y) - lnBeta(a, b);
  if (x < (a + 1) / (a + b + 2)) {
    const lower = (Math.exp(lnFront) * betaContinuedFraction(x, a, b)) / a;
    return upper ? 1 - lower : lower;
  }
  const up = (Math.exp(lnFront) * betaContinuedFraction(y, b, a)) / b;
  return upper ? up : 1 - up;
}

/** Regularised lower incomplete gamma P(a, x) (or Q = 1 − P when `upper`). */
export function gammaRegularized(a: number, x: number, upper = false): number {
  if (!(a > 0)) throw new RangeError(`incomplete gamma needs a > 0 (got ${a})`);
  if (x <= 0) return upper ? 1 : 0;
  const lnFront = -x + a * Math.log(x) - lnGamma(a);
  if (x < a + 1) {
    let ap = a;
    let del = 1 / a;
    let sum = del;
    for (let n = 1; n <= MAX_ITER; n++) {
      ap += 1;
      del *= x / ap;
      sum += del;
      if (Math.abs(del) < Math.abs(sum) * EPS) break;
    }
    const p = sum * Math.exp(lnFront);
    return upper ? 1 - p : p;
  }
  const tiny = 1e-300;
  let b = x + 1 - a;
  let c = 1 / tiny;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i <= MAX_ITER; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < tiny) d = tiny;
    c = b + an / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < EPS) break;
  }
  const q = Math.exp(lnFront) * h;
  return upper ? q : 1 - q;
}

function checkDf(name: string, v: number): void {
  if (!(v > 0) || !Number.isFinite(v))
    throw new RangeError(`${name} must be a positive number of degrees of freedom (got ${v})`);
}

/** P(F ≤ x) for F(d1, d2): I_{d1x/(d1x+d2)}(d1/2, d2/2). */
export function fCdf(x: number, d1: number, d2: number): number {
  checkDf("d1", d1);
  checkDf("d2", d2);
  if (!(x > 0)) return 0;
  if (x === Infinity) return 1;
  const s = d1 * x + d2;
  return betaRegularized((d1 * x) / s, d2 / s, d1 / 2, d2 / 2);
}

/** P(F > x) for F(d1, d2), computed directly (no 1 − cdf cancellation for small tails). */
export function fUpper(x: number, d1: number, d2: number): number {
  checkDf("d1", d1);
  checkDf("d2", d2);
  if (!(x > 0)) return 1;
  if (x === Infinity) return 0;
  const s = d1 * x + d2;
  return betaRegularized(d2 / s, (d1 * x) / s, d2 / 2, d1 / 2);
}

/** P(T > t) for Student's t with v degrees of freedom: ½·I_{v/(v+t²)}(v/2, ½) for t > 0. */
export function tUpper(t: number, v: number): number {
  checkDf("v", v);
  if (Number.isNaN(t)) return NaN;
  if (t === Infinity) return 0;
  if (t === -Infinity) return 1;
  const s = v + t * t;
  const tail = 0.5 * betaRegularized(v / s, (t * t) / s, v / 2, 0.5);
  return t >= 0 ? tail : 1 - tail;
}

/** Two-sided p-value of a t statistic: 2·P(T > |t|). */
export function tTwoSided(t: number, v: number): number {
  return Math.min(1, 2 * tUpper(Math.abs(t), v));
}

/** P(X ≤ x) for χ²(k): P(k/2, x/2). */
export function chiSquareCdf(x: number, k: number): number {
  checkDf("k", k);
  return gammaRegularized(k / 2, x / 2, false);
}

/** P(X > x) for χ²(k): Q(k/2, x/2). */
export function chiSquareUpper(x: number, k: number): number {
  checkDf("k", k);
  return gammaRegularized(k / 2, x / 2, true);
}

/**
 * Root of a decreasing function g(x) = target on x > 0, by bisection in log x from a bracket
 * grown around `guess`. Bisection is slow but cannot fail; each step is a few microseconds.
 */
function solveDecreasing(g: (x: number) => number, target: number, guess: number): number {
  let x0 = Number.isFinite(guess) && guess > 0 ? guess : 1;
  let lo = x0 * (1 - 1e-6);
  let hi = x0 * (1 + 1e-6);
  let step = 1e-6;
  for (let i = 0; i < 2000 && g(lo) < target; i++) {
    step = Math.min(step * 4, 0.9);
    hi = lo;
    lo *= 1 - step;
  }
  step = 1e-6;
  for (let i = 0; i < 2000 && g(hi) > target; i++) {
    step *= 4;
    lo = hi;
    hi *= 1 + step;
  }
  for (let i = 0; i < 200; i++) {
    x0 = Math.sqrt(lo * hi);
    if (hi - lo <= 4e-16 * x0) break;
    if (g(x0) > target) lo = x0;
    else hi = x0;
  }
  return Math.sqrt(lo * hi);
}

function checkProbability(p: number): void {
  if (!(p > 0 && p < 1)) throw new RangeError(`probability must lie strictly between 0 and 1 (got ${p})`);
}

/** Quantile of F(d1, d2): the x with P(F ≤ x) = p. */
export function qf(p: number, d1: number, d2: number): number {
  checkProbability(p);
  checkDf("d1", d1);
  checkDf("d2", d2);
  const guess = jStat.centralF.inv(p, d1, d2);
  if (p > 0.5) return solveDecreasing((x) => fUpper(x, d1, d2), 1 - p, guess);
  return solveDecreasing((x) => 1 - fCdf(x, d1, d2), 1 - p, guess);
}

/** Quantile of Student's t with v degrees of freedom, via t² ~ F(1, v). */
export function qt(p: number, v: number): number {
  checkProbability(p);
  if (p === 0.5) return 0;
  if (p < 0.5) return -qt(1 - p, v);
  return Math.sqrt(qf(2 * p - 1, 1, v));
}

/** Quantile of χ²(k): the x with P(X ≤ x) = p. */
export function qchisq(p: number, k: number): number {
  checkProbability(p);
  checkDf("k", k);
  const guess = jStat.chisquare.inv(p, k);
  if (p > 0.5) return solveDecreasing((x) => chiSquareUpper(x, k), 1 - p, guess);
  return solveDecreasing((x) => -chiSquareCdf(x, k), -p, guess);
}
