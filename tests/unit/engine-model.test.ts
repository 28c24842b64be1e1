/**
 * The model through the whole pipeline: the baseline identity (theory: treatment coding),
 * pooling of stored states against one pass over the concatenated file, drift, and a
 * cross-check against R (lm, car::vif, svd) on a generated CSV with factors and missing values.
 */
import path from "node:path";
import { describe, expect, test } from "vitest";
import { checkBatch, driftFindings, poolReport, type ReadinessReport } from "@/lib/readiness";
import { rscriptAvailable, runRJson, tempDir } from "../helpers/rscript";
import { HEADER, chunks, cleanRows, csvOf, plan, planInput, rng, type Row } from "../fixtures/engine/data";
import fs from "node:fs";

const col = (name: string) => HEADER.indexOf(name);
const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);
const coef = (r: ReadinessReport, term: string) =>
  r.fit!.coefficients.find((c) => c.term === term)!.estimate!;

/** clean rows with some gaps: irrigation missing in every 9th row, rainfall "NA" in every 13th */
function gappy(n: number, seed: number, firstId = 1): Row[] {
  return cleanRows(n, seed, firstId).map((x, i) => {
    if (i % 9 === 4) x[col("irrigation")] = "";
    if (i % 13 === 7) x[col("rainfall")] = "NA";
    return x;
  });
}

describe("baseline identity (treatment coding: changing the baseline reparametrises the same fit)", () => {
  test("RSS, F and R² unchanged; coefficients shift as theory says", async () => {
    const text = csvOf(HEADER, gappy(240, 3));
    const loam = await checkBatch(chunks(text), plan());
    const clayPlan = planInput();
    clayPlan.columns = clayPlan.columns.map((c) => (c.name === "soil" ? { ...c, baseline: "clay" } : c));
    const clay = await checkBatch(chunks(text), plan(clayPlan));
    expect(rel(clay.fit!.rss, loam.fit!.rss)).toBeLessThan(1e-10);
    expect(rel(clay.fit!.F!, loam.fit!.F!)).toBeLessThan(1e-10);
    expect(rel(clay.fit!.rSquared, loam.fit!.rSquared)).toBeLessThan(1e-10);
    expect(clay.model.parameters).toBe(loam.model.parameters);
    // new intercept = old intercept + old coef of the new baseline
    expect(rel(coef(clay, "intercept"), coef(loam, "intercept") + coef(loam, "soil[clay]"))).toBeLessThan(
      1e-9,
    );
    // the old baseline's indicator = −(old coef of the new baseline)
    expect(rel(coef(clay, "soil[loam]"), -coef(loam, "soil[clay]"))).toBeLessThan(1e-9);
    // any other level: old coef − old coef of the new baseline
    for (const l of ["sand", "silt"])
      expect(rel(coef(clay, `soil[${l}]`), coef(loam, `soil[${l}]`) - coef(loam, "soil[clay]"))).toBeLessThan(
        1e-9,
      );
    // numeric slopes and the other factor untouched
    for (const t of ["nitrogen", "irrigation", "rainfall", "variety[Corrin]"])
      expect(rel(coef(clay, t), coef(loam, t))).toBeLessThan(1e-9);
    // GVIF does not depend on the baseline (Fox & Monette 1992)
    const g = (r: ReadinessReport) => r.collinearity!.terms.find((t) => t.term === "soil")!.gvif;
    expect(rel(g(clay), g(loam))).toBeLessThan(1e-9);
  });
});

