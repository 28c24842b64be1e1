/**
 * Cross-checks against R (Debian r-base-core 4.2, r-cran-car) on generated designs:
 * lm/summary.lm/alias, car::vif, svd of the unit-length design, pf/pt/pchisq/qf/qchisq,
 * noncentral pf, and Little's MCAR test written in R from the 1988 formula (row-level EM).
 * Skipped, with the reason printed, when Rscript is not installed.
 */
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import {
  LeastSquares,
  PatternMoments,
  analyseDesign,
  chiSquareUpper,
  fCdf,
  fUpper,
  littleMcar,
  noncentralFCdf,
  qchisq,
  qf,
  qt,
  tUpper,
  type DesignSpec,
} from "@/lib/readiness/stats";
import { rscriptAvailable, runRJson, tempDir, writeCsv } from "../helpers/rscript";

const R = rscriptAvailable(["car"]);
if (!R.ok) console.warn(`stats-r tests skipped: ${R.reason}`);

function rng(seed: number) {
  let a = seed >>> 0;
  const u = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const normal = () => Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u());
  return { u, normal };
}

const rel = (x: number, y: number) => Math.abs(x - y) / Math.max(Math.abs(y), 1e-300);

interface LmOut {
  names: string[];
  coef: (number | null)[];
  se: number[];
  rss: number[];
  dfResidual: number[];
  rank: number[];
  r2: number[];
  adjr2: number[];
  sigma: number[];
  fstat: number[];
  fp: number[];
  aliasRows: string[][];
  aliasCols: string[][];
  aliasCoef: number[][];
  condition: number[];
  proportions: number[][];
  keptNames: string[];
  cor: number[][];
  gvif: Record<string, { gvif: number[]; df: number[] }>;
  vif: { terms: string[]; gvif: number[]; df: number[]; scaled: number[] } | null;
}

/** R's model.matrix name for a TS design column ("f[b]" → "fb", "x1:f[b]" → "x1:fb"). */
const rName = (c: string) => (c === "intercept" ? "(Intercept)" : c.replace(/\[(.*?)\]/g, "$1"));

interface Case {
  name: string;
  formula: string;
  columns: string[];
  terms: { term: string; columns: string[]; df: number }[];
  n: number;
  seed: number;
}

const LEVELS = ["a", "b", "c", "d"];

function generate(c: Case) {
  const g = rng(c.seed);
  const raw = Array.from({ length: c.n }, () => {
    const x1 = g.normal();
    const x2 = 0.95 * x1 + 0.3 * g.normal(); // strongly correlated with x1
    const x3 = 50 + 10 * g.normal(); // large mean: a centring test
    const fi = Math.min(3, Math.floor(g.u() * 3 + (x1 > 0.5 ? 1 : 0))); // level depends on x1
    const f = LEVELS[fi] as string;
    const x4 = x1 + 2 * x3; // exactly dependent
    const y =
      1 + 2 * x1 - x2 + 0.05 * x3 + [0, 0.5, -0.3, 1][fi]! + 0.4 * x1 * (fi === 2 ? 1 : 0) + g.normal();
    return { x1, x2, x3, f, x4, y };
  });
  const value = (r: (typeof raw)[number], col: string): number => {
    if (col === "intercept") return 1;
    if (col.includes(":")) return col.split(":").reduce((p, part) => p * value(r, part), 1);
    const m = /^f\[(.)\]$/.exec(col);
    if (m) return r.f === m[1] ? 1 : 0;
    return r[col as "x1" | "x2" | "x3" | "x4"];
  };
  return { raw, value };
}

