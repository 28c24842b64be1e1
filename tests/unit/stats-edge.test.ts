/** Edge cases of the design analysis: rank deficiency, too few rows, constant columns, merging states with different columns. */
import { describe, expect, it } from "vitest";
import { LeastSquares, analyseDesign, type DesignSpec } from "@/lib/readiness/stats";

const OPTS = { alpha: 0.05, power: 0.8 };

/** Deterministic PRNG (mulberry32) and standard normals (Box–Muller). */
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

function numericSpec(columns: string[], intercept = true): DesignSpec {
  const terms = columns.filter((c) => c !== "intercept").map((c) => ({ term: c, columns: [c], df: 1 }));
  return { columns, intercept, terms, numericColumns: terms.map((t) => t.term) };
}

/** Every number in a report is finite (NaN and ±Infinity would serialise as null silently). */
function allFinite(x: unknown): boolean {
  if (typeof x === "number") return Number.isFinite(x);
  if (Array.isArray(x)) return x.every(allFinite);
  if (x && typeof x === "object") return Object.values(x).every(allFinite);
  return true;
}

describe("exact collinearity", () => {
  const g = rng(11);
  const rows = Array.from({ length: 60 }, () => {
    const irrigation = Math.round(g.u() * 400) / 10;
    const rainfall = Math.round(g.u() * 600) / 10;
    const n = g.normal();
    return {
      irrigation,
      rainfall,
      total: irrigation + rainfall,
      n,
      y: 2 + 0.3 * irrigation + 0.1 * rainfall + g.normal(),
    };
  });
  const full = new LeastSquares(5);
  const reduced = new LeastSquares(4);
  for (const r of rows) {
    full.addRow([1, r.irrigation, r.rainfall, r.total, r.n], r.y);
    reduced.addRow([1, r.irrigation, r.rainfall, r.n], r.y);
  }
  const res = analyseDesign(
    full,
    numericSpec(["intercept", "irrigation", "rainfall", "total_water", "n"]),
    OPTS,
  );
  const ref = analyseDesign(reduced, numericSpec(["intercept", "irrigation", "rainfall", "n"]), OPTS);

  it("names the dependency and drops the aliased column from p", () => {
    expect(res.rank).toBe(4);
    expect(res.aliased).toEqual([{ term: "total_water", combination: "irrigation + rainfall" }]);
    expect(res.collinearity?.aliased).toEqual(res.aliased);
    expect(res.fit.dfModel).toBe(3); // rank − 1 (lib/readiness/CHECKS.md "The fit preview")
    expect(res.fit.dfResidual).toBe(56);
    const tw = res.fit.coefficients.find((c) => c.term === "total_water");
    expect(tw).toMatchObject({ estimate: null, stdError: null, aliased: true });
  });

  it("fits as if the aliased column were absent", () => {
    expect(Math.abs(res.fit.rss - ref.fit.rss)).toBeLessThan(1e-10 * ref.fit.rss);
    expect(Math.abs((res.fit.F as number) - (ref.fit.F as number))).toBeLessThan(
      1e-9 * (ref.fit.F as number),
    );
    const est = (a: typeof res, t: string) =>
      a.fit.coefficients.find((c) => c.term === t)?.estimate as number;
    for (const t of ["intercept", "irrigation", "rainfall", "n"])
      expect(est(res, t)).toBeCloseTo(est(ref, t), 9);
    expect(res.collinearity?.terms.map((t) => t.term)).toEqual(["irrigation", "rainfall", "n"]);
    expect(allFinite(res)).toBe(true);
  });

  it("prints scaled combinations with rounded coefficients", () => {
    const ls = new LeastSquares(4);
    for (const r of rows)
      ls.addRow([1, r.irrigation, r.rainfall, 2 * r.irrigation - 0.5 * r.rainfall + 3], r.y);
    const a = analyseDesign(ls, numericSpec(["intercept", "a", "b", "c"]), OPTS);
    expect(a.aliased).toEqual([{ term: "c", combination: "2·a − 0.5·b + 3" }]);
  });
});

