/** Distribution functions, power and sample-size rules against published values. */
import { describe, expect, it } from "vitest";
import {
  chiSquareUpper,
  detectableR2,
  fUpper,
  greenRules,
  noncentralFCdf,
  overallFPower,
  qchisq,
  qf,
  qt,
  rileyContinuous,
  tUpper,
} from "@/lib/readiness/stats";

const rel = (x: number, y: number) => Math.abs(x - y) / Math.abs(y);

describe("central distributions", () => {
  it("F and t quantiles", () => {
    // tests/fixtures/reference/README.md "Distribution values" (R 4.2 qf/qt, agreeing with printed F and t tables)
    expect(rel(qf(0.95, 3, 196), 2.65067651011)).toBeLessThan(1e-11);
    expect(rel(qf(0.95, 1, 10), 4.96460274373)).toBeLessThan(1e-11);
    expect(rel(qf(0.99, 5, 50), 3.40767950503)).toBeLessThan(1e-11);
    expect(rel(qt(0.975, 10), 2.22813885199)).toBeLessThan(1e-11);
    expect(qt(0.025, 10)).toBeCloseTo(-2.22813885199, 10); // symmetry of t, same source
  });
  it("F upper tail", () => {
    // tests/fixtures/reference/README.md: upper tail of F(3, 196) at 3.0 = 0.0317564369184
    expect(rel(fUpper(3, 3, 196), 0.0317564369184)).toBeLessThan(1e-10);
  });
  it("closed forms", () => {
    // t with 1 df is Cauchy: P(T > 1) = 1/4 exactly (any statistics text)
    expect(tUpper(1, 1)).toBeCloseTo(0.25, 14);
    // χ² with 2 df is exponential with mean 2: P(X > x) = exp(−x/2)
    expect(rel(chiSquareUpper(7, 2), Math.exp(-3.5))).toBeLessThan(1e-14);
    // F(2, 2): P(F > x) = 1/(1 + x)
    expect(rel(fUpper(3, 2, 2), 0.25)).toBeLessThan(1e-14);
    // printed χ² table (e.g. Pearson & Hartley; NIST/SEMATECH e-Handbook 1.3.6.7.4): χ²_{0.95}(10) = 18.307
    expect(qchisq(0.95, 10)).toBeCloseTo(18.307, 3);
    expect(qchisq(0.05, 10)).toBeCloseTo(3.94, 3);
  });
  it("rejects impossible arguments with a message", () => {
    expect(() => qf(1.2, 3, 10)).toThrow(/probability/);
    expect(() => fUpper(2, 0, 10)).toThrow(/degrees of freedom/);
  });
});

describe("power of the overall F test (Cohen 1988)", () => {
  it("u = 3, f² = 0.15, α = 0.05 needs N = 77 for power 0.80", () => {
    // tests/fixtures/reference/README.md: power 0.801766 at N = 77, 0.795712 at N = 76 (exact noncentral F)
    expect(overallFPower(0.15, 3, 77, 0.05)).toBeCloseTo(0.801766, 6);
    expect(overallFPower(0.15, 3, 76, 0.05)).toBeCloseTo(0.795712, 6);
    let n = 5;
    while (overallFPower(0.15, 3, n, 0.05) < 0.8) n++;
    expect(n).toBe(77); // Cohen 1988, Table 9.4.2 / tests/fixtures/reference/README.md
  });
  it("λ = 0 reduces to the central F; power at f² = 0 is α", () => {
    expect(rel(noncentralFCdf(2.5, 4, 30, 0), 1 - fUpper(2.5, 4, 30))).toBeLessThan(1e-14);
    expect(overallFPower(0, 3, 50, 0.05)).toBeCloseTo(0.05, 12); // definition of the size of a test
  });
  it("detectable R² inverts the power function", () => {
    const r2 = detectableR2(77, 3, 0.05, 0.8) as number;
    const f2 = r2 / (1 - r2);
    // N = 77 gives 0.8018 at f² = 0.15 (tests/fixtures/reference/README.md), so the f² for exactly 0.80 lies just below 0.15
    expect(f2).toBeLessThan(0.15);
    expect(f2).toBeGreaterThan(0.14);
    expect(overallFPower(f2, 3, 77, 0.05)).toBeCloseTo(0.8, 9);
    expect(detectableR2(4, 3, 0.05, 0.8)).toBeNull(); // no residual df
  });
});

describe("sample-size rules", () => {
  it("Riley et al. 2019 worked example: p = 25, R²adj = 0.2 → 918", () => {
    // Riley et al. 2019, Stat Med 38:1262–1275, continuous-outcome example: (i) 918, (ii) 401, (iii) 259
    const r = rileyContinuous(25, 0.2);
    expect(r.criteria).toEqual({ i: 918, ii: 401, iii: 259, iv: null });
    expect(r.required).toBe(918);
  });
  it("criterion (iv) only with the outcome's mean and SD, and it is the smallest n meeting it", () => {
    const r = rileyContinuous(25, 0.2, { mean: 10, sd: 5 });
    const iv = r.criteria.iv as number;
    const margin = (n: number) => qt(0.975, n - 26) * 5 * Math.sqrt(0.8 / n); // lib/readiness/CHECKS.md, Riley (iv)
    expect(margin(iv)).toBeLessThanOrEqual(1);
    expect(margin(iv - 1)).toBeGreaterThan(1);
    expect(r.required).toBe(918);
  });
  it("criterion (iii) needs df ≥ 233", () => {
    // lib/readiness/CHECKS.md, Riley (iii): residual SD within 10 % needs df ≥ 233, i.e. n = p + 1 + 233
    expect(rileyContinuous(5, 0.5).criteria.iii).toBe(239);
  });
  it("Green 1991 rules of thumb", () => {
    // Green 1991, Multivariate Behav Res 26:499–510: N ≥ 50 + 8m and N ≥ 104 + m
    expect(greenRules(6)).toEqual({ overall: 98, individual: 110 });
    expect(greenRules(20)).toEqual({ overall: 210, individual: 124 });
  });
});