const CASES: Case[] = [
  {
    name: "numeric + factor + exact dependency",
    formula: "y ~ x1 + x2 + x3 + f + x4",
    columns: ["intercept", "x1", "x2", "x3", "f[b]", "f[c]", "f[d]", "x4"],
    terms: [
      { term: "x1", columns: ["x1"], df: 1 },
      { term: "x2", columns: ["x2"], df: 1 },
      { term: "x3", columns: ["x3"], df: 1 },
      { term: "f", columns: ["f[b]", "f[c]", "f[d]"], df: 3 },
      { term: "x4", columns: ["x4"], df: 1 },
    ],
    n: 400,
    seed: 2024,
  },
  {
    name: "interaction x1:f",
    formula: "y ~ x1 * f + x3",
    columns: ["intercept", "x1", "f[b]", "f[c]", "f[d]", "x3", "x1:f[b]", "x1:f[c]", "x1:f[d]"],
    terms: [
      { term: "x1", columns: ["x1"], df: 1 },
      { term: "f", columns: ["f[b]", "f[c]", "f[d]"], df: 3 },
      { term: "x3", columns: ["x3"], df: 1 },
      { term: "x1:f", columns: ["x1:f[b]", "x1:f[c]", "x1:f[d]"], df: 3 },
    ],
    n: 250,
    seed: 77,
  },
];

