/**
 * The pool's questions from stored states equal the same computation on the concatenated
 * files (one pass of the engine over all rows), to 1e-9 relative: the merged factors carry the
 * same information as the rows (AᵀA = [X | y]ᵀ[X | y]). Theory check, no outside program.
 */
import { describe, expect, it } from "vitest";
import { poolQuestions } from "@/lib/readiness";
import { concatenated, makePool } from "../fixtures/pool/data";

const rel = (x: number, y: number) => Math.abs(x - y) / Math.max(Math.abs(y), 1e-300);

describe("pool questions from states equal one pass over the concatenated rows", () => {
  const spec = {
    numeric: 5,
    factors: [["a", "b", "c", "d"]],
    sizes: [70, 45, 60, 52],
    seed: 21,
    shift: { 2: 0.3 },
    lacks: { 1: ["d"] },
    selection: { candidates: ["x1", "x2", "x3", "x4", "f1"], required: ["x5"] },
  };

  it("overall F, R², coefficients and the selection's best subsets", async () => {
    const pool = await makePool(spec);
    const q = poolQuestions(pool.members, pool.plan);
    const one = poolQuestions([await concatenated(pool, [0, 1, 2, 3])], pool.plan);
    expect(rel(q.overall!.F, one.overall!.F)).toBeLessThan(1e-9);
    expect(rel(q.overall!.r2, one.overall!.r2)).toBeLessThan(1e-9);
    expect(q.overall!.df2).toBe(one.overall!.df2);
    const s = q.selection!;
    const t = one.selection!;
    expect(s.bySize.map((b) => b.terms)).toEqual(t.bySize.map((b) => b.terms));
    s.bySize.forEach((b, i) => {
      expect(rel(b.rss, t.bySize[i]!.rss)).toBeLessThan(1e-9);
      expect(rel(b.bic, t.bySize[i]!.bic)).toBeLessThan(1e-9);
    });
    expect(s.forward.aic.steps.map((x) => x.change)).toEqual(t.forward.aic.steps.map((x) => x.change));
  });

  it("each batch's rest (prefix and suffix merges) equals the concatenated file of the other batches", async () => {
    const pool = await makePool(spec);
    const q = poolQuestions(pool.members, pool.plan);
    for (const [b, row] of q.influence.batches.entries()) {
      const others = [0, 1, 2, 3].filter((i) => i !== b);
      const rest = poolQuestions([await concatenated(pool, others)], pool.plan);
      expect(row.without.n).toBe(rest.n);
      expect(rel(row.without.r2!, rest.overall!.r2)).toBeLessThan(1e-9);
      // the pool of two: the concatenated other batches and batch b; leaving b out gives the same rest
      const two = poolQuestions([await concatenated(pool, others), pool.members[b]!], pool.plan);
      const direct = two.influence.batches[1]!;
      const chow = two.poolability.batches[1]!;
      expect(chow.df1).toBe(q.poolability.batches[b]!.df1);
      expect(rel(q.poolability.batches[b]!.F!, chow.F!)).toBeLessThan(1e-9);
      row.without.coefficients.forEach((c, j) => {
        const d = direct.without.coefficients[j]!;
        expect(rel(c.estimate!, d.estimate!)).toBeLessThan(1e-9);
      });
      row.shifts.forEach((s, j) => expect(rel(s.shift!, direct.shifts[j]!.shift!)).toBeLessThan(1e-9));
    }
  });
});