describe("pooling: merged states equal one pass over the concatenated files", () => {
  const rowsA = gappy(150, 5, 1);
  const rowsB = gappy(170, 6, 151);
  // file A has no "silt": its silt indicator is a zero column until merged
  for (const x of rowsA) if (x[col("soil")] === "silt") x[col("soil")] = "sand";

  test.each([
    { name: "closed level lists", p: plan() },
    {
      name: "open level lists discovered from the data",
      p: plan({
        columns: planInput().columns.map((c) =>
          c.type === "category" ? { name: c.name, role: c.role, type: c.type } : c,
        ),
      }),
    },
  ])("$name", async ({ p }) => {
    const a = await checkBatch(chunks(csvOf(HEADER, rowsA)), p);
    const b = await checkBatch(chunks(csvOf(HEADER, rowsB)), p);
    const whole = await checkBatch(chunks(csvOf(HEADER, [...rowsA, ...rowsB]), 777), p);
    // states survive a round trip through JSON (as stored in the database)
    const pool = await poolReport(
      [JSON.parse(JSON.stringify(a.state)), JSON.parse(JSON.stringify(b.state))],
      p,
    );
    expect(pool.rows).toEqual(whole.rows);
    expect(pool.model.parameters).toBe(whole.model.parameters);
    expect(pool.model.residualDf).toBe(whole.model.residualDf);
    expect(rel(pool.fit!.F!, whole.fit!.F!)).toBeLessThan(1e-9);
    expect(rel(pool.fit!.rSquared, whole.fit!.rSquared)).toBeLessThan(1e-9);
    const wc = new Map(whole.fit!.coefficients.map((c) => [c.term, c]));
    expect(pool.fit!.coefficients.length).toBe(whole.fit!.coefficients.length);
    for (const c of pool.fit!.coefficients) {
      expect(rel(c.estimate!, wc.get(c.term)!.estimate!)).toBeLessThan(1e-9);
      expect(rel(c.stdError!, wc.get(c.term)!.stdError!)).toBeLessThan(1e-9);
    }
    // moments and missing counts pool exactly
    for (const name of ["nitrogen", "irrigation"]) {
      const pc = pool.columns.find((c) => c.name === name)!;
      const wcn = whole.columns.find((c) => c.name === name)!;
      expect(pc.missing).toEqual(wcn.missing);
      expect(rel(pc.summary!.mean, wcn.summary!.mean)).toBeLessThan(1e-12);
      expect(rel(pc.summary!.sd, wcn.summary!.sd)).toBeLessThan(1e-10);
    }
    expect(pool.missingness.littleMCAR?.statistic).toBeCloseTo(whole.missingness.littleMCAR!.statistic, 8);
  });

  test("drift: new level, shifted mean (SMD ≥ 0.25) and missingness moved > 10 points", async () => {
    const p = plan();
    const pool = await checkBatch(chunks(csvOf(HEADER, rowsA)), p);
    const shifted = gappy(120, 9, 500).map((x, i) => {
      x[col("nitrogen")] = Number(x[col("nitrogen")]) + 40; // ~0.87 SD of U(40, 200)
      if (i % 4 === 0) x[col("irrigation")] = "";
      return x;
    });
    const batch = await checkBatch(chunks(csvOf(HEADER, shifted)), p);
    const f = driftFindings(pool.state, batch.state, p);
    const codes = f.map((x) => `${x.code}:${x.columns[0]}`);
    expect(codes).toContain("drift.new-level:soil"); // "silt" is absent from pool A
    expect(codes).toContain("drift.smd:nitrogen");
    expect(codes).toContain("drift.missing:irrigation");
    expect(codes).not.toContain("drift.smd:rainfall");
    const smd = f.find((x) => x.code === "drift.smd")!.detail!.smd as number;
    expect(smd).toBeGreaterThan(0.6);
  });
});

const R = rscriptAvailable(["car"]);

describe.skipIf(!R.ok)("R cross-check through the whole pipeline (lm, car::vif, svd)", () => {
  test("complete cases, p, residual df, F, R², coefficients, standard errors, GVIF and condition indices", async () => {
    // correlated predictors and missing values: rainfall tracks irrigation, tokens "" and "NA"
    const g = rng(42);
    const rows = gappy(400, 8).map((x, i) => {
      if (typeof x[col("irrigation")] === "number")
        x[col("rainfall")] = +(200 + 1.5 * Number(x[col("irrigation")]) + 30 * g()).toFixed(2);
      if (i % 17 === 3) x[col("soil")] = "";
      return x;
    });
    const dir = tempDir("tributary-engine-");
    const file = path.join(dir, "batch.csv");
    fs.writeFileSync(file, csvOf(HEADER, rows));
    const ours = await checkBatch(chunks(fs.readFileSync(file)), plan());
    const r = runRJson<{
      n: number[];
      rank: number[];
      dfResidual: number[];
      F: number[];
      rSquared: number[];
      adjRSquared: number[];
      sigma: number[];
      rss: number[];
      coef: number[];
      se: number[];
      gvifTerms: string[];
      gvif: number[];
      gvifScaled: number[];
      condition: number[];
    }>(path.resolve("tests/fixtures/engine/lm-pipeline.R"), [file, path.resolve("tests/r/json.R")]);
    expect(ours.rows.complete).toBe(r.n[0]);
    expect(ours.model.parameters).toBe(r.rank[0]! - 1);
    expect(ours.model.residualDf).toBe(r.dfResidual[0]);
    expect(rel(ours.fit!.F!, r.F[0]!)).toBeLessThan(1e-9);
    expect(rel(ours.fit!.rSquared, r.rSquared[0]!)).toBeLessThan(1e-9);
    expect(rel(ours.fit!.adjRSquared, r.adjRSquared[0]!)).toBeLessThan(1e-9);
    expect(rel(ours.fit!.residualStdError, r.sigma[0]!)).toBeLessThan(1e-9);
    ours.fit!.coefficients.forEach((c, i) => {
      expect(rel(c.estimate!, r.coef[i]!)).toBeLessThan(1e-8);
      expect(rel(c.stdError!, r.se[i]!)).toBeLessThan(1e-8);
    });
    const terms = ours.collinearity!.terms;
    expect(terms.map((t) => t.term)).toEqual(r.gvifTerms);
    terms.forEach((t, i) => {
      expect(rel(t.gvif, r.gvif[i]!)).toBeLessThan(1e-8);
      expect(rel(t.gvifScaled, r.gvifScaled[i]!)).toBeLessThan(1e-8);
    });
    const ci = [...ours.collinearity!.conditionIndices].sort((a, b) => a - b);
    const rc = [...r.condition].sort((a, b) => a - b);
    ci.forEach((v, i) => expect(rel(v, rc[i]!)).toBeLessThan(1e-8));
  });
});
