/**
 * Iterative refinement of the coefficients (lib/readiness/stats/refine.ts). The reference is
 * the exact degree-5 polynomial y = 1 + x + x² + x³ + x⁴ + x⁵ on x = 0…20 (the data of NIST
 * StRD Wampler1, certified B0…B5 = 1): every coefficient is 1 by construction, so the number
 * of correct digits is −log10 |b − 1| (McCullough 1998's log relative error). R's lm reaches
 * about 9.8 digits on it (R 4.x, LINPACK QR: tests/r/polynomial-lm.R); the engine must reach 10.
 */
import { describe, expect, test } from "vitest";
import { checkBatch, parsePlan } from "@/lib/readiness";
import { LeastSquares, analyseDesign, type DesignSpec } from "@/lib/readiness/stats";
import { KEEP_MAX_VALUES, dot2 } from "@/lib/readiness/stats/refine";
import { rscriptAvailable, runRJson } from "../helpers/rscript";
import { chunks } from "../fixtures/engine/data";

const lre = (b: number) => (b === 1 ? 16 : Math.min(16, -Math.log10(Math.abs(b - 1))));
const COLS = ["intercept", "x1", "x2", "x3", "x4", "x5"];
const SPEC: DesignSpec = {
  columns: COLS,
  intercept: true,
  terms: COLS.slice(1).map((c) => ({ term: c, columns: [c], df: 1 })),
  numericColumns: [],
};
const OPTS = { alpha: 0.05, power: 0.8 };

function polynomial(): LeastSquares {
  const ls = new LeastSquares(6);
  for (let x = 0; x <= 20; x++) {
    const row = [1, x, x ** 2, x ** 3, x ** 4, x ** 5];
    ls.addRow(
      row,
      row.reduce((s, v) => s + v, 0),
    );
  }
  return ls;
}

const digits = (ls: LeastSquares) =>
  Math.min(...analyseDesign(ls, SPEC, OPTS).fit.coefficients.map((c) => lre(c.estimate as number)));

/** The same factor without its kept rows: what the engine solved before refinement. */
function withoutRows(ls: LeastSquares): LeastSquares {
  const j = ls.toJSON();
  delete j.rows;
  return LeastSquares.fromJSON(j);
}

describe("exact degree-5 polynomial (Wampler1 data; coefficients 1 by construction)", () => {
  test("every coefficient to at least 10 significant digits, where the plain back substitution has about 9", () => {
    const ls = polynomial();
    expect(digits(ls)).toBeGreaterThanOrEqual(10);
    // the same factor solved without refinement stays below 10 digits: the step is what gains them
    expect(digits(withoutRows(ls))).toBeLessThan(10);
  });

  test("after a round trip through the stored state and a merge of two halves", () => {
    const a = new LeastSquares(6);
    const b = new LeastSquares(6);
    for (let x = 0; x <= 20; x++) {
      const row = [1, x, x ** 2, x ** 3, x ** 4, x ** 5];
      (x < 10 ? a : b).addRow(
        row,
        row.reduce((s, v) => s + v, 0),
      );
    }
    const merged = LeastSquares.fromJSON(JSON.parse(JSON.stringify(a.toJSON())));
    merged.merge(LeastSquares.fromJSON(b.toJSON()));
    expect(merged.keptRows?.length).toBe(21 * 7);
    expect(digits(merged)).toBeGreaterThanOrEqual(10);
  });

  test("through the whole check of a CSV file and its plan", async () => {
    const lines = ["x1,x2,x3,x4,x5,y"];
    for (let x = 0; x <= 20; x++)
      lines.push([x, x ** 2, x ** 3, x ** 4, x ** 5, 1 + x + x ** 2 + x ** 3 + x ** 4 + x ** 5].join(","));
    const columns = [
      ...["x1", "x2", "x3", "x4", "x5"].map((name) => ({ name, role: "predictor", type: "number" })),
      { name: "y", role: "response", type: "number" },
    ];
    const parsed = parsePlan({ columns });
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
    const report = await checkBatch(chunks(lines.join("\n") + "\n"), parsed.plan);
    const coefs = report.fit!.coefficients.map((c) => c.estimate as number);
    expect(coefs).toHaveLength(6);
    expect(Math.min(...coefs.map(lre))).toBeGreaterThanOrEqual(10);
  });

  test.skipIf(!rscriptAvailable().ok)("more digits than R's lm on the same data", () => {
    const r = runRJson<{ coefficients: number[] }>("polynomial-lm.R");
    const rDigits = Math.min(...r.coefficients.map(lre));
    expect(rDigits).toBeGreaterThan(9); // about 9.8 with R 4.x (LINPACK dqrdc2)
    expect(digits(polynomial())).toBeGreaterThan(rDigits);
  });
});

