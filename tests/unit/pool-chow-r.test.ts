/**
 * Poolability, batch influence and the overall F test of lib/readiness/pooling against R
 * (Debian r-base-core, stats::lm / anova / summary.lm) on pools built by the real engine:
 * - Chow F per batch and per provider: anova(lm(y ~ X), lm(y ~ X * g)), g the batch indicator
 *   (Chow 1960, Econometrica 28:591–605); a batch that lacks a level: the same anova, R's lm
 *   dropping the aliased interaction column (rank-based df);
 * - Chow's predictive test (n_b ≤ k): F = ((RSS_all − RSS_rest)/n_b)/(RSS_rest/(n_rest − k)) from two lm fits;
 * - the whole pool: anova(lm(y ~ X), lm(y ~ X * batch));
 * - influence: |β_all − β_rest| / SE_all from two lm fits; overall F, R², adjusted R²: summary.lm.
 * Skipped, with the reason printed, when Rscript is not installed.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { poolQuestions, type PoolQuestions } from "@/lib/readiness";
import { rscriptAvailable, runRJson, tempDir } from "../helpers/rscript";
import { makePool, writePoolCsv, type Pool } from "../fixtures/pool/data";

const R = rscriptAvailable();
if (!R.ok) console.warn(`pool-chow-r tests skipped: ${R.reason}`);

const rel = (x: number, y: number) => Math.abs(x - y) / Math.max(Math.abs(y), 1e-300);
/** relative agreement, or absolute for p-values far in the tail */
const closeP = (x: number, y: number) =>
  expect(Math.abs(x - y) <= 1e-9 * Math.max(y, 1e-300) || Math.abs(x - y) < 1e-15).toBe(true);

interface FTest {
  F: number;
  df1: number;
  df2: number;
  p: number;
}
interface ROut {
  names: string[];
  coef: number[];
  se: number[];
  overall: FTest & { r2: number; adjR2: number };
  whole: FTest;
  batches: Record<
    string,
    {
      n: number[];
      chow: FTest;
      predictive: FTest | null;
      shift: number[];
      r2_rest: number[];
      df_rest: number[];
    }
  >;
  providers: Record<string, { chow: FTest; predictive: FTest | null }>;
  candidate?: { chow: FTest; shift: number[] };
}

const one = (v: number | number[]) => (Array.isArray(v) ? v[0]! : v);
function expectF(ts: { F: number | null; df1: number; df2: number; p: number | null }, r: FTest) {
  expect(ts.df1).toBe(one(r.df1));
  expect(ts.df2).toBe(one(r.df2));
  expect(rel(ts.F!, one(r.F))).toBeLessThan(1e-9);
  closeP(ts.p!, one(r.p));
}

interface Case {
  name: string;
  rhs: string;
  pool: () => Promise<Pool>;
  candidate?: number;
}

const CASES: Case[] = [
  {
    name: "two batches, numeric and categorical predictors",
    rhs: "x1 + x2 + x3 + f1",
    pool: () =>
      makePool({ numeric: 3, factors: [["a", "b", "c"]], sizes: [80, 70], seed: 11, shift: { 1: 0.3 } }),
  },
  {
    name: "six batches: one shifted, one too small to fit alone (and rank deficient), one lacking a level, three providers, a candidate",
    rhs: "x1 + x2 + f1",
    candidate: 5,
    pool: () =>
      makePool({
        numeric: 2,
        factors: [["a", "b", "c"]],
        sizes: [60, 55, 4, 50, 65, 40],
        groups: ["p1", "p1", "p2", "p3", "p3", "p2"],
        seed: 12,
        shift: { 1: 0.4, 5: 0.25 },
        lacks: { 2: ["b", "c"], 3: ["c"] },
      }),
  },
];