describe.skipIf(!R.ok).each(CASES)("lm cross-check: $name", (c) => {
  const { raw, value } = generate(c);
  const csv = path.join(R.ok ? tempDir() : "", "design.csv");
  if (R.ok)
    writeCsv(
      csv,
      ["x1", "x2", "x3", "f", "x4", "y"],
      raw.map((r) => [r.x1, r.x2, r.x3, r.f, r.x4, r.y]),
    );
  const spec: DesignSpec = {
    columns: c.columns,
    intercept: true,
    terms: c.terms,
    numericColumns: ["x1", "x2", "x3", "x4"].filter((x) => c.columns.includes(x)),
  };
  // Fox & Monette groups as lib/readiness/CHECKS.md (Formulas, GVIF) defines them: a predictor with the interaction columns containing it
  const groups = c.terms
    .filter((t) => !t.term.includes(":"))
    .map((t) => {
      const cols = [
        ...t.columns,
        ...c.terms
          .filter((o) => o.term.includes(":") && o.term.split(":").includes(t.term))
          .flatMap((o) => o.columns),
      ];
      return `${t.term}=${cols.map(rName).join(",")}`;
    })
    .filter((g) => !g.startsWith("x4="))
    .join(";");
  let out: LmOut;
  beforeAll(() => {
    out = runRJson<LmOut>("lm-check.R", [csv, c.formula, groups]);
  });
  const ls = new LeastSquares(c.columns.length);
  for (const r of raw)
    ls.addRow(
      c.columns.map((col) => value(r, col)),
      r.y,
    );
  const res = analyseDesign(ls, spec, { alpha: 0.05, power: 0.8 });

  it("uses R's column order", () => {
    expect(out.names).toEqual(c.columns.map(rName));
  });

  it("coefficients, standard errors, RSS, R², F and rank agree with lm", () => {
    expect(res.rank).toBe(out.rank[0]); // R lm rank
    expect(res.fit.dfResidual).toBe(out.dfResidual[0]);
    let se = 0;
    res.fit.coefficients.forEach((co, i) => {
      const rc = out.coef[i];
      if (rc === null) {
        expect(co.aliased).toBe(true); // R: NA coefficient
        return;
      }
      expect(rel(co.estimate as number, rc as number)).toBeLessThan(1e-9);
      expect(rel(co.stdError as number, out.se[se++] as number)).toBeLessThan(1e-9);
    });
    expect(rel(res.fit.rss, out.rss[0] as number)).toBeLessThan(1e-10);
    expect(rel(res.fit.rSquared, out.r2[0] as number)).toBeLessThan(1e-10);
    expect(rel(res.fit.adjRSquared, out.adjr2[0] as number)).toBeLessThan(1e-10);
    expect(rel(res.fit.residualStdError, out.sigma[0] as number)).toBeLessThan(1e-10);
    expect(rel(res.fit.F as number, out.fstat[0] as number)).toBeLessThan(1e-9);
    expect(res.fit.dfModel).toBe(out.fstat[1]);
    expect(rel(res.fit.pValue as number, out.fp[0] as number)).toBeLessThan(1e-8);
  });

  it("aliasing agrees with alias()", () => {
    expect(res.aliased.map((a) => rName(a.term))).toEqual(out.aliasRows.map((r) => r[0]));
    out.aliasRows.forEach((row, i) => {
      const coefs = out.aliasCoef[i] as number[];
      const expected = out.aliasCols
        .map((col, j) => ({ col: col[0] as string, v: coefs[j] as number }))
        .filter((e) => Math.abs(e.v) > 1e-9);
      const text = res.aliased[i]?.combination ?? "";
      for (const e of expected) {
        const v = Math.abs(Number(e.v.toPrecision(4)));
        expect(text).toContain(v === 1 ? e.col : `${v}·${e.col}`);
      }
    });
    if (c.columns.includes("x4")) expect(res.aliased[0]?.combination).toBe("x1 + 2·x3");
  });

  it("correlations, condition indices and variance proportions agree with R's svd", () => {
    const cols = res.collinearity?.varianceProportions.columns.map(rName);
    expect(cols).toEqual(out.keptNames);
    const ci = res.collinearity?.conditionIndices ?? [];
    expect(ci).toHaveLength(out.condition.length);
    ci.forEach((v, k) => expect(rel(v, out.condition[k] as number)).toBeLessThan(1e-9));
    const props = res.collinearity?.varianceProportions.matrix ?? [];
    props.forEach((row, k) =>
      row.forEach((v, j) =>
        expect(Math.abs(v - ((out.proportions[k] as number[])[j] as number))).toBeLessThan(1e-8),
      ),
    );
    const cor = res.collinearity?.correlations.matrix ?? [];
    cor.forEach((row, i) =>
      row.forEach((v, j) =>
        expect(Math.abs(v - ((out.cor[i] as number[])[j] as number))).toBeLessThan(1e-12),
      ),
    );
  });

  it("GVIFs agree with det(R11)det(R22)/det(R) and with car::vif", () => {
    for (const t of res.collinearity?.terms ?? []) {
      const ref = out.gvif[t.term];
      expect(ref, t.term).toBeDefined();
      expect(rel(t.gvif, ref?.gvif[0] as number)).toBeLessThan(1e-9);
      expect(t.df).toBe(ref?.df[0]);
      expect(rel(t.gvifScaled, Math.pow(ref?.gvif[0] as number, 1 / (2 * t.df)))).toBeLessThan(1e-9);
    }
    if (out.vif) {
      // car::vif on the model without the aliased column: GVIF, Df, GVIF^(1/(2*Df))
      out.vif.terms.forEach((term, i) => {
        const t = res.collinearity?.terms.find((x) => x.term === term);
        expect(t, term).toBeDefined();
        expect(rel(t?.gvif as number, out.vif?.gvif[i] as number)).toBeLessThan(1e-9);
        expect(t?.df).toBe(out.vif?.df[i]);
        expect(rel(t?.gvifScaled as number, out.vif?.scaled[i] as number)).toBeLessThan(1e-9);
        if (t?.df === 1) expect(t.vif).toBe(t.gvif);
      });
      expect(out.vif.terms).toContain("f");
    }
  });
});