describe("the kept rows and the step's safeguards", () => {
  test("Dot2 is exact where plain summation loses everything: 1e16 + 1 − 1e16 (Ogita, Rump & Oishi 2005)", () => {
    expect(dot2([1e16, 1, -1e16], [1, 1, 1])).toBe(1);
    expect(1e16 + 1 - 1e16).toBe(0); // the plain sum, for contrast
    // (2^27 + 1)(2^27 − 1) = 2^54 − 1 is not a double; minus 2^54 exactly −1
    expect(dot2([2 ** 27 + 1], [2 ** 27 - 1], -(2 ** 54))).toBe(-1);
  });

  test("a large batch keeps no rows and is solved from the factor alone", () => {
    const ls = new LeastSquares(3);
    const rowsToCap = Math.floor(KEEP_MAX_VALUES / 4);
    for (let i = 0; i < rowsToCap; i++) ls.addRow([1, i, Math.sin(i)], 2 + i);
    expect(ls.keptRows?.length).toBe(rowsToCap * 4);
    ls.addRow([1, -1, 0], 1);
    expect(ls.keptRows).toBeNull();
    expect(ls.toJSON().rows).toBeUndefined();
  });

  test("on a well-conditioned design the refined coefficients equal the plain ones to rounding", () => {
    const ls = new LeastSquares(3);
    let s = 7;
    const u = () => (s = (s * 16807) % 2147483647) / 2147483647;
    for (let i = 0; i < 200; i++) {
      const a = u();
      const b = u();
      ls.addRow([1, a, b], 1 + 2 * a - 3 * b + (u() - 0.5));
    }
    const spec: DesignSpec = {
      columns: ["intercept", "a", "b"],
      intercept: true,
      terms: [
        { term: "a", columns: ["a"], df: 1 },
        { term: "b", columns: ["b"], df: 1 },
      ],
      numericColumns: [],
    };
    const refined = analyseDesign(ls, spec, OPTS).fit.coefficients;
    const plain = analyseDesign(withoutRows(ls), spec, OPTS).fit.coefficients;
    refined.forEach((c, i) =>
      expect(Math.abs((c.estimate as number) - (plain[i]!.estimate as number))).toBeLessThan(
        1e-12 * Math.max(1, Math.abs(c.estimate as number)),
      ),
    );
  });

  test("renaming the design columns carries the kept rows (a missing level becomes a zero column)", () => {
    const ls = new LeastSquares(2);
    ls.addRow([1, 5], 3);
    ls.addRow([1, 7], 4);
    const wide = ls.expandColumns(["intercept", "a"], ["intercept", "b", "a"]);
    expect(wide.keptRows).toEqual([1, 0, 5, 3, 1, 0, 7, 4]);
  });

  test("a stored state whose kept rows do not match its row count is refused", () => {
    const j = polynomial().toJSON();
    j.rows = j.rows!.slice(7);
    expect(() => LeastSquares.fromJSON(j)).toThrow(/keeps 140 row values for 21 rows/);
  });
});