describe("indicator trap", () => {
  it("is named when the baseline level has no rows", () => {
    const g = rng(5);
    const ls = new LeastSquares(5);
    for (let i = 0; i < 40; i++) {
      const level = i % 3; // clay, sand, silt — never the baseline loam
      const x = g.normal();
      ls.addRow([1, level === 0 ? 1 : 0, level === 1 ? 1 : 0, level === 2 ? 1 : 0, x], 1 + x + g.normal());
    }
    const spec: DesignSpec = {
      columns: ["intercept", "soil[clay]", "soil[sand]", "soil[silt]", "x"],
      intercept: true,
      terms: [
        { term: "soil", columns: ["soil[clay]", "soil[sand]", "soil[silt]"], df: 3 },
        { term: "x", columns: ["x"], df: 1 },
      ],
      numericColumns: ["x"],
    };
    const res = analyseDesign(ls, spec, OPTS);
    expect(res.rank).toBe(4);
    expect(res.aliased).toHaveLength(1);
    expect(res.aliased[0]?.term).toBe("soil[silt]");
    expect(res.aliased[0]?.combination).toMatch(/^1 − soil\[clay\] − soil\[sand\] \(indicator trap/);
  });
});

describe("too few rows and degenerate columns", () => {
  it("n ≤ k: no residual df, no NaN", () => {
    const ls = new LeastSquares(4);
    ls.addRow([1, 2, 3, 5], 1);
    ls.addRow([1, 4, 1, 2], 2);
    ls.addRow([1, 0, 7, 1], 4);
    const res = analyseDesign(ls, numericSpec(["intercept", "a", "b", "c"]), OPTS);
    expect(res.rank).toBe(3);
    expect(res.fit.dfResidual).toBe(0);
    expect(res.fit.rss).toBe(0);
    expect(res.fit.F).toBeNull();
    expect(res.fit.pValue).toBeNull();
    expect(res.fit.power?.detectableR2).toBeNull();
    expect(res.fit.coefficients.every((c) => c.stdError === null)).toBe(true);
    expect(allFinite(res)).toBe(true);
  });

  it("an empty state analyses without crashing", () => {
    const res = analyseDesign(new LeastSquares(3), numericSpec(["intercept", "a", "b"]), OPTS);
    expect(res.rank).toBe(0);
    expect(res.fit.dfResidual).toBe(0);
    expect(res.fit.coefficients.every((c) => c.aliased)).toBe(true);
    expect(allFinite(res)).toBe(true);
  });

  it("an all-constant column is aliased with the intercept", () => {
    const g = rng(3);
    const ls = new LeastSquares(3);
    for (let i = 0; i < 30; i++) {
      const x = g.normal();
      ls.addRow([1, x, 5], x + g.normal());
    }
    const res = analyseDesign(ls, numericSpec(["intercept", "x", "plot_size"]), OPTS);
    expect(res.aliased).toEqual([
      { term: "plot_size", combination: "5 (the column is constant on the complete cases)" },
    ]);
    expect(res.fit.dfModel).toBe(1);
  });

  it("a column of zeros is aliased", () => {
    const ls = new LeastSquares(3);
    for (let i = 0; i < 10; i++) ls.addRow([1, i, 0], i * 2 + (i % 3));
    const res = analyseDesign(ls, numericSpec(["intercept", "x", "z"]), OPTS);
    expect(res.aliased[0]?.term).toBe("z");
    expect(res.aliased[0]?.combination).toMatch(/all zeros/);
  });

  it("an ill-conditioned polynomial stays full rank (tolerance far below 1e-7)", () => {
    // x, x², …, x⁶ on x ∈ [1, 2]: scaled condition number ~1e7, so R's lm tolerance 1e-7 would be near the edge
    const ls = new LeastSquares(7);
    for (let i = 0; i <= 80; i++) {
      const x = 1 + i / 80;
      const row = [1, x, x ** 2, x ** 3, x ** 4, x ** 5, x ** 6];
      ls.addRow(row, Math.exp(x));
    }
    const res = analyseDesign(ls, numericSpec(["intercept", "x1", "x2", "x3", "x4", "x5", "x6"]), OPTS);
    expect(res.rank).toBe(7);
    const ci = res.collinearity?.conditionIndices ?? [];
    expect(ci[ci.length - 1]).toBeGreaterThan(1e5);
  });

  it("rejects non-finite values and malformed stored states with a message", () => {
    const ls = new LeastSquares(2);
    expect(() => ls.addRow([1, NaN], 1)).toThrow(/not a finite number/);
    expect(() => ls.addRow([1], 1)).toThrow(/expected 2/);
    expect(() =>
      LeastSquares.fromJSON({
        kind: "least-squares",
        version: 1,
        k: 2,
        n: 1,
        d: [1],
        rbar: [],
        thetab: [1, 2],
        sserr: 0,
      }),
    ).toThrow(/wrong length/);
    expect(() => LeastSquares.fromJSON({ hello: 1 })).toThrow(/not valid/);
  });
});

describe("states with different indicator sets merge through expandColumns", () => {
  const g = rng(21);
  const levels = ["loam", "clay", "sand", "silt"];
  const data = Array.from({ length: 200 }, (_, i) => {
    const soil = i < 100 ? (levels[i % 3] as string) : (levels[(i % 3) + 1] as string); // batch A lacks silt, B lacks loam
    const x = g.normal();
    return { soil, x, y: 3 + x + levels.indexOf(soil) * 0.5 + g.normal() };
  });
  const row = (r: (typeof data)[number], cols: string[]) =>
    cols.map((c) => (c === "intercept" ? 1 : c === "x" ? r.x : c === `soil[${r.soil}]` ? 1 : 0));
  const colsA = ["intercept", "soil[clay]", "soil[sand]", "x"];
  const colsB = ["intercept", "x", "soil[sand]", "soil[silt]", "soil[clay]"];
  const all = ["intercept", "soil[clay]", "soil[sand]", "soil[silt]", "x"];
  const a = new LeastSquares(colsA.length);
  const b = new LeastSquares(colsB.length);
  const one = new LeastSquares(all.length);
  data.forEach((r, i) => {
    (i < 100 ? a : b).addRow(row(r, i < 100 ? colsA : colsB), r.y);
    one.addRow(row(r, all), r.y);
  });
  const spec: DesignSpec = {
    columns: all,
    intercept: true,
    terms: [
      { term: "soil", columns: ["soil[clay]", "soil[sand]", "soil[silt]"], df: 3 },
      { term: "x", columns: ["x"], df: 1 },
    ],
    numericColumns: ["x"],
  };

  it("gives the figures of one state over all rows (1e-10 relative)", () => {
    const merged = a.expandColumns(colsA, all);
    merged.merge(b.expandColumns(colsB, all));
    expect(merged.n).toBe(200);
    const x = analyseDesign(merged, spec, OPTS);
    const y = analyseDesign(one, spec, OPTS);
    expect(x.rank).toBe(5);
    const close = (p: number | null | undefined, q: number | null | undefined) =>
      expect(Math.abs((p as number) - (q as number))).toBeLessThanOrEqual(1e-10 * Math.abs(q as number));
    x.fit.coefficients.forEach((c, i) => {
      close(c.estimate, y.fit.coefficients[i]?.estimate);
      close(c.stdError, y.fit.coefficients[i]?.stdError);
    });
    close(x.fit.rss, y.fit.rss);
    close(x.fit.tss, y.fit.tss);
    close(x.collinearity?.terms[0]?.gvif, y.collinearity?.terms[0]?.gvif);
    close(x.collinearity?.conditionIndices.at(-1), y.collinearity?.conditionIndices.at(-1));
  });

  it("dropping a column gives the fit without it", () => {
    const dropped = one.expandColumns(all, ["intercept", "x", "soil[clay]"]);
    const direct = new LeastSquares(3);
    data.forEach((r) => direct.addRow(row(r, ["intercept", "x", "soil[clay]"]), r.y));
    const s3: DesignSpec = {
      columns: ["intercept", "x", "soil[clay]"],
      intercept: true,
      terms: [
        { term: "x", columns: ["x"], df: 1 },
        { term: "soil", columns: ["soil[clay]"], df: 1 },
      ],
      numericColumns: ["x"],
    };
    const p = analyseDesign(dropped, s3, OPTS);
    const q = analyseDesign(direct, s3, OPTS);
    expect(dropped.n).toBe(200);
    expect(Math.abs(p.fit.rss - q.fit.rss)).toBeLessThan(1e-10 * q.fit.rss);
    p.fit.coefficients.forEach((c, i) =>
      expect(c.estimate as number).toBeCloseTo(q.fit.coefficients[i]?.estimate as number, 10),
    );
  });

  it("a batch without a level has that indicator aliased as a zero column", () => {
    const res = analyseDesign(a.expandColumns(colsA, all), spec, OPTS);
    expect(res.aliased.map((x) => x.term)).toEqual(["soil[silt]"]);
  });

  it("changing the baseline changes coefficients but not the fit or the GVIF", () => {
    // Fox & Monette 1992: GVIF does not depend on the coding of the term
    const alt = ["intercept", "soil[loam]", "soil[sand]", "soil[silt]", "x"];
    const ls = new LeastSquares(alt.length);
    data.forEach((r) => ls.addRow(row(r, alt), r.y));
    const specAlt: DesignSpec = {
      ...spec,
      columns: alt,
      terms: [
        { term: "soil", columns: alt.slice(1, 4), df: 3 },
        { term: "x", columns: ["x"], df: 1 },
      ],
    };
    const p = analyseDesign(ls, specAlt, OPTS);
    const q = analyseDesign(one, spec, OPTS);
    expect(p.fit.rss).toBeCloseTo(q.fit.rss, 8);
    expect(p.fit.F as number).toBeCloseTo(q.fit.F as number, 8);
    expect(p.fit.coefficients[0]?.estimate).not.toBeCloseTo(q.fit.coefficients[0]?.estimate as number, 2);
    expect(p.collinearity?.terms[0]?.gvif as number).toBeCloseTo(
      q.collinearity?.terms[0]?.gvif as number,
      10,
    );
    expect(p.collinearity?.terms[1]?.vif as number).toBeCloseTo(q.collinearity?.terms[1]?.vif as number, 10);
  });
});

describe("no intercept", () => {
  it("uses uncentred sums of squares and reports no VIFs", () => {
    const ls = new LeastSquares(1);
    [1, 2, 3, 4].forEach((x) => ls.addRow([x], 2 * x + (x % 2 ? 0.1 : -0.1)));
    const res = analyseDesign(ls, numericSpec(["x"], false), OPTS);
    const sumY2 = [2.1, 3.9, 6.1, 7.9].reduce((s, y) => s + y * y, 0);
    expect(res.fit.tss).toBeCloseTo(sumY2, 10); // NIST NoInt convention (tests/fixtures/reference/README.md)
    expect(res.fit.dfModel).toBe(1);
    expect(res.collinearity?.terms).toEqual([]);
  });
});