describe.skipIf(!R.ok).each(CASES)("poolability against R: $name", (c) => {
  let pool: Pool;
  let q: PoolQuestions;
  let r: ROut;
  beforeAll(async () => {
    pool = await c.pool();
    const accepted = pool.members.filter((_, i) => i !== c.candidate);
    q = poolQuestions(
      accepted,
      pool.plan,
      c.candidate !== undefined ? { candidate: pool.members[c.candidate]! } : {},
    );
    const dir = tempDir();
    const file = writePoolCsv(pool, dir);
    r = runRJson<ROut>("pool-chow.R", [
      file,
      c.rhs,
      ...(c.candidate !== undefined ? [`b${c.candidate + 1}`] : []),
    ]);
  });

  it("the overall F test, R² and adjusted R² equal summary.lm's", () => {
    expectF(q.overall!, r.overall);
    expect(rel(q.overall!.r2, one(r.overall.r2))).toBeLessThan(1e-9);
    expect(rel(q.overall!.adjR2, one(r.overall.adjR2))).toBeLessThan(1e-9);
  });

  it("each batch's Chow test equals anova(lm(y ~ X), lm(y ~ X * g)); a small batch's predictive test equals R by hand", () => {
    expect(q.poolability.batches.length).toBe(Object.keys(r.batches).length);
    for (const row of q.poolability.batches) {
      const rb = r.batches[row.id]!;
      expect(row.n).toBe(one(rb.n));
      if (row.kind === "predictive") expectF(row, rb.predictive!);
      else expectF(row, rb.chow);
    }
  });

  it("the whole-pool test equals anova(lm(y ~ X), lm(y ~ X * batch))", () => {
    expect(q.poolability.whole!.small).toBe(
      q.poolability.batches.filter((b) => b.kind === "predictive").length,
    );
    expectF(q.poolability.whole!, r.whole);
  });

  it("each provider's Chow test equals anova with the provider's indicator", () => {
    const groups = new Set(pool.members.filter((_, i) => i !== c.candidate).map((m) => m.group));
    expect(q.poolability.providers.length).toBe(groups.size > 1 ? groups.size : 0);
    for (const row of q.poolability.providers) {
      const rp = r.providers[row.id]!;
      expectF(row, row.kind === "predictive" ? rp.predictive! : rp.chow);
    }
  });

  it("batch influence |Δβ_j| / SE_j, the rest's R² and residual df equal two lm fits", () => {
    const rNames = r.names.map((n) =>
      n.replace(/^\(Intercept\)$/, "intercept").replace(/^f1(\w)$/, "f1[$1]"),
    );
    expect(q.columns).toEqual(rNames);
    for (const row of q.influence.batches) {
      const rb = r.batches[row.id]!;
      row.shifts.forEach((s, j) => expect(rel(s.shift!, rb.shift[j]!)).toBeLessThan(1e-8));
      expect(rel(row.without.r2!, one(rb.r2_rest))).toBeLessThan(1e-9);
      expect(row.without.residualDf).toBe(one(rb.df_rest));
      const max = Math.max(...rb.shift);
      expect(rel(row.largest!.shift, max)).toBeLessThan(1e-8);
      expect(row.influential).toBe(max >= 1);
    }
  });

  it("flags pool.not-poolable where R's p < 0.05 and pool.influential-batch where R's largest shift ≥ 1 SE [common practice]", () => {
    const notPoolable = q.findings.filter((f) => f.code === "pool.not-poolable").map((f) => f.detail!.id);
    const expected = [
      ...q.poolability.batches.filter(
        (b) => one((b.kind === "predictive" ? r.batches[b.id]!.predictive! : r.batches[b.id]!.chow).p) < 0.05,
      ),
      ...q.poolability.providers.filter(
        (p) =>
          one((p.kind === "predictive" ? r.providers[p.id]!.predictive! : r.providers[p.id]!.chow).p) < 0.05,
      ),
      ...(q.poolability.candidate && one(r.candidate!.chow.p) < 0.05 ? [q.poolability.candidate] : []),
    ].map((b) => b.id);
    expect(notPoolable).toEqual(expected);
    expect(expected.length).toBeGreaterThan(0);
    const influential = q.findings
      .filter((f) => f.code === "pool.influential-batch")
      .map((f) => f.detail!.id);
    const big = Object.entries(r.batches)
      .filter(([, b]) => Math.max(...b.shift) >= 1)
      .map(([id]) => id);
    if (r.candidate && Math.max(...r.candidate.shift) >= 1) big.push(q.poolability.candidate!.id);
    expect([...influential].sort()).toEqual(big.sort());
  });

  it.runIf(c.candidate !== undefined)(
    "the candidate's Chow test and influence ('if accepted') equal R's",
    () => {
      expectF(q.poolability.candidate!, r.candidate!.chow);
      q.influence.candidate!.shifts.forEach((s, j) =>
        expect(rel(s.shift!, r.candidate!.shift[j]!)).toBeLessThan(1e-8),
      );
    },
  );
});