describe.skipIf(!R.ok)("distributions against R pf/pt/pchisq/qf/qt/qchisq and noncentral pf", () => {
  const grid: [string, number, number, number, number][] = [];
  for (const [d1, d2] of [
    [1, 5],
    [3, 73],
    [7, 200],
    [20, 5000],
    [2.5, 11.5],
  ] as [number, number][]) {
    for (const x of [0.1, 0.9, 2.2, 4, 9]) {
      grid.push(["fUpper", x, d1, d2, 0], ["fCdf", x, d1, d2, 0]);
      for (const ncp of [0.5, 5, 30, 120]) grid.push(["ncf", x, d1, d2, ncp]);
    }
    for (const p of [0.01, 0.5, 0.95, 0.999]) grid.push(["qf", p, d1, d2, 0]);
  }
  for (const v of [1, 3, 12, 60, 800]) {
    for (const t of [-2, 0.3, 1.7, 4.5]) grid.push(["tUpper", t, v, 0, 0]);
    for (const p of [0.9, 0.975, 0.9995]) grid.push(["qt", p, v, 0, 0]);
    for (const x of [0.5, v, 2 * v + 10]) grid.push(["chiUpper", x, v, 0, 0]);
    for (const p of [0.025, 0.5, 0.975]) grid.push(["qchisq", p, v, 0, 0]);
  }
  let out: { values: number[] };
  beforeAll(() => {
    const csv = path.join(tempDir(), "grid.csv");
    writeCsv(csv, ["fn", "x", "d1", "d2", "ncp"], grid);
    out = runRJson<{ values: number[] }>("distributions.R", [csv]);
  });
  const ours = (fn: string, x: number, d1: number, d2: number, ncp: number): number => {
    switch (fn) {
      case "fUpper":
        return fUpper(x, d1, d2);
      case "fCdf":
        return fCdf(x, d1, d2);
      case "ncf":
        return noncentralFCdf(x, d1, d2, ncp);
      case "qf":
        return qf(x, d1, d2);
      case "tUpper":
        return tUpper(x, d1);
      case "qt":
        return qt(x, d1);
      case "chiUpper":
        return chiSquareUpper(x, d1);
      case "qchisq":
        return qchisq(x, d1);
      default:
        throw new Error(fn);
    }
  };
  it.each(grid.map((g, i) => [i, ...g] as const))("#%i %s(%f, %f, %f, ncp %f)", (i, fn, x, d1, d2, ncp) => {
    const expected = out.values[i] as number;
    const got = ours(fn, x, d1, d2, ncp);
    // R's noncentral pf (pnbeta, AS 226) stops at an error bound of 1e-9; the central functions are exact to ~1e-14
    const tol = fn === "ncf" ? 1e-9 : 1e-11;
    expect(Math.abs(got - expected)).toBeLessThanOrEqual(tol * Math.max(1, Math.abs(expected)));
  });
});

describe.skipIf(!R.ok)("Little's MCAR test against a row-level R implementation", () => {
  const scenarios = [
    { name: "missing completely at random", seed: 4, mar: false },
    { name: "missingness depending on an observed column", seed: 9, mar: true },
  ];
  it.each(scenarios)("$name", ({ seed, mar }) => {
    const g = rng(seed);
    const rows: (number | null)[][] = Array.from({ length: 240 }, () => {
      const a = g.normal();
      const b = 0.6 * a + g.normal();
      const c = 100 + 5 * g.normal() + 2 * b;
      const d = g.normal();
      const missB = mar ? a > 0.3 && g.u() < 0.7 : g.u() < 0.2;
      const missC = g.u() < 0.15;
      const missA = g.u() < 0.1;
      return [missA ? null : a, missB ? null : b, missC ? null : c, d];
    });
    const dir = tempDir();
    const csv = path.join(dir, "missing.csv");
    writeCsv(csv, ["a", "b", "c", "d"], rows);
    const out = runRJson<{ statistic: number[]; df: number[]; pValue: number[] }>(
      "little-mcar.R",
      [csv],
      300_000,
    );
    const pm = new PatternMoments(["a", "b", "c", "d"]);
    rows.forEach((r) => pm.addRow(r));
    const res = littleMcar(pm);
    expect(res).not.toBeNull();
    expect(res?.df).toBe(out.df[0]);
    expect(rel(res?.statistic as number, out.statistic[0] as number)).toBeLessThan(1e-7);
    expect(Math.abs((res?.pValue as number) - (out.pValue[0] as number))).toBeLessThan(1e-8);
    if (mar) expect(res?.pValue).toBeLessThan(0.05);
  });
});
